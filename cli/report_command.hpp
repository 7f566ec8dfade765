// ridgecal report: calibration record (JSON) -> QA calibration report (HTML).
#pragma once

#include <iosfwd>
#include <optional>
#include <string>
#include <vector>

namespace ridgecal::cli {

struct ReportCommand {
  std::string record_path;
  std::string output_path;          ///< "-" writes to standard output
  std::optional<std::string> date;  ///< report date shown; default: the record's created_utc
  bool allow_modified = false;      ///< render a record whose integrity digest does not match
  bool help = false;
};

/// Parses `ridgecal report` arguments. Throws UsageError on a bad command line.
ReportCommand parse_report_command(const std::vector<std::string>& args);

/// Reads the record, renders the report and writes it atomically. Returns the
/// exit code (0 written, 2 bad input: nothing written). A record whose
/// integrity digest does not match its content is still reported (the report
/// says so in its header), with a warning on `err`.
int run_report_command(const ReportCommand& cmd, std::ostream& out, std::ostream& err);

/// Entry point: parse, then run; usage errors give exit code 2.
int report_main(const std::vector<std::string>& args, std::ostream& out, std::ostream& err);

/// Help text for `ridgecal report --help`.
std::string report_usage();

}  // namespace ridgecal::cli
