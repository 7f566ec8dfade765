// The curvature (roughness) penalty: Omega exact, its factor, and NestedRidge
// with the factor against a direct dense solve; offset and gain untouched.
#define BOOST_TEST_MODULE roughness
#include <boost/test/unit_test.hpp>
#include <cmath>
#include <vector>

#include "ridgecal/grouped_split.hpp"
#include "ridgecal/poly_model.hpp"
#include "ridgecal/ridge_grid.hpp"
#include "ridgecal/roughness.hpp"

using namespace ridgecal;

namespace {

// Omega entries are small integers computed by quadrature: a few ulps of 1e2.
constexpr double kExactTol = 1e-11;
// Nested Givens solve against a dense normal-equation solve (condition of
// X^T X + m lambda Omega up to ~1e8 for these designs): agreement to 1e-7
// relative is what the dense side can promise.
constexpr double kSolveTol = 1e-7;

struct Problem {
  Eigen::MatrixXd X;  // n x D Chebyshev columns T_1..T_D
  std::vector<double> t, y;
};

Problem make_problem(int n, int D, std::uint64_t seed, bool line) {
  SplitRng rng(seed);
  Problem p;
  p.X.resize(n, D);
  std::vector<double> row(static_cast<std::size_t>(D) + 1);
  for (int i = 0; i < n; ++i) {
    const double t = -1.0 + 2.0 * static_cast<double>(rng.below(1000001)) / 1e6;
    chebyshev_row(t, D, row.data());
    for (int k = 0; k < D; ++k) p.X(i, k) = row[static_cast<std::size_t>(k) + 1];
    const double noise = 0.05 * (static_cast<double>(rng.below(1001)) / 500.0 - 1.0);
    p.t.push_back(t);
    p.y.push_back((line ? 3.0 + 40.0 * t : std::exp(2.0 * t)) + noise);
  }
  return p;
}

std::vector<std::size_t> range(std::size_t a, std::size_t b) {
  std::vector<std::size_t> v;
  for (std::size_t i = a; i < b; ++i) v.push_back(i);
  return v;
}

// Ordinary least-squares line y = a + b t.
void ols_line(const std::vector<double>& t, const std::vector<double>& y, double& a, double& b) {
  double st = 0, sy = 0;
  for (std::size_t i = 0; i < t.size(); ++i) st += t[i], sy += y[i];
  const double tm = st / static_cast<double>(t.size()), ym = sy / static_cast<double>(t.size());
  double stt = 0, sty = 0;
  for (std::size_t i = 0; i < t.size(); ++i) {
    stt += (t[i] - tm) * (t[i] - tm);
    sty += (t[i] - tm) * (y[i] - ym);
  }
  b = sty / stt;
  a = ym - b * tm;
}

std::vector<double> row_major(const Eigen::MatrixXd& F) {
  std::vector<double> v(static_cast<std::size_t>(F.size()));
  for (int j = 0; j < F.rows(); ++j)
    for (int k = 0; k < F.cols(); ++k) v[static_cast<std::size_t>(j * F.cols() + k)] = F(j, k);
  return v;
}

// Fitted values at every row of p for degree d, penalty lambda.
std::vector<double> fitted(NestedRidge& nr, const Problem& p, int d, double lambda) {
  std::vector<double> b(static_cast<std::size_t>(d));
  double b0 = 0;
  nr.coefficients(d, lambda, b.data(), b0);
  std::vector<double> out;
  for (int i = 0; i < p.X.rows(); ++i) {
    double v = b0;
    for (int k = 0; k < d; ++k) v += p.X(i, k) * b[static_cast<std::size_t>(k)];
    out.push_back(v);
  }
  return out;
}

}  // namespace

BOOST_AUTO_TEST_CASE(omega_is_exact_for_known_entries) {
  const Eigen::MatrixXd om = chebyshev_curvature_gram(4);
  // T_1'' = 0: the linear term is in the null space.
  for (int k = 0; k < 4; ++k) BOOST_TEST(om(0, k) == 0.0);
  // T_2'' = 4: mean 16 (integral 32 over [-1, 1]).
  BOOST_TEST(std::fabs(om(1, 1) - 16.0) < kExactTol);
  // T_3'' = 24 t: mean of 576 t^2 = 192; odd against T_2'': 0.
  BOOST_TEST(std::fabs(om(2, 2) - 192.0) < kExactTol);
  BOOST_TEST(std::fabs(om(1, 2)) < kExactTol);
  // T_4'' = 96 t^2 - 16: with T_2'' mean 4 (32 - 16) = 64; own mean
  // 9216/5 - 2*96*16/3 + 256 = 1843.2 - 1024 + 256 = 1075.2.
  BOOST_TEST(std::fabs(om(1, 3) - 64.0) < kExactTol);
  BOOST_TEST(std::fabs(om(3, 3) - 1075.2) < 1e2 * kExactTol);
}

BOOST_AUTO_TEST_CASE(factor_reproduces_omega_and_nests) {
  const int D = 12;
  const Eigen::MatrixXd om = chebyshev_curvature_gram(D), F = curvature_factor(D);
  BOOST_TEST((F.transpose() * F - om).norm() <= 1e-12 * om.norm());
  BOOST_TEST(F.isUpperTriangular());
  for (int d = 1; d <= D; ++d) {
    BOOST_TEST((chebyshev_curvature_gram(d) - om.topLeftCorner(d, d)).norm() <= 1e-12 * om.norm());
    BOOST_TEST((curvature_factor(d) - F.topLeftCorner(d, d)).norm() <= 1e-9 * F.norm());
  }
}

