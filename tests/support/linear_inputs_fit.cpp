// ridgecal tests: the n-input degree-1 design (see linear_inputs_fit.hpp).
#include "linear_inputs_fit.hpp"

#include <fmt/format.h>

#include <cassert>
#include <cmath>
#include <limits>

#include "ridgecal/ridge_path.hpp"

namespace ridgecal {

namespace {
constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
}  // namespace

double LinearInputsFit::predict(const Eigen::Ref<const Eigen::RowVectorXd>& x) const {
  long double s = intercept;
  for (Eigen::Index j = 0; j < x.size(); ++j)
    s += slopes[static_cast<std::size_t>(j)] * static_cast<long double>(x(j));
  return static_cast<double>(s);
}

LinearInputsFit fit_linear_inputs(const Eigen::MatrixXd& X, const Eigen::VectorXd& y,
                                  double lambda) {
  assert(X.rows() == y.size() && X.rows() > X.cols() && X.cols() >= 1 && lambda >= 0.0);
  LinearInputsFit f;
  const Eigen::Index n = X.rows(), p = X.cols();
  Eigen::MatrixXd T(n, p);
  for (Eigen::Index j = 0; j < p; ++j) {
    const double lo = X.col(j).minCoeff(), hi = X.col(j).maxCoeff();
    if (!(hi > lo)) {
      f.status = Status::failure(fmt::format("input {} is constant; every input must vary", j + 1));
      return f;
    }
    f.scalings.push_back(AxisScaling::centered(lo, hi));
    for (Eigen::Index i = 0; i < n; ++i) T(i, j) = f.scalings.back().to_scaled(X(i, j));
  }
  const RidgePath path(T, y, true);
  f.status = path.status();
  f.condition_number = path.condition_number();
  Eigen::VectorXd b;
  double b0 = 0.0;
  path.coefficients(lambda, b, b0);
  auto residuals = [&](const Eigen::VectorXd& bb, double bb0) {
    Eigen::VectorXd r(n);
    for (Eigen::Index i = 0; i < n; ++i) {
      long double s = static_cast<long double>(y(i)) - bb0;
      for (Eigen::Index j = 0; j < p; ++j) s -= static_cast<long double>(bb(j)) * T(i, j);
      r(i) = static_cast<double>(s);
    }
    return r;
  };
  if (lambda == 0.0 && f.status.ok) {
    // One step of iterative refinement: solve for the correction from the
    // residual computed in long double.
    const RidgePath corr(T, residuals(b, b0), true);
    Eigen::VectorXd db;
    double db0 = 0.0;
    corr.coefficients(0.0, db, db0);
    b += db;
    b0 += db0;
  }
  f.scaled_coefficients = b;
  f.scaled_intercept = b0;
  long double ic = b0;
  f.slopes.resize(static_cast<std::size_t>(p));
  for (Eigen::Index j = 0; j < p; ++j) {
    const AxisScaling& sc = f.scalings[static_cast<std::size_t>(j)];
    const long double slope =
        static_cast<long double>(b(j)) / static_cast<long double>(sc.half_width);
    f.slopes[static_cast<std::size_t>(j)] = slope;
    ic -= slope * static_cast<long double>(sc.center);
  }
  f.intercept = ic;
  const Eigen::VectorXd r = residuals(b, b0);
  long double rss = 0, tss = 0;
  const long double ym = y.mean();
  for (Eigen::Index i = 0; i < n; ++i) {
    rss += static_cast<long double>(r(i)) * r(i);
    tss += (y(i) - ym) * (y(i) - ym);
  }
  f.residual_sd =
      n > p + 1 ? std::sqrt(static_cast<double>(rss / static_cast<long double>(n - p - 1))) : kNaN;
  f.r2 = tss > 0 ? static_cast<double>(1.0L - rss / tss) : kNaN;
  return f;
}

}  // namespace ridgecal
