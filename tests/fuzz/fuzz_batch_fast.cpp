// libFuzzer target: the batch's fast row parser (batch_fast_parse.hpp)
// against the general CSV parser it stands in for.
//
// Input layout: byte 0 chooses the options (delimiter, setpoint and role
// columns); the rest is the text of one unit's chunk (header line, then rows).
// Limits are lowered so that the limit checks are reached by small inputs.
//
// Invariants: parse_unit_chunk_fast never throws; when it accepts a chunk, the
// general parser (parse_unit_chunk) accepts it too and reads the very same
// rows: readings and references bit for bit, setpoints, roles and lines.
// (When the fast parser declines, the batch uses the general parser, so a
// decline is always safe.)
#include <cstddef>
#include <cstdint>
#include <cstring>
#include <string>

#include "fuzz_check.hpp"
#include "ridgecal/batch_fast_parse.hpp"
#include "ridgecal/batch_reader.hpp"
#include "ridgecal/errors.hpp"

using namespace ridgecal;

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  if (size < 1) return 0;
  const std::uint8_t sel = data[0];
  CsvOptions opt;
  opt.delimiter = ",;\t"[sel % 3];
  if (sel & 0x04) opt.setpoint_column = "setpoint";
  if (sel & 0x08) opt.role_column = "role";
  opt.limits.max_rows = 1 + (sel >> 4) * 4;
  opt.limits.max_fields = 16;
  opt.limits.max_field_bytes = 24;
  UnitChunk chunk;
  chunk.file = "fuzz.csv";
  chunk.header_line = 1;
  chunk.first_line = 2;
  chunk.text.assign(reinterpret_cast<const char*>(data) + 1, size - 1);

  Dataset fast;
  bool accepted = false;
  try {
    accepted = parse_unit_chunk_fast(chunk, opt, fast);
  } catch (...) {
    RIDGECAL_FUZZ_CHECK(!"parse_unit_chunk_fast threw");
  }
  if (!accepted) return 0;
  Dataset general;
  try {
    general = parse_unit_chunk(chunk, opt);
  } catch (const InputError&) {
    RIDGECAL_FUZZ_CHECK(!"the fast parser accepted a chunk the general parser refuses");
  }
  RIDGECAL_FUZZ_CHECK(fast.rows.size() == general.rows.size());
  RIDGECAL_FUZZ_CHECK(fast.rows.size() <= opt.limits.max_rows);
  for (std::size_t i = 0; i < fast.rows.size(); ++i) {
    const Observation& a = fast.rows[i];
    const Observation& b = general.rows[i];
    RIDGECAL_FUZZ_CHECK(std::memcmp(&a.reading, &b.reading, sizeof(double)) == 0);
    RIDGECAL_FUZZ_CHECK(std::memcmp(&a.reference, &b.reference, sizeof(double)) == 0);
    RIDGECAL_FUZZ_CHECK(a.setpoint == b.setpoint);
    RIDGECAL_FUZZ_CHECK(a.role == b.role);
    RIDGECAL_FUZZ_CHECK(a.line == b.line);
  }
  return 0;
}
