// ridgecal: warnings about a calibration, each with a stable code and a plain
// sentence. Warnings never change the fit or the decision; they tell the
// reviewer where to look. Thresholds are DiagnosticOptions members; their
// defaults are common practice or our judgement (docs/decision-and-uncertainty.md).
#pragma once

#include <cmath>
#include <cstddef>
#include <limits>
#include <nlohmann/json.hpp>
#include <optional>
#include <string>
#include <vector>

#include "ridgecal/calibration.hpp"
#include "ridgecal/calibration_csv.hpp"
#include "ridgecal/tolerance.hpp"
#include "ridgecal/uncertainty.hpp"

namespace ridgecal {

/// Stable codes (the text form is what records and scripts see).
enum class DiagnosticCode {
  TestMuchWorseThanValidation,      ///< `test-much-worse-than-validation`
  DegreeAtGridEdge,                 ///< `degree-at-grid-edge`
  LambdaAtGridEdge,                 ///< `lambda-at-grid-edge`
  FewSetpointsPerCoefficient,       ///< `few-setpoints-per-coefficient`
  RangeNotCovered,                  ///< `range-not-covered`
  CoverageGap,                      ///< `coverage-gap`
  Outlier,                          ///< `outlier`
  ResidualPattern,                  ///< `residual-pattern`
  NonMonotonic,                     ///< `non-monotonic`
  Hysteresis,                       ///< `hysteresis`
  HighConditionNumber,              ///< `high-condition-number`
  Extrapolation,                    ///< `extrapolation`
  RecordModified,                   ///< `record-modified` (verify --allow-modified)
  ValidationMuchWorseThanTraining,  ///< `validation-much-worse-than-training`
  LackOfFit,                        ///< `lack-of-fit` (lack_of_fit.hpp)
  DriftBetweenRepeats,              ///< `drift-between-repeats` (lack_of_fit.hpp)
};
std::string to_string(DiagnosticCode c);
DiagnosticCode diagnostic_code_from_string(const std::string& s);  ///< throws std::invalid_argument
/// Every code, in declaration order.
std::vector<DiagnosticCode> all_diagnostic_codes();

struct Warning {
  DiagnosticCode code = DiagnosticCode::Outlier;
  std::string message;             ///< one plain sentence (or two)
  std::vector<std::size_t> lines;  ///< data-file lines concerned, if any
  double value =
      std::numeric_limits<double>::quiet_NaN();  ///< the figure that triggered it, if any
};

struct DiagnosticOptions {
  /// Warn when validation (CV) RMSE > ratio * training RMSE (overfit); > 1.
  double cv_training_ratio = 2.0;
  double coverage_end_fraction =
      0.05;  ///< declared span ends must be reached within this fraction of the span; 0..0.5
  double gap_factor = 2.5;  ///< warn when a gap between adjacent setpoints (training and test)
                            ///< exceeds this many mean spacings; > 1
  double runs_z = 1.96;     ///< warn when the runs test z is below -runs_z (too few runs); > 0
  std::size_t runs_min_setpoints =
      10;                        ///< run the runs test only with this many training setpoints; >= 4
  double condition_limit = 1e6;  ///< warn when the design's condition number exceeds this; > 1
  // The calibrated checks of lack_of_fit.hpp (issue 13): each threshold is a
  // false-alarm probability on clean data, 0 < alpha < 1; their choice and the
  // measured rates are in docs/monte-carlo.md.
  double lack_of_fit_alpha = 0.01;  ///< `lack-of-fit` when the F test's p is below this
  double outlier_alpha = 0.01;      ///< family-wise (Bonferroni) rate of `outlier` per fit
  double drift_alpha = 0.01;        ///< `drift-between-repeats` when the t test's p is below this
  double test_alpha = 0.01;  ///< `test-much-worse-than-validation` when the F test's p is below
  /// `few-setpoints-per-coefficient` when training setpoints - coefficients is below this; >= 0
  double min_spare_setpoints = 1.0;
  /// Declared span of the instrument in reference units (NaN: not declared).
  double span_low = std::numeric_limits<double>::quiet_NaN();
  double span_high = std::numeric_limits<double>::quiet_NaN();

