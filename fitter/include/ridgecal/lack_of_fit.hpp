// ridgecal: the checks that use the repeats at each setpoint (issue 13): a
// lack-of-fit F test against pure error, an outlier test with a
// Bonferroni-corrected limit, a drift test between repeats, and the reworked
// structure checks whose thresholds come from a stated false-alarm rate. The
// method, threshold and source of each check are in docs/monte-carlo.md
// ("AFTER"), where their false-alarm and detection rates are measured.
//
// Repeats: the training readings taken at one setpoint (extended fits with an
// aux input: at one setpoint and one aux level, the level being the aux
// setpoint label, else the aux value rounded to cal.aux_step). All residuals
// are taken in the model's fitted output (general_model(cal)): the reference
// itself for the one-input polynomial, the transformed reference otherwise.
#pragma once

#include <cstddef>
#include <limits>
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "ridgecal/calibration.hpp"
#include "ridgecal/calibration_csv.hpp"
#include "ridgecal/diagnostics.hpp"

namespace ridgecal {

/// The lack-of-fit F test of the final model on its training points:
/// F = (SS_lack / df_lack) / (SS_pure / df_pure), where SS_pure is the scatter
/// of the repeats about their setpoint mean residual (df_pure = sum of
/// (repeats - 1)), SS_lack = sum over setpoints of repeats * (mean residual)^2
/// (df_lack = setpoints - effective parameters of the fit, ridge filter
/// factors included), p = P(F(df_lack, df_pure) > F).
struct LackOfFit {
  bool computed = false;               ///< false: no setpoint with >= 2 repeats, or df_lack < 1
  std::size_t setpoints = 0;           ///< training setpoint groups
  std::size_t repeated_setpoints = 0;  ///< of which with >= 2 readings
  double f = std::numeric_limits<double>::quiet_NaN();
  double df_lack = std::numeric_limits<double>::quiet_NaN();  ///< may be fractional (ridge)
  double df_pure = std::numeric_limits<double>::quiet_NaN();
  double p = std::numeric_limits<double>::quiet_NaN();
  double alpha = std::numeric_limits<double>::quiet_NaN();  ///< the warning threshold applied
  std::string worst_setpoint;  ///< the setpoint contributing most to SS_lack
};

/// The test (never throws for the data; computed = false when it cannot run).
/// `data` may be empty (aux levels then come from rounding the aux values).
LackOfFit lack_of_fit_test(const Dataset& data, const Calibration& cal, double alpha);

nlohmann::json to_json(const LackOfFit& l);
LackOfFit lack_of_fit_from_json(const nlohmann::json& j, const std::string& file);  ///< InputError

/// P(F > f) for the F distribution with (d1, d2) degrees of freedom (Boost.Math;
/// cross-checked against scipy.stats.f.sf in test_lack_of_fit). NaN for
/// invalid arguments.
double f_distribution_sf(double f, double d1, double d2);
/// The two-sided critical value of Student's t: the t with P(|T| > t) = a,
/// df degrees of freedom (Boost.Math). NaN for invalid arguments.
double student_t_two_sided_critical(double a, double df);
/// P(|T| > |t|) for Student's t with df degrees of freedom.
double student_t_two_sided_p(double t, double df);

// The checks diagnose_fit registers (each returns the warnings it raises).

/// `lack-of-fit` when the test ran and p < o.lack_of_fit_alpha.
std::vector<Warning> check_lack_of_fit(const LackOfFit& lof);
/// `outlier`, Bonferroni-corrected: a reading at a setpoint with repeats is
/// compared with the mean of the other repeats there, scaled by the pooled
/// repeat scatter of itself and its nearest setpoints (a Student t under a
/// normal noise that changes slowly along the range); a reading without
/// repeats by its externally studentized residual. The limit is the t of a
/// family-wise false-alarm rate o.outlier_alpha over all readings tested. At
/// most one warning per setpoint (its most extreme reading).
std::vector<Warning> check_outliers_bonferroni(const Dataset& data, const Calibration& cal,
                                               const DiagnosticOptions& o);
/// `drift-between-repeats`: the pooled within-setpoint slope of the residual
/// against the repeat's order in the file (its line), t-tested against the
/// remaining pure error; warns when p < o.drift_alpha. Skipped when the data
/// has sweep directions (up/down order would alias hysteresis).
std::vector<Warning> check_repeat_drift(const Dataset& data, const Calibration& cal,
                                        const DiagnosticOptions& o);
/// `few-setpoints-per-coefficient`: fewer than o.min_spare_setpoints training
/// setpoints beyond the number of coefficients (terms): the curve then passes
/// through every setpoint mean, and nothing in the data checks its shape
/// between setpoints (the lack-of-fit test has no degree of freedom).
std::vector<Warning> check_spare_setpoints(const Calibration& cal, const DiagnosticOptions& o);
/// `test-much-worse-than-validation` as an F test: (test RMSE / validation
/// RMSE)^2 against F(test setpoints, validated setpoints), p < o.test_alpha
/// (setpoints as the independent units: the errors at one setpoint share its
/// reference error and the curve's error there).
std::vector<Warning> check_test_vs_validation_f(const Calibration& cal, const DiagnosticOptions& o);
/// check_grid_edges without the high-edge warning (a) when the next higher
/// candidate degree (or aux degree) was dropped for lack of setpoints: then
/// the grid is not the limit, the data are (a note of the selection); and (b)
/// when `lof` ran and found no lack of fit: then the top degree suffices, and
/// a higher one would only fit noise (cross-validation picks the top of the
/// grid by chance as well). `lof` may be null (no such evidence).
std::vector<Warning> check_grid_edges_feasible(const Calibration& cal,
                                               const LackOfFit* lof = nullptr);

}  // namespace ridgecal
