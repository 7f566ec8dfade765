// ridgecal: the summary of a batch, one row per unit, as CSV and JSON, and
// merging the summaries of several shards of one batch.
//
// Summary JSON (format "ridgecal-batch-summary", format_version 2; version 1
// summaries, which lack the reason and worst-point members, are still read):
//   format, format_version, tool_version, created_utc (may be absent),
//   settings{...}  the fit and column settings shared by every unit,
//   settings_sha256  SHA-256 of settings serialised compactly (keys sorted),
//   inputs[]       the input files,
//   units[{unit, status, rows, degree, lambda, validation_rmse, test_rmse,
//          max_abs_error, verdict, reason, worst_setpoint, worst_ratio,
//          worst_excess, warnings[], error, record}],
//   totals{units, passed, out_of_tolerance, undecided, not_judged, not_fitted,
//          reasons{code: count}}  (reasons other than `none`, by count)
//   partial{signal, units_completed, last_unit, note}  only in the summary of
//                  a batch stopped by a signal (merge_batch_summaries refuses it)
// Non-finite or absent numbers are null. The summary CSV has the same unit
// fields, one row per unit, warnings joined by "; "; a batch stopped by a
// signal ends it with a line "# partial: interrupted by SIGINT after N units; ...".
// Text cells of the CSV that a spreadsheet would run as a formula (starting
// with '=', '+', '-', '@', tab or carriage return) get a leading apostrophe,
// as spreadsheet-export practice does; a cell that is a plain number (e.g.
// -0.25) is left as it is (csv_text_cell). summary.json keeps the text as given.
#pragma once

#include <cstdint>
#include <map>
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "ridgecal/unit_reason.hpp"

namespace ridgecal {

inline constexpr const char* kBatchSummaryFormat = "ridgecal-batch-summary";
inline constexpr int kBatchSummaryFormatVersion = 2;

enum class UnitStatus {
  Ok,      ///< `ok`: fitted, record written
  Failed,  ///< `failed`: not fitted; `error` says why
};
std::string to_string(UnitStatus s);
UnitStatus unit_status_from_string(const std::string& s);  ///< throws std::invalid_argument

/// Tolerance verdict of a unit. NotAssessed until the tolerance module provides one.
enum class UnitVerdict { NotAssessed, Pass, Fail, Undecided };
std::string to_string(UnitVerdict v);                        ///< `n/a`, `PASS`, `FAIL`, `UNDECIDED`
UnitVerdict unit_verdict_from_string(const std::string& s);  ///< throws std::invalid_argument

struct UnitSummary {
  std::string unit;
  UnitStatus status = UnitStatus::Failed;
  std::size_t rows = 0;
  int degree = -1;               ///< -1 when failed
  double lambda = 0.0;           ///< NaN when failed
  double validation_rmse = 0.0;  ///< held-out CV RMSE of the chosen cell (NaN: none)
  double test_rmse = 0.0;        ///< on the test setpoints (NaN: none)
  double max_abs_error = 0.0;    ///< largest |error| of the final curve over all the unit's points
  UnitVerdict verdict = UnitVerdict::NotAssessed;  ///< PASS/FAIL when a tolerance was given
  UnitReason reason = UnitReason::BadInput;        ///< one code per unit (unit_reason.hpp)
  /// The judged point with the largest |error| / limit (unit_reason.hpp):
  /// its setpoint, the ratio and the excess |error| - limit; NaN when not judged.
  WorstPoint worst;
  std::vector<std::string> warnings;
  std::string error;   ///< why the unit failed
  std::string record;  ///< record file, relative to the output directory ("" if none)
  int outputs_failed =
      0;  ///< extra per-unit outputs not written (batch_run.hpp); not in the summary files
  int outputs_withheld = 0;  ///< pass_only outputs withheld (batch_run.hpp); in the warnings
};

/// The counts a supervisor reads first. Every unit is in exactly one of
/// passed, out_of_tolerance, undecided, not_judged (fitted, no tolerance)
/// and not_fitted.
struct BatchTotals {
  std::uint64_t units = 0;
  std::uint64_t passed = 0;
  std::uint64_t out_of_tolerance = 0;
  std::uint64_t undecided = 0;
  std::uint64_t not_judged = 0;
  std::uint64_t not_fitted = 0;
  std::map<std::string, std::uint64_t> reasons;  ///< reason code -> units (not `none`)

  void add(const UnitSummary& u);
  /// "N units: P passed, F out of tolerance, U undecided, J not judged, X not fitted"
  std::string line() const;
  /// "reasons: out-of-tolerance 60, stuck 5, ..." (by count, then code); "" when none.
  std::string reasons_line() const;
  nlohmann::json to_json() const;
};

/// Header line of the summary CSV.
std::string summary_csv_header();
/// One CSV line (with '\n'); fields quoted when they hold ',', '"', CR or LF.
std::string summary_csv_row(const UnitSummary& u);
/// A text cell of summary.csv: neutralised against formula injection (see
/// above), then quoted when it holds a delimiter, quote or line break.
std::string csv_text_cell(const std::string& s);

nlohmann::json unit_summary_to_json(const UnitSummary& u);
/// Throws InputError (naming `file`) on a malformed unit entry.
UnitSummary unit_summary_from_json(const nlohmann::json& j, const std::string& file);

/// The head of a summary JSON document, everything up to and including
/// `"units": [`, so that units can be streamed after it.
std::string summary_json_head(const std::string& created_utc, const nlohmann::json& settings,
                              const std::vector<std::string>& inputs);
/// One unit entry; `first` says whether it is the first (no leading comma).
std::string summary_json_unit(const UnitSummary& u, bool first);
/// Closes the units array and writes the totals.
/// `partial`: empty, or the JSON object of the "partial" member.
std::string summary_json_tail(const BatchTotals& totals, const std::string& partial = {});

/// A parsed summary JSON file.
struct BatchSummary {
  std::string tool_version;
  std::string created_utc;
  nlohmann::json settings;
  std::string settings_sha256;
  std::vector<std::string> inputs;
  std::vector<UnitSummary> units;
};
/// Reads and checks a summary JSON file; throws InputError.
BatchSummary read_batch_summary(const std::string& path);

struct MergeOptions {
  bool allow_mixed_settings = false;  ///< false: shards fitted with different settings are refused
  std::string validate() const { return {}; }
};

/// Merges shards: units sorted by label (byte order), inputs concatenated.
/// Throws InputError when a unit appears in two shards, or (unless allowed)
/// the settings differ. `names` label the shards in messages.
BatchSummary merge_batch_summaries(const std::vector<BatchSummary>& shards,
                                   const std::vector<std::string>& names,
                                   const MergeOptions& options);

/// Writes summary.json and summary.csv of `s` into `dir` atomically.
void write_batch_summary(const BatchSummary& s, const std::string& dir);

}  // namespace ridgecal
