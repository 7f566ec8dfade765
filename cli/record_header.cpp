#include "record_header.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <limits>
#include <sstream>

#include "ridgecal/calibration.hpp"
#include "ridgecal/errors.hpp"
#include "ridgecal/record.hpp"

namespace ridgecal::cli {

namespace {
// The record's optional assessment (rec.tolerance, rec.decision; see
// tolerance.hpp and decision.hpp). The refusal rule needs one absolute number:
// the strictest tolerance limit over the calibrated range, the minimum of
// limit(model) on a grid over the calibrated reading (and aux) range.
struct RecordAssessment {
  std::optional<double> tolerance_abs;
  std::string tolerance_text;
  std::string verdict;
};

RecordAssessment record_assessment(const CalibrationRecord& rec,
                                   const firmware::FirmwareModel& fm) {
  RecordAssessment a;
  if (rec.tolerance) {
    double strictest = std::numeric_limits<double>::infinity();
    // grid: 2001 readings for the one-input model, 401 x 41 (reading, aux)
    // for the extended one (41 only with an aux input)
    const auto [lo, hi] = firmware::raw_reading_range(fm);
    const int nx = fm.extended ? 401 : 2001, na = fm.has_aux() ? 41 : 1;
    for (int j = 0; j < na; ++j) {
      const double amin = na > 1 ? fm.inputs[1].min : 0.0, amax = na > 1 ? fm.inputs[1].max : 0.0;
      const double aux = na > 1 ? amin + (amax - amin) * j / (na - 1) : 0.0;
      for (int i = 0; i < nx; ++i) {
        const double y = fm.reference(lo + (hi - lo) * i / (nx - 1), aux);
        if (std::isfinite(y)) strictest = std::min(strictest, rec.tolerance->limit(y));
      }
    }
    if (std::isfinite(strictest) && strictest > 0) a.tolerance_abs = strictest;
    a.tolerance_text = fmt::format("{} ({}); strictest over the range {:.6g}",
                                   rec.tolerance->describe(), rec.tolerance->source, strictest);
  }
  if (rec.decision) {
    a.verdict = to_string(rec.decision->verdict);
    if (!rec.decision->statement.empty())
      a.verdict += ": " + rec.decision->statement;  // the statement names the rule
    else
      a.verdict += " (" + to_string(rec.decision->rule) + " acceptance)";
  }
  return a;
}
// "ntc" -> "NTC", "not-judged" -> "NOT_JUDGED": the spelling of a macro.
std::string upper_prefix(std::string s) {
  for (char& c : s)
    if (c >= 'a' && c <= 'z')
      c = static_cast<char>(c - 'a' + 'A');
    else if (c == '-')
      c = '_';
  return s;
}
}  // namespace

RecordHeaderResult make_record_header(const GuardedRecord& guarded, const std::string& record_path,
                                      const RecordHeaderRequest& request) {
  const CalibrationRecord& rec = guarded.record;
  const Calibration& cal = rec.calibration;
  // The one adapter: the general model, in the dialect is_extended(cal) picks.
  const firmware::FirmwareModel fm = firmware::firmware_model(cal);
  firmware::HeaderMeta meta;
  meta.sensor_name = rec.sensor.name;
  meta.reading_unit = rec.sensor.reading_unit;
  meta.reference_unit = rec.sensor.reference_unit;
  meta.degree = general_model(cal).total_degree();
  meta.lambda = cal.lambda;
  meta.validation_rmse =
      cal.validation.empty() ? firmware::HeaderMeta::kUnset : cal.validation.rmse;
  meta.validation_max_abs_error =
      cal.validation.empty() ? firmware::HeaderMeta::kUnset : cal.validation.max_abs_error;
  meta.test_rmse = cal.test.empty() ? firmware::HeaderMeta::kUnset : cal.test.rmse;
  meta.test_max_abs_error =
      cal.test.empty() ? firmware::HeaderMeta::kUnset : cal.test.max_abs_error;
  const RecordAssessment assessed = record_assessment(rec, fm);
  // The verdict is the record's, computed once by the assessment when the
  // record was made: the header states it verbatim and never judges again.
  // --tolerance only feeds the refusal rule (header arithmetic vs model).
  meta.tolerance_abs = request.tolerance ? request.tolerance : assessed.tolerance_abs;
  if (request.tolerance) meta.tolerance_abs_source = "--tolerance, for the refusal rule only";
  meta.tolerance_description = !request.tolerance_text.empty() ? request.tolerance_text
                               : !assessed.tolerance_text.empty()
                                   ? assessed.tolerance_text
                                   : std::string("none in the record");
  meta.pass_fail = !assessed.verdict.empty()
                       ? assessed.verdict
                       : std::string("not assessed (no tolerance in the record)");
  if (guarded.modified)
    meta.pass_fail =
        "RECORD MODIFIED after ridgecal wrote it (integrity SHA-256 does not match; exported "
        "with "
        "--allow-modified); " +
        meta.pass_fail;
  meta.verdict = guarded.modified                         ? firmware::HeaderVerdict::RecordModified
                 : !rec.decision                          ? firmware::HeaderVerdict::NotJudged
                 : rec.decision->verdict == Verdict::Pass ? firmware::HeaderVerdict::Pass
                 : rec.decision->verdict == Verdict::Undecided ? firmware::HeaderVerdict::Undecided
                                                               : firmware::HeaderVerdict::Fail;
  meta.calibration_date = rec.created_utc;
  meta.record_sha256 = guarded.seal.computed;
  meta.tool_version = std::string("ridgecal ") + tool_version();
  for (const auto& p : cal.points) {
    meta.calibration_readings.push_back(p.reading);
    meta.calibration_aux.push_back(p.aux);
  }
  // The record names the aux column, not its unit.
  meta.aux_unit = rec.input.columns.aux_column.empty() ? std::string()
                                                       : rec.input.columns.aux_column + " units";

  RecordHeaderResult result;
  const firmware::ExportResult& r = result.exported =
      firmware::generate_header(fm, meta, request.options);
  if (r.status == firmware::ExportStatus::InvalidInput)
    throw InputError(record_path, 0, r.message, "see 'ridgecal export --help'");
  if (r.status == firmware::ExportStatus::Refused) {
    result.status = RecordHeaderStatus::DeviationRefused;
    result.refusal = r.message +
                     "; nothing written\n  try --numeric double, or for fixed a larger "
                     "--output-scale";
    return result;
  }
  // After the header is proved, so that bad input (exit 2) is reported first.
  if (meta.verdict != firmware::HeaderVerdict::Pass && !request.allow_unpassed) {
    const char* why = meta.verdict == firmware::HeaderVerdict::Fail ? "its verdict is FAIL"
                      : meta.verdict == firmware::HeaderVerdict::NotJudged
                          ? "it has no verdict (no tolerance was given when it was fitted)"
                      : meta.verdict == firmware::HeaderVerdict::Undecided
                          ? "its verdict is UNDECIDED (the test error is far beyond what the "
                            "uncertainty budget allows)"
                          : "it was modified after ridgecal wrote it";
    std::ostringstream s;
    s << record_path << ": refused: " << why
      << "; nothing written. A header is written for a PASS record only; to write one anyway "
         "(e.g. for a test bench), add --allow-unpassed: its "
      << upper_prefix(request.options.prefix) << "_VERDICT macro is then "
      << upper_prefix(request.options.prefix) << "_VERDICT_"
      << upper_prefix(firmware::to_string(meta.verdict));
    result.status = RecordHeaderStatus::VerdictRefused;
    result.refusal = s.str();
  }
  return result;
}

}  // namespace ridgecal::cli