  bool has_span() const { return std::isfinite(span_low) && std::isfinite(span_high); }
  /// Empty when valid, else a message naming the field, the value and the rule.
  std::string validate() const;
};

/// All fit diagnostics, for every model (general_model(cal); the one-input
/// polynomial is the N = 1 case). `data` must be the data set the
/// calibration was fitted on (rows match cal.points by index; its direction
/// column drives the hysteresis check), or empty (no hysteresis check).
/// `tolerance` may be null (hysteresis is then not judged: the issue's
/// criterion is "differ beyond tolerance").
///
/// The checks live in fitter/src/diag_*.cpp by family (selection, range,
/// residuals, curve shape); this function (diagnostics.cpp) is the one place
/// that runs them all, in a fixed order. The coverage, residual-run and
/// monotonicity checks are defined along one input and return nothing for a
/// model with an aux input; hysteresis is then judged per (setpoint, aux level).
std::vector<Warning> diagnose_fit(const Dataset& data, const Calibration& cal,
                                  const UncertaintyBudget& uncertainty,
                                  const ToleranceSpec* tolerance, const DiagnosticOptions& options);

// The individual checks (each returns the warnings it raises).
// diag_selection.cpp: the model choice.
/// Validation (CV) RMSE more than o.cv_training_ratio times the training RMSE: overfit.
std::vector<Warning> check_cv_vs_training(const Calibration& cal, const DiagnosticOptions& o);
/// Degree, aux degree (fits with an aux input) or lambda chosen at the edge of its candidate grid.
std::vector<Warning> check_grid_edges(const Calibration& cal);
std::vector<Warning> check_condition(const Calibration& cal, const DiagnosticOptions& o);

// diag_range.cpp: the calibrated range.
/// Declared span not reached, gaps between setpoints (one input only).
std::vector<Warning> check_coverage(const Calibration& cal, const DiagnosticOptions& o);
/// Points whose (transformed) reading or aux value lies outside the model's
/// calibrated region; `what` names them ("check points", "as-found readings").
/// The warning's value is the largest distance beyond the range in reading
/// units (of the transformed reading when there are transforms), or in aux
/// units when only aux values are outside.
std::vector<Warning> check_extrapolation(const Model& model, const std::vector<double>& readings,
                                         const std::vector<double>& aux,
                                         const std::vector<std::size_t>& lines,
                                         const std::string& what);

// diag_residuals.cpp: the residuals.
/// Runs test on the signs of the mean residual per training setpoint (one input only).
std::vector<Warning> check_residual_runs(const Calibration& cal, const DiagnosticOptions& o);

// diag_curve_shape.cpp: the shape of the curve along the reading.
/// The slope changes sign over the calibrated range (one input only).
std::vector<Warning> check_monotonic(const Calibration& cal);
/// Mean error of the up rows minus that of the down rows, per setpoint measured
/// in both directions, against the tolerance at that setpoint (null: no check).
/// With an aux input: per (setpoint, aux level), the level being the aux
/// setpoint label, else the aux value rounded to cal.aux_step.
std::vector<Warning> check_hysteresis(const Dataset& data, const Calibration& cal,
                                      const UncertaintyBudget& uncertainty,
                                      const ToleranceSpec* tolerance);

/// Wald-Wolfowitz runs test on the signs of a sequence (zeros skipped):
/// the z statistic of the number of runs (NaN with fewer than 2 of each sign).
double runs_test_z(const std::vector<double>& values);

nlohmann::json to_json(const Warning& w);
nlohmann::json to_json(const std::vector<Warning>& ws);
std::vector<Warning> warnings_from_json(const nlohmann::json& j,
                                        const std::string& file);  ///< throws InputError
/// "warning [code]: message" lines for stderr.
std::string format_warnings(const std::vector<Warning>& ws);

}  // namespace ridgecal
