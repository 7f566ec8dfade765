// ridgecal fit: CSV calibration run -> chosen curve -> calibration record.
#pragma once

#include <iosfwd>
#include <string>
#include <vector>

#include "ridgecal/assessment.hpp"
#include "ridgecal/calibration.hpp"
#include "ridgecal/calibration_csv.hpp"
#include "ridgecal/extended_fit.hpp"
#include "ridgecal/hardware_checks.hpp"
#include "ridgecal/record.hpp"

namespace ridgecal::cli {

struct FitCommand {
  std::string data_path;
  std::string output_path;  ///< record; empty: print only
  std::string report_path;  ///< QA report (HTML); empty: none
  CsvOptions csv;
  FitOptions fit;
  ExtendedOptions comp;  ///< transforms, aux input, allowed powers (inactive by default)
  SensorInfo sensor;
  std::string timestamp;          ///< injected creation time ("" = now, "none" = omit)
  bool full = false;              ///< print the full text form
  AssessmentOptions assess;       ///< tolerance, decision rule, uncertainty inputs, diagnostics
  HardwareCheckOptions hardware;  ///< stuck/open/saturated checks before the fit (default on)
};

/// Parses `ridgecal fit` arguments. Throws UsageError on a bad command line
/// (the message names the option, the value and the rule).
FitCommand parse_fit_command(const std::vector<std::string>& args);

/// Runs the fit. Returns the exit code; messages go to `err`, the summary to `out`.
/// Writes nothing on failure.
int run_fit_command(const FitCommand& cmd, std::ostream& out, std::ostream& err);

/// Entry point: parse, then run; usage errors give exit code 2.
int fit_main(const std::vector<std::string>& args, std::ostream& out, std::ostream& err);

/// Help text for `ridgecal fit --help`.
std::string fit_usage();

}  // namespace ridgecal::cli
