// ridgecal export: calibration record -> freestanding C header for firmware.
#pragma once

#include <iosfwd>
#include <optional>
#include <string>
#include <vector>

#include "ridgecal/firmware/export.hpp"

namespace ridgecal::cli {

struct ExportCommand {
  std::string record_path;
  std::string output_path;  ///< the header; written atomically, only on success
  firmware::ExportOptions options;
  /// Absolute tolerance (reference units) for the refusal rule when the record
  /// has none; overrides the record's when given.
  std::optional<double> tolerance;
  std::string tolerance_text;  ///< description for the header's QA block
  /// Export a record whose integrity digest does not match (edited by hand);
  /// the header's result line and the summary then say so.
  bool allow_modified = false;
  /// Write a header for a record whose verdict is not PASS (FAIL, not judged
  /// or modified). Default false: such a record is refused (exit 1), so that
  /// a failed calibration never reaches firmware by accident. The header's
  /// PREFIX_VERDICT then states the verdict for a compile-time check.
  bool allow_unpassed = false;
  bool help = false;
};

/// Parses `ridgecal export` arguments. Throws UsageError on a bad command line
/// (the message names the option, the value and the rule).
ExportCommand parse_export_command(const std::vector<std::string>& args);

/// Reads the record, generates the header and writes it. Exit codes: 0 ok,
/// 1 refused (the record's verdict is not PASS and allow_unpassed is false, or
/// the header's arithmetic deviates more than allowed), 2 bad input.
/// An existing output file is left untouched unless the export succeeds.
int run_export_command(const ExportCommand& cmd, std::ostream& out, std::ostream& err);

/// Entry point: parse, then run; usage errors give exit code 2.
int export_main(const std::vector<std::string>& args, std::ostream& out, std::ostream& err);

/// Help text for `ridgecal export --help`.
std::string export_usage();

}  // namespace ridgecal::cli
