// ridgecal batch: calibrate every unit of a production batch file (or a
// directory of CSV files) with one set of fit options; records per unit and a
// summary. See fitter/include/ridgecal/batch_run.hpp and docs/batch.md.
//
// Exit codes: 0 every unit fitted (and PASS when a tolerance is given); 1 at
// least one unit failed (its summary row says why; the others are complete)
// or is out of tolerance; 2 bad usage or an unusable input as a whole (no
// file, no header, missing column): no summary is written.
#pragma once

#include <iosfwd>
#include <optional>
#include <string>
#include <vector>

#include "export_command.hpp"
#include "ridgecal/batch_run.hpp"

namespace ridgecal::cli {

/// How progress is shown on stderr.
enum class ProgressMode {
  Auto,   ///< `auto`: a bar when stderr is a terminal, else lines (the default)
  Bar,    ///< `bar`: one self-overwriting line
  Lines,  ///< `lines`: a plain line every few seconds (logs, CI)
  None,   ///< `none`: only the final line
};
std::string to_string(ProgressMode m);
ProgressMode progress_mode_from_string(const std::string& s);  ///< throws std::invalid_argument

struct BatchCommand {
  std::string data_path;  ///< batch CSV or directory of CSV files
  BatchOptions batch;     ///< includes the fit options and the output directory
  std::string timestamp;  ///< injected creation time ("" = now, "none" = omit)
  ProgressMode progress = ProgressMode::Auto;
  double progress_interval_s = 0;  ///< 0: 0.2 s for the bar, 5 s for lines
  bool reports = false;  ///< --reports: reports/UNIT.html per fitted unit (as `ridgecal report`)
  /// --headers PREFIX: headers/UNIT.h per fitted unit (as `ridgecal export`;
  /// record_path and output_path are filled in per unit).
  std::optional<ExportCommand> header;
  bool help = false;
};

/// Parses `ridgecal batch` arguments; throws UsageError.
BatchCommand parse_batch_command(const std::vector<std::string>& args);
/// Runs it; `stderr_is_tty` selects the progress bar in auto mode.
int run_batch_command(const BatchCommand& cmd, std::ostream& out, std::ostream& err,
                      bool stderr_is_tty);
/// Entry point for the dispatch table.
int batch_main(const std::vector<std::string>& args, std::ostream& out, std::ostream& err);
std::string batch_usage();

/// One progress line: "units 1234 (2 failed), 41% of input, 5,210 units/s".
std::string progress_text(const BatchProgress& p);

}  // namespace ridgecal::cli
