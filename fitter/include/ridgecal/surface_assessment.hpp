// ridgecal: tolerance, uncertainty and diagnostics for extended fits
// (multi_input_fit.hpp), the counterpart of assessment.hpp.
//
//  * uncertainty: the GUM budget of surface_uncertainty.hpp (same components
//    as in 1-D; u_fit from the design rows of the surface's terms);
//  * decision: simple or guarded acceptance on the errors of the final model
//    (training and test count; the cross-validated predictions are judged for
//    information), with U at each point's own (reading, aux) as the guard;
//  * warnings (diagnose_surface_fit): test vs validation, CV vs training
//    error, degree / aux degree / lambda at the edge of the grid, few
//    setpoint groups per term, outliers (studentized with the surface
//    leverage), a high condition number, points outside the calibrated
//    range of either input, and (with the data) hysteresis per (setpoint,
//    aux level). The 1-D shape checks (coverage gaps along the reading, runs
//    of residual signs, monotonic curve) are not applied: they are defined
//    along one input.
#pragma once

#include <string>
#include <vector>

#include "ridgecal/assessment.hpp"
#include "ridgecal/surface_uncertainty.hpp"

namespace ridgecal {

/// Kept for callers of the earlier interface: always empty now (every
/// assessment option applies to extended fits).
std::string surface_assessment_unsupported(const AssessmentOptions& options);

/// Tolerance decision, uncertainty budget and warnings of an extended fit.
/// Preconditions: cal.surface is set; options.validate() is empty.
Assessment assess_surface_calibration(const Calibration& cal, const AssessmentOptions& options);
/// The same, plus the hysteresis check (the data's direction column, judged per
/// (setpoint, aux level) against the tolerance). `data` must be the data set
/// the calibration was fitted on (rows match cal.points by index).
Assessment assess_surface_calibration(const Dataset& data, const Calibration& cal,
                                      const AssessmentOptions& options);

/// The warnings of an extended fit (see above).
std::vector<Warning> diagnose_surface_fit(const Calibration& cal, const DiagnosticOptions& options);

// The individual checks.
/// Validation (CV) RMSE more than options.cv_training_ratio times the training RMSE: overfit.
std::vector<Warning> check_cv_vs_training(const Calibration& cal, const DiagnosticOptions& options);
/// Degree, aux degree or lambda chosen at the edge of its candidate grid.
std::vector<Warning> check_surface_grid_edges(const Calibration& cal);
/// Fewer than options.min_setpoints_per_coefficient training groups per term.
std::vector<Warning> check_groups_per_term(const Calibration& cal,
                                           const DiagnosticOptions& options);
/// check_hysteresis of diagnostics.hpp with groups keyed by setpoint and aux
/// level (the aux setpoint label, else the aux value rounded to cal.aux_step).
std::vector<Warning> check_surface_hysteresis(const Dataset& data, const Calibration& cal,
                                              const ToleranceSpec* tolerance);
/// Externally studentized residuals (in the fitted output v, surface leverage).
std::vector<Warning> check_surface_outliers(const Calibration& cal,
                                            const DiagnosticOptions& options);
/// Points whose (transformed) reading or aux value lies outside the calibrated
/// region; `which` selects the points (e.g. only the test points).
std::vector<Warning> check_surface_extrapolation(const SurfaceModel& model,
                                                 const std::vector<double>& readings,
                                                 const std::vector<double>& aux,
                                                 const std::vector<std::size_t>& lines,
                                                 const std::string& what);

}  // namespace ridgecal
