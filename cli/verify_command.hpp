// ridgecal verify: the as-found check of an existing calibration record on
// fresh readings (see ridgecal/as_found.hpp).
#pragma once

#include <iosfwd>
#include <optional>
#include <string>
#include <vector>

#include "ridgecal/as_found.hpp"
#include "ridgecal/calibration.hpp"
#include "ridgecal/calibration_csv.hpp"

namespace ridgecal::cli {

struct VerifyCommand {
  std::string record_path;
  std::string data_path;
  std::string output_path;  ///< as-found result (JSON); empty: print only
  /// Column options; unset: the record's columns (reading, reference, setpoint, delimiter).
  std::optional<std::string> reading_column, reference_column, setpoint_column;
  std::optional<char> delimiter;
  /// unset: the record's; --decimal-comma / --decimal-point override it
  std::optional<bool> decimal_comma;
  AsFoundOptions as_found;  ///< tolerance and rule overrides
  bool allow_modified = false;
  std::string timestamp;  ///< injected creation time ("" = now, "none" = omit)
  bool help = false;
  bool full = false;  ///< print every point's error
};

/// Parses `ridgecal verify` arguments. Throws UsageError on a bad command line.
VerifyCommand parse_verify_command(const std::vector<std::string>& args);

/// Runs the check. Exit 0 PASS (or nothing to judge against), 1 FAIL (the
/// result is still written, marked FAIL), 2 bad input (nothing written).
int run_verify_command(const VerifyCommand& cmd, std::ostream& out, std::ostream& err);

int verify_main(const std::vector<std::string>& args, std::ostream& out, std::ostream& err);

std::string verify_usage();

/// Floors of the variation check of new data for `cal` (require_variation):
/// 10 % of the calibrated reading and reference ranges. Shared with the
/// Python module's verify().
VariationFloors verify_variation_floors(const Calibration& cal);

}  // namespace ridgecal::cli
