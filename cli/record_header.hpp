// ridgecal: the firmware header for a calibration record, with the export
// rules (header metadata from the record, verdict stated verbatim, refusal of
// a non-PASS record). Shared by `ridgecal export` and the Python module, so
// both write the same header and refuse the same records with the same words.
#pragma once

#include <optional>
#include <string>

#include "ridgecal/firmware/export.hpp"
#include "ridgecal/record_guard.hpp"

namespace ridgecal::cli {

/// What to export and how (the options of `ridgecal export` that shape the header).
struct RecordHeaderRequest {
  firmware::ExportOptions options;  ///< prefix, numeric mode, proof grid, fixed-point scales
  /// Absolute tolerance for the refusal rule only; default: the record's strictest limit.
  std::optional<double> tolerance;
  std::string tolerance_text;   ///< QA block description; default: the record's tolerance
  bool allow_unpassed = false;  ///< write a header for a record that is not PASS
};

/// Outcome of make_record_header.
enum class RecordHeaderStatus {
  Written,           ///< `header` holds the header text
  DeviationRefused,  ///< the header's arithmetic deviates more than allowed
  VerdictRefused,    ///< the record is not PASS and allow_unpassed was not given
};

struct RecordHeaderResult {
  RecordHeaderStatus status = RecordHeaderStatus::Written;
  firmware::ExportResult exported;  ///< header text, formats, CRC, statistics
  /// Empty when Written; else the refusal, as `ridgecal export` prints it
  /// after "ridgecal export: " (one or two lines, no trailing newline).
  std::string refusal;
};

/// Builds the header for `guarded` (read from `record_path`, named in
/// messages). Throws InputError when the record cannot be exported (exit 2
/// in the CLI). The verdict check comes after the header is proved, so bad
/// input is reported first.
RecordHeaderResult make_record_header(const GuardedRecord& guarded, const std::string& record_path,
                                      const RecordHeaderRequest& request);

}  // namespace ridgecal::cli
