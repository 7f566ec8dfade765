// ridgecal internal: the training readings grouped by setpoint (and aux
// level), with their residuals in the fitted output; shared by the
// lack-of-fit test and the calibrated checks (lack_of_fit.hpp).
#pragma once

#include <cstddef>
#include <map>
#include <string>
#include <vector>

#include "ridgecal/calibration.hpp"
#include "ridgecal/calibration_csv.hpp"

namespace ridgecal::detail {

struct RepeatGroup {
  std::string key;                  ///< setpoint id (" @ aux LEVEL" with an aux input)
  std::vector<std::size_t> points;  ///< indices into cal.points, in file-line order
  std::vector<double> residuals;    ///< fitted-output residuals, same order
  double mean_reference = 0.0;      ///< mean reference of the group
  double mean_aux = 0.0;            ///< mean aux value (0 without an aux input)
  double mean_residual = 0.0;
  double ss_pure = 0.0;  ///< sum of squares about mean_residual
};

/// Residual of every point of cal.points in the model's fitted output (NaN
/// where a transform is undefined).
std::vector<double> fitted_residuals(const Calibration& cal);
/// The training points grouped (with `with_test`, the test points too, in
/// groups of their own); `data` may be empty (see lack_of_fit.hpp).
std::vector<RepeatGroup> training_groups(const Dataset& data, const Calibration& cal,
                                         bool with_test = false);
/// Intercept + sum of ridge filter factors of the final fit.
double effective_parameters(const Calibration& cal);

}  // namespace ridgecal::detail
