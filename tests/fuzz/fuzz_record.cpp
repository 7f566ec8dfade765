// libFuzzer target: the calibration record reader.
//
// The input is record text. It goes through parse_record_json (depth limit,
// then nlohmann::json), record_integrity_ok, check_record_text and
// record_from_json. Invariants: only InputError escapes; a record that parses
// serialises again to a document that passes its own integrity check and
// parses again (the writer never produces what the reader refuses).
#include <cstddef>
#include <cstdint>
#include <string>

#include "fuzz_check.hpp"
#include "ridgecal/errors.hpp"
#include "ridgecal/record.hpp"
#include "ridgecal/record_guard.hpp"

using namespace ridgecal;

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const std::string text(reinterpret_cast<const char*>(data), size);
  nlohmann::json j;
  try {
    j = parse_record_json(text, "fuzz.json");
  } catch (const InputError&) {
    return 0;
  }
  const bool intact = record_integrity_ok(j);
  try {
    const GuardedRecord checked = check_record_text(text, "fuzz.json", /*allow_modified=*/false);
    RIDGECAL_FUZZ_CHECK(intact && !checked.modified);
  } catch (const InputError&) {
  }
  CalibrationRecord rec;
  try {
    rec = record_from_json(j, "fuzz.json");
  } catch (const InputError&) {
    return 0;
  }
  // Round trip: what the writer makes from a parsed record must read back.
  const nlohmann::json again = record_to_json(rec);
  RIDGECAL_FUZZ_CHECK(record_integrity_ok(again));
  const std::string text2 = record_text(again);
  const GuardedRecord back = check_record_text(text2, "again.json", /*allow_modified=*/false);
  RIDGECAL_FUZZ_CHECK(!back.modified);
  RIDGECAL_FUZZ_CHECK(back.record.calibration.model.coefficients ==
                      rec.calibration.model.coefficients);
  RIDGECAL_FUZZ_CHECK(back.record.sensor.name == rec.sensor.name);
  return 0;
}
