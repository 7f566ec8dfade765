// Internal: text helpers shared by the 1-D (c_header.cpp) and the extended-model
// (surface_header.cpp) header emitters.
#pragma once

#include <cstddef>
#include <cstdint>
#include <sstream>
#include <string>

#include "ridgecal/firmware/export.hpp"

namespace ridgecal::firmware::detail {

struct Names {
  std::string p;  // function prefix, e.g. "calib"
  std::string P;  // macro prefix, e.g. "CALIB"
};

/// %.*g, "n/a" for NaN.
std::string g(double v, int digits = 6);
/// "0x%08lXUL"
std::string hex32(std::uint32_t v);
/// escape_c_comment, "(not given)" for an empty string.
std::string esc(const std::string& s, std::size_t max_chars = 200);
/// PREFIX_table_crc32() and PREFIX_check_table() over PREFIX_COEF[0 .. count_expr - 1].
void emit_crc(std::ostringstream& o, const Names& n, const char* elem_type, int bytes,
              const std::string& count_expr);
/// The tolerance the export proof judges against: the absolute tolerance of
/// `meta` when given, else its validation RMSE; `limit` is
/// opt.max_deviation_fraction times it. Returns false, with `message` set,
/// when neither is usable.
struct ProofTolerance {
  double tolerance = 0;
  double limit = 0;
  std::string source;
};
bool choose_proof_tolerance(const HeaderMeta& meta, const ExportOptions& opt, ProofTolerance& out,
                            std::string& message);

/// choose_proof_tolerance, and on success the tolerance fields of `r`.
bool start_result(const HeaderMeta& meta, const ExportOptions& opt, ExportResult& r,
                  ProofTolerance& pt);

/// Fills `r` from the finished header and its proof; the size figures of
/// r.stats are completed from the header text.
struct ProofFigures {
  double max = 0, at = 0;
  std::size_t points = 0, readings = 0;
};
void finish_result(ExportResult& r, std::string header, std::uint32_t crc,
                   const std::string& formats, const ProofFigures& proof);

/// The PREFIX_TABLE_* result codes of PREFIX_check_table(), the PREFIX_INLINE
/// macro (C99/C++, GNU C89, other C89) and the opening of extern "C".
void emit_table_codes_and_linkage(std::ostringstream& o, const Names& n);

/// Size figures of a generated header: its bytes and lines, the table size,
/// and the operations per evaluation.
CodeStats stats_for(const std::string& text, int entries, int entry_bytes, int mul, int add);

/// extern "C" close and the include guard's #endif.
void emit_epilogue(std::ostringstream& o, const Names& n);

}  // namespace ridgecal::firmware::detail
