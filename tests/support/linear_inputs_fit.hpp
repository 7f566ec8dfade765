// ridgecal tests: the n-input degree-1 design, a reference solver for the
// tests (NIST Longley, the plane of the aux fit). Not part of the library.
//
// y = b0 + sum_j b_j x_j, solved on scaled columns
// t_j = (x_j - center_j) / half_width_j (each input's range mapped on [-1, 1],
// i.e. the T_1 Chebyshev column of each input) through the centred thin SVD of
// ridge_path.hpp, with one step of iterative refinement in long double when
// lambda = 0. Coefficients in the raw inputs are derived in long double.
#pragma once

#include <Eigen/Dense>
#include <vector>

#include "ridgecal/errors.hpp"
#include "ridgecal/model.hpp"

namespace ridgecal {

struct LinearInputsFit {
  Status status;  ///< failure: an input is constant, or the design is rank deficient
  std::vector<AxisScaling> scalings;    ///< one per input column
  Eigen::VectorXd scaled_coefficients;  ///< b on the scaled columns
  double scaled_intercept = 0.0;
  std::vector<long double> slopes;  ///< raw: y = intercept + sum slopes[j] x_j
  long double intercept = 0.0L;
  double condition_number = 0.0;  ///< of the centred scaled design
  double residual_sd = 0.0;       ///< sqrt(RSS / (n - p - 1))
  double r2 = 0.0;

  double predict(const Eigen::Ref<const Eigen::RowVectorXd>& x) const;  ///< in the raw inputs
};
/// Preconditions: X.rows() == y.size() > X.cols() >= 1, all finite, lambda >= 0.
LinearInputsFit fit_linear_inputs(const Eigen::MatrixXd& X, const Eigen::VectorXd& y,
                                  double lambda = 0.0);

}  // namespace ridgecal
