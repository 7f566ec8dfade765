// Ridge path: cross-check against the closed-form normal-equations solution in
// long double, and the properties the selection relies on.
#define BOOST_TEST_MODULE ridge_path
#include <boost/test/unit_test.hpp>
#include <cmath>
#include <vector>

#include "ridgecal/calibration.hpp"
#include "ridgecal/ridge_path.hpp"
#include "test_support.hpp"

using namespace ridgecal;

namespace {
// Acceptance from the issue: agreement with the long-double closed form to 1e-9 relative.
constexpr double kClosedFormRelTol = 1e-9;

// Solves (Xc^T Xc + n*lambda*I) b = Xc^T yc by Gaussian elimination with
// partial pivoting, all in long double; returns [b0, b1..bp].
std::vector<long double> closed_form(const std::vector<std::vector<long double>>& X,
                                     const std::vector<long double>& y, long double lambda) {
  const std::size_t n = X.size(), p = X[0].size();
  std::vector<long double> xm(p, 0), A(p * p, 0), rhs(p, 0);
  long double ym = 0;
  for (std::size_t i = 0; i < n; ++i) {
    ym += y[i];
    for (std::size_t j = 0; j < p; ++j) xm[j] += X[i][j];
  }
  ym /= n;
  for (auto& v : xm) v /= n;
  for (std::size_t i = 0; i < n; ++i)
    for (std::size_t j = 0; j < p; ++j) {
      rhs[j] += (X[i][j] - xm[j]) * (y[i] - ym);
      for (std::size_t k = 0; k < p; ++k) A[j * p + k] += (X[i][j] - xm[j]) * (X[i][k] - xm[k]);
    }
  for (std::size_t j = 0; j < p; ++j) A[j * p + j] += static_cast<long double>(n) * lambda;
  for (std::size_t c = 0; c < p; ++c) {
    std::size_t piv = c;
    for (std::size_t r = c + 1; r < p; ++r)
      if (std::fabs(A[r * p + c]) > std::fabs(A[piv * p + c])) piv = r;
    for (std::size_t k = 0; k < p; ++k) std::swap(A[c * p + k], A[piv * p + k]);
    std::swap(rhs[c], rhs[piv]);
    for (std::size_t r = c + 1; r < p; ++r) {
      const long double f = A[r * p + c] / A[c * p + c];
      for (std::size_t k = c; k < p; ++k) A[r * p + k] -= f * A[c * p + k];
      rhs[r] -= f * rhs[c];
    }
  }
  std::vector<long double> b(p);
  for (std::size_t c = p; c-- > 0;) {
    long double s = rhs[c];
    for (std::size_t k = c + 1; k < p; ++k) s -= A[c * p + k] * b[k];
    b[c] = s / A[c * p + c];
  }
  long double b0 = ym;
  for (std::size_t j = 0; j < p; ++j) b0 -= xm[j] * b[j];
  std::vector<long double> out{b0};
  out.insert(out.end(), b.begin(), b.end());
  return out;
}
}  // namespace

BOOST_AUTO_TEST_CASE(ridge_coefficients_match_long_double_normal_equations) {
  // Fixed data set: a sensor-like curve with noise, 9 setpoints x 3 repeats.
  const Dataset ds = test::synthetic_run([](double x) { return 3.0 + 0.02 * x + 1e-6 * x * x; },
                                         1000.0, 4000.0, 9, 3, 0.01, 4242);
  for (int degree : {1, 3, 5}) {
    for (double lambda : {1e-6, 1e-3, 0.1}) {
      FitOptions opt;
      opt.fixed_degree = degree;
      opt.fixed_lambda = lambda;
      opt.split.test_fraction = 0.0;
      const FitOutcome fit = fit_calibration(ds, opt);
      BOOST_REQUIRE(fit.status.ok);
      const AxisScaling& sc = fit.calibration.model.input;
      std::vector<std::vector<long double>> X;
      std::vector<long double> y;
      for (const auto& ob : ds.rows) {
        std::vector<double> row(static_cast<std::size_t>(degree) + 1);
        chebyshev_row(sc.to_scaled(ob.reading), degree, row.data());
        X.emplace_back(row.begin() + 1, row.end());
        y.push_back(ob.reference);
      }
      const auto want = closed_form(X, y, lambda);
      const auto& got = fit.calibration.model.coefficients;
      long double scale = 0;
      for (auto v : want) scale = std::max(scale, std::fabs(v));
      for (std::size_t k = 0; k < want.size(); ++k) {
        const double rel = static_cast<double>(std::fabs(got[k] - want[k]) / scale);
        BOOST_TEST(rel <= kClosedFormRelTol, "degree " << degree << " lambda " << lambda << " c"
                                                       << k << ": " << got[k] << " vs "
                                                       << static_cast<double>(want[k]));
      }
    }
  }
}

BOOST_AUTO_TEST_CASE(intercept_is_not_penalised) {
  // With a huge penalty every slope coefficient vanishes and the curve becomes
  // the mean of the references: the intercept itself is not shrunk to zero.
  Eigen::MatrixXd X(6, 2);
  Eigen::VectorXd y(6);
  for (int i = 0; i < 6; ++i) {
    X(i, 0) = i - 2.5;
    X(i, 1) = (i - 2.5) * (i - 2.5);
    y(i) = 100.0 + 3.0 * i;
  }
  RidgePath path(X, y);
  Eigen::VectorXd b;
  double b0 = 0;
  path.coefficients(1e12, b, b0);
  BOOST_TEST(b.norm() < 1e-9);
  Eigen::VectorXd pred;
  path.predict(path.project(X), 1e12, pred);
  BOOST_TEST(std::fabs(pred.mean() - y.mean()) < 1e-9);
}

BOOST_AUTO_TEST_CASE(predictions_from_projection_equal_coefficients) {
  Eigen::MatrixXd X = Eigen::MatrixXd::Random(20, 4);
  Eigen::VectorXd y = Eigen::VectorXd::Random(20);
  Eigen::MatrixXd Xn = Eigen::MatrixXd::Random(5, 4);
  RidgePath path(X, y);
  for (double lambda : {0.0, 1e-4, 1.0}) {
    Eigen::VectorXd b, pred;
    double b0 = 0;
    path.coefficients(lambda, b, b0);
    path.predict(path.project(Xn), lambda, pred);
    const Eigen::VectorXd direct = (Xn * b).array() + b0;
    BOOST_TEST((pred - direct).norm() < 1e-12);
  }
}

BOOST_AUTO_TEST_CASE(rank_deficiency_is_reported) {
  Eigen::MatrixXd X(5, 2);
  Eigen::VectorXd y(5);
  for (int i = 0; i < 5; ++i) {
    X(i, 0) = i;
    X(i, 1) = 2.0 * i;  // collinear
    y(i) = i;
  }
  RidgePath path(X, y);
  BOOST_TEST(!path.status().ok);
  BOOST_TEST(path.rank() == 1);
  BOOST_TEST(std::isinf(path.condition_number()));
}
