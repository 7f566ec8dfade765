// ridgecal internal: the fast row parser of the batch (batch_reader.hpp),
// an optimisation of parse_unit_chunk for plain rows.
#pragma once

#include "ridgecal/batch_reader.hpp"

namespace ridgecal {

/// The same Dataset as parse_unit_chunk (rows, values, setpoints, roles,
/// lines), for the common case of plain, valid rows, without the general
/// parser's per-cell allocations and without the SHA-256 (ds.sha256 is left
/// empty). Returns false, leaving `out` unspecified, on anything unusual:
/// quotes, a NUL byte, a duplicated header name, a ragged row, a cell that is
/// not a plain finite number, an empty setpoint, a bad role, no data rows;
/// and whenever `options` ask for an aux, aux-setpoint or direction column or
/// decimal commas (read by the general parser only). The caller then uses parse_unit_chunk, which
/// reports the problem exactly.
bool parse_unit_chunk_fast(const UnitChunk& chunk, const CsvOptions& options, Dataset& out);

}  // namespace ridgecal
