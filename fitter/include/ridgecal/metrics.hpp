// ridgecal: error figures of a calibration on a set of points.
#pragma once

#include <cstddef>
#include <string>
#include <vector>

namespace ridgecal {

/// Error = predicted - reference (the error of indication after calibration).
/// Quantities are in reference units. Figures that cannot be computed (no
/// points, zero variance, too few degrees of freedom) are NaN, and the record
/// writes them as null.
struct Metrics {
  std::size_t n = 0;     ///< number of points
  int predictors = 0;    ///< polynomial terms besides the intercept (for adjusted R²)
  bool centered = true;  ///< R² about the mean (model with intercept), else uncentred
  double rmse = 0.0;
  double max_abs_error = 0.0;
  double bias = 0.0;  ///< mean error
  double r2 = 0.0;
  double adj_r2 = 0.0;
  double residual_sd = 0.0;  ///< sqrt(SSres / (n - predictors - intercept)), the fit's residual SD

  bool empty() const { return n == 0; }
  std::string brief() const;  ///< one line: RMSE, max, bias, R²
};

/// Computes the figures from parallel vectors of reference and predicted values.
/// `predictors` counts coefficients other than the intercept; with
/// `intercept` false, R² is uncentred (sum of squares about zero).
/// Sums are accumulated in long double.
Metrics compute_metrics(const std::vector<double>& reference, const std::vector<double>& predicted,
                        int predictors, bool intercept = true);

}  // namespace ridgecal
