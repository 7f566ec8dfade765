// ridgecal report: the QA calibration report as one self-contained HTML file.
#pragma once

#include <optional>
#include <string>

#include "ridgecal/record.hpp"

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

/// Render the report of a parsed record (record_from_json; the record module
/// is the only reader of record files). `seal` is the record's integrity
/// member as read (record_seal): the header states whether it matches.
/// Sections, in reading order: header, verdict, plots (data and fit; errors
/// with tolerance and uncertainty bands; residual views of extended records;
/// validation curve), metrics, warnings, model and selection, coefficients,
/// split, cautions, sign-off. Parts the record does not hold (no tolerance, no
/// decision, no cross-validation grid) are stated as missing rather than
/// guessed. The output contains no script and no external resource.
std::string render_html_report(const CalibrationRecord& record, const RecordSeal& seal,
                               const ReportOptions& options = {});

}  // namespace ridgecal::report
