// ridgecal report: the QA calibration report as one self-contained HTML file.
#pragma once

#include <nlohmann/json.hpp>

#include <optional>
#include <stdexcept>
#include <string>

namespace ridgecal::report {

struct ReportOptions {
  /// Date/time printed in the header as the report date. Default: the record's
  /// created_utc (so the same record renders to the same bytes); when that is
  /// absent too, the header says "not recorded". Injected by tests and --date.
  std::optional<std::string> date;
  /// Version printed in the footer as the generator of the report. Default
  /// (empty): this build's version.
  std::string generator_version;
};

/// Thrown when the input is not a calibration record at all (not a JSON object,
/// or its "format" names another kind of document).
class ReportInputError : public std::runtime_error {
 public:
  using std::runtime_error::runtime_error;
};

/// Render the report. Sections, in reading order: header, verdict, plots (data
/// and fit; errors with tolerance and uncertainty bands; validation curve),
/// metrics, warnings, as-found results, model and selection, coefficients,
/// split, cautions, sign-off. Missing parts of the record are stated as missing
/// rather than guessed. The output contains no script and no external resource.
std::string render_html_report(const nlohmann::json& record, const ReportOptions& options = {});

}  // namespace ridgecal::report