BOOST_AUTO_TEST_CASE(nested_solver_matches_a_dense_solve) {
  const int D = 8, n = 60;
  const Problem p = make_problem(n, D, 11, false);
  const auto tr = range(0, 45), va = range(45, 60);
  const std::vector<double> F = row_major(curvature_factor(D));
  NestedRidge nr;
  nr.factor(p.X, p.y.data(), tr, D, true);
  nr.set_penalty_factor(F.data());
  const double m = static_cast<double>(tr.size());
  for (double lambda : {0.0, 1e-6, 1e-3, 0.1, 10.0}) {
    for (int d = 1; d <= D; ++d) {
      // Dense: centred normal equations (Xc^T Xc + m lambda Omega_d) b = Xc^T yc.
      Eigen::MatrixXd Xc = p.X.topLeftCorner(45, d);
      Eigen::VectorXd yc = Eigen::Map<const Eigen::VectorXd>(p.y.data(), 45);
      const Eigen::RowVectorXd xm = Xc.colwise().mean();
      Xc.rowwise() -= xm;
      const double ym = yc.mean();
      yc.array() -= ym;
      const Eigen::MatrixXd A = Xc.transpose() * Xc + m * lambda * chebyshev_curvature_gram(d);
      const Eigen::VectorXd bd = A.ldlt().solve(Xc.transpose() * yc);
      const double b0d = ym - xm.dot(bd);
      std::vector<double> b(static_cast<std::size_t>(d));
      double b0 = 0;
      nr.coefficients(d, lambda, b.data(), b0);
      for (int k = 0; k < d; ++k)
        BOOST_TEST(std::fabs(b[static_cast<std::size_t>(k)] - bd(k)) <=
                   kSolveTol * (1.0 + bd.cwiseAbs().maxCoeff()));
      BOOST_TEST(std::fabs(b0 - b0d) <= kSolveTol * (1.0 + std::fabs(b0d)));
    }
  }
  // The lane path (score) agrees with coefficients() at the validation rows.
  nr.set_validation(p.X, p.y.data(), va);
  const double lambdas[NestedRidge::kLanes] = {0.0, 1e-4, 1e-2, 1.0};
  std::vector<int> degrees;
  for (int d = 1; d <= D; ++d) degrees.push_back(d);
  std::vector<double> val(degrees.size() * NestedRidge::kLanes);
  nr.score(lambdas, NestedRidge::kLanes, degrees.data(), D, val.data(), nullptr);
  for (int d = 1; d <= D; ++d)
    for (int q = 0; q < NestedRidge::kLanes; ++q) {
      const std::vector<double> f = fitted(nr, p, d, lambdas[q]);
      double sse = 0;
      for (std::size_t i : va) sse += (f[i] - p.y[i]) * (f[i] - p.y[i]);
      const double mse = sse / static_cast<double>(va.size());
      BOOST_TEST(std::fabs(val[static_cast<std::size_t>((d - 1) * NestedRidge::kLanes + q)] -
                           mse) <= 1e-9 * (1.0 + mse));
    }
}

BOOST_AUTO_TEST_CASE(offset_and_gain_are_those_of_least_squares_for_any_lambda) {
  // Normal equations: X^T (y - p) = m lambda Omega b, and Omega annihilates
  // the constant and linear directions, so the residuals are orthogonal to
  // 1 and t: the least-squares line through the fitted values is the
  // least-squares line through the data, whatever lambda.
  const int D = 5, n = 40;
  const Problem p = make_problem(n, D, 7, true);
  const auto tr = range(0, static_cast<std::size_t>(n));
  double a_ols, b_ols;
  ols_line(p.t, p.y, a_ols, b_ols);
  const std::vector<double> F = row_major(curvature_factor(D));
  NestedRidge nr;
  nr.factor(p.X, p.y.data(), tr, D, true);
  nr.set_penalty_factor(F.data());
  for (double lambda : {0.0, 1e-4, 1e-2, 1.0, 1e2}) {
    double a, b;
    ols_line(p.t, fitted(nr, p, D, lambda), a, b);
    BOOST_TEST(std::fabs(a - a_ols) <= 1e-9 * std::fabs(a_ols));
    BOOST_TEST(std::fabs(b - b_ols) <= 1e-9 * std::fabs(b_ols));
  }
  // The plain ridge penalty, by contrast, shrinks the gain (the defect the
  // curvature penalty removes).
  nr.set_penalty_factor(nullptr);
  double a, b;
  ols_line(p.t, fitted(nr, p, D, 1.0), a, b);
  BOOST_TEST(std::fabs(b - b_ols) > 0.1 * std::fabs(b_ols));
}

BOOST_AUTO_TEST_CASE(large_lambda_tends_to_the_least_squares_line) {
  const int D = 6, n = 50;
  const Problem p = make_problem(n, D, 5, false);  // curved truth
  const auto tr = range(0, static_cast<std::size_t>(n));
  double a_ols, b_ols;
  ols_line(p.t, p.y, a_ols, b_ols);
  const std::vector<double> F = row_major(curvature_factor(D));
  NestedRidge nr;
  nr.factor(p.X, p.y.data(), tr, D, true);
  nr.set_penalty_factor(F.data());
  std::vector<double> b(D);
  double b0 = 0;
  nr.coefficients(D, 1e6, b.data(), b0);
  // Curvature coefficients vanish like 1/lambda; 1e6 leaves them below 1e-4.
  for (int k = 1; k < D; ++k) BOOST_TEST(std::fabs(b[static_cast<std::size_t>(k)]) < 1e-4);
  BOOST_TEST(std::fabs(b[0] - b_ols) < 1e-3);
  BOOST_TEST(std::fabs(b0 - a_ols) < 1e-3);
}
