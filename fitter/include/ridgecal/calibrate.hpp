// ridgecal: the calibration pipeline in one call, fit -> assess -> record.
//
// calibrate() is the one place where a data set becomes a calibration record:
// `ridgecal fit`, `ridgecal batch` (every unit) and library callers use it,
// so they give the same record, the same verdict and the same warnings for
// the same data and options. It chooses between the one-input fit
// (fit_calibration, calibration.hpp) and the extended fit (fit_extended,
// extended_fit.hpp: a second input, transforms, restricted powers) in one
// branch; one assessment (assess_calibration, assessment.hpp) serves both.
//
// The verdict (PASS/FAIL) is computed here, once, by the assessment, and
// stored in the record (record.decision). Everything downstream (the CLI's
// exit code and summary, `export`'s header, `report`, the batch summary)
// reads it from the record and never judges again.
//
// Example (library caller):
//
//     ridgecal::CsvOptions csv;
//     csv.setpoint_column = "setpoint";
//     const ridgecal::Dataset data = ridgecal::read_calibration_csv("run.csv", csv);
//     ridgecal::CalibrateOptions opt;
//     opt.assess.tolerance = ridgecal::ToleranceSpec{...};
//     const ridgecal::CalibrateResult r = ridgecal::calibrate(data, opt);
//     if (!r.status.ok) { /* r.status.message: too few setpoints, ... */ }
//     const std::string json = ridgecal::record_text(ridgecal::record_to_json(r.record));
#pragma once

#include <optional>
#include <string>

#include "ridgecal/assessment.hpp"
#include "ridgecal/calibration.hpp"
#include "ridgecal/calibration_csv.hpp"
#include "ridgecal/errors.hpp"
#include "ridgecal/extended_fit.hpp"
#include "ridgecal/hardware_checks.hpp"
#include "ridgecal/record.hpp"

namespace ridgecal {

struct CalibrateOptions {
  FitOptions fit;  ///< degrees, penalties, rule, split; default: the CLI's defaults
  /// Second input, transforms, restricted powers. When comp.active() the data
  /// are fitted with fit_extended (and comp.aux must match whether the data
  /// were read with an aux column); otherwise with fit_calibration. Default: none.
  ExtendedOptions comp;
  /// Tolerance, decision rule, uncertainty budget and diagnostics. Without a
  /// tolerance the record carries no decision (nothing is judged).
  AssessmentOptions assess;
  /// Hardware-fault checks on the raw data before the fit (hardware_checks.hpp);
  /// default: on, a plateau of 2 or more setpoints is bad input.
  HardwareCheckOptions hardware;
  SensorInfo sensor;  ///< copied into the record; default: empty (unnamed, unstated units)
  std::string
      created_utc;  ///< creation time for the record (ISO 8601); "" omits it (reproducible output)
  /// false (default): the record always carries the full assessment
  /// (uncertainty budget and warnings), as every written record must. true:
  /// when no tolerance is given (nothing to judge) the assessment is skipped
  /// (it costs about 15 times the fit): the record then has no uncertainty
  /// budget and no warnings. Only for callers that keep the figures but not
  /// the record (the batch's summaries-only run).
  bool skip_unjudged_assessment = false;

  /// Empty when valid, else a message naming the field, the value and the rule.
  std::string validate() const;
};

struct CalibrateResult {
  /// Failure of the fit itself, an expected numeric outcome (too few
  /// setpoints, all readings equal, too few setpoints to cross-validate): the
  /// message says which, and `record` holds nothing useful.
  Status status;
  /// The complete record on success: input (data.file, data.sha256, the row
  /// count, data.columns), sensor, creation time, tool version, calibration,
  /// and the assessment (tolerance, decision, uncertainty, warnings).
  CalibrationRecord record;

  /// The verdict stored in the record; empty without a tolerance (not judged).
  std::optional<Verdict> verdict() const;
  /// True when the record is judged and FAIL (the CLI's exit code 1).
  bool out_of_tolerance() const;
  /// True when the record is judged UNDECIDED (adequacy check; also exit code 1).
  bool undecided() const;
};

/// Fits, assesses and assembles the record of one data set.
/// Preconditions: options.validate() is empty; `data` was read with the
/// columns the options need (an aux column exactly when options.comp.aux).
/// The data's direction column (Observation::direction), when present, drives
/// the hysteresis check of one-input and extended fits alike.
/// Throws InputError for a constant or near-constant reference or reading
/// (require_variation), for a %-of-span tolerance on a zero span, and for
/// problems of the data that only the fit can see (a reading outside a transform's domain, a
/// setpoint with mixed roles, a missing aux value); returns a failed status for expected numeric
/// outcomes. Deterministic: the result depends only on `data` and `options`.
CalibrateResult calibrate(const Dataset& data, const CalibrateOptions& options);

}  // namespace ridgecal
