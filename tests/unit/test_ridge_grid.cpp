// NestedRidge (one QR shared by every degree, penalty rotated in per lambda)
// against RidgePath (one thin SVD per degree) on the same problems.
#define BOOST_TEST_MODULE ridge_grid
#include <boost/test/unit_test.hpp>
#include <cmath>
#include <vector>

#include "ridgecal/grouped_split.hpp"
#include "ridgecal/poly_model.hpp"
#include "ridgecal/ridge_grid.hpp"
#include "ridgecal/ridge_path.hpp"

using namespace ridgecal;

namespace {

struct Problem {
  Eigen::MatrixXd X;  // n x D Chebyshev columns 1..D
  std::vector<double> y;
};

Problem make_problem(int n, int D, std::uint64_t seed, bool clustered = false) {
  SplitRng rng(seed);
  Problem p;
  p.X.resize(n, D);
  p.y.resize(static_cast<std::size_t>(n));
  std::vector<double> row(static_cast<std::size_t>(D) + 1);
  for (int i = 0; i < n; ++i) {
    double t = -1.0 + 2.0 * static_cast<double>(rng.below(1000001)) / 1e6;
    if (clustered) t = 0.5 + 0.01 * t;
    chebyshev_row(t, D, row.data());
    for (int k = 0; k < D; ++k) p.X(i, k) = row[static_cast<std::size_t>(k) + 1];
    p.y[static_cast<std::size_t>(i)] =
        std::exp(t) + 0.01 * (static_cast<double>(rng.below(1001)) / 500.0 - 1.0);
  }
  return p;
}

std::vector<std::size_t> range(std::size_t a, std::size_t b) {
  std::vector<std::size_t> v;
  for (std::size_t i = a; i < b; ++i) v.push_back(i);
  return v;
}

}  // namespace

BOOST_AUTO_TEST_CASE(matches_the_svd_path_for_every_degree_and_lambda) {
  for (bool intercept : {true, false}) {
    const Problem p = make_problem(50, 8, intercept ? 3 : 4);
    const auto tr = range(0, 40), va = range(40, 50);
    NestedRidge nr;
    nr.factor(p.X, p.y.data(), tr, 8, intercept);
    nr.set_validation(p.X, p.y.data(), va);
    BOOST_TEST(nr.usable() == 8);
    const std::vector<double> lambdas{0.0, 1e-12, 1e-6, 1e-3, 0.5};
    const std::vector<int> degrees{1, 2, 3, 4, 5, 6, 7, 8};
    std::vector<double> val(degrees.size() * NestedRidge::kLanes), trn(val.size());
    nr.score(lambdas.data(), NestedRidge::kLanes, degrees.data(), 8, val.data(), nullptr);
    nr.score(lambdas.data(), NestedRidge::kLanes, degrees.data(), 8, nullptr, trn.data());
    for (int d : degrees) {
      Eigen::MatrixXd Xtr(40, d), Xva(10, d);
      Eigen::VectorXd ytr(40), yva(10);
      for (int i = 0; i < 40; ++i)
        Xtr.row(i) = p.X.row(i).head(d), ytr(i) = p.y[static_cast<std::size_t>(i)];
      for (int i = 0; i < 10; ++i)
        Xva.row(i) = p.X.row(40 + i).head(d), yva(i) = p.y[static_cast<std::size_t>(40 + i)];
      const RidgePath path(Xtr, ytr, intercept);
      const Eigen::MatrixXd Wv = path.project(Xva), Wt = path.project(Xtr);
      Eigen::VectorXd pred;
      for (int q = 0; q < NestedRidge::kLanes; ++q) {
        path.predict(Wv, lambdas[static_cast<std::size_t>(q)], pred);
        const double v = (pred - yva).squaredNorm() / 10.0;
        path.predict(Wt, lambdas[static_cast<std::size_t>(q)], pred);
        const double t = (pred - ytr).squaredNorm() / 40.0;
        const std::size_t at =
            static_cast<std::size_t>(d - 1) * NestedRidge::kLanes + static_cast<std::size_t>(q);
        BOOST_TEST(std::fabs(val[at] - v) <= 1e-10 * v,
                   "d " << d << " lambda " << lambdas[static_cast<std::size_t>(q)]);
        BOOST_TEST(std::fabs(trn[at] - t) <= 1e-10 * t,
                   "d " << d << " lambda " << lambdas[static_cast<std::size_t>(q)]);
      }
    }
  }
}

BOOST_AUTO_TEST_CASE(lanes_do_not_change_results) {
  // The same lambda in every lane, or alone: bit-identical.
  const Problem p = make_problem(30, 6, 9);
  NestedRidge nr;
  nr.factor(p.X, p.y.data(), range(0, 24), 6, true);
  nr.set_validation(p.X, p.y.data(), range(24, 30));
  const int degrees[] = {2, 4, 6};
  const double four[] = {1e-4, 1e-4, 1e-4, 1e-4};
  const double mixed[] = {0.0, 1e-4, 3.0, 1e-9};
  std::vector<double> a(3 * NestedRidge::kLanes), b(a.size()), c(a.size());
  nr.score(four, NestedRidge::kLanes, degrees, 3, a.data(), nullptr);
  nr.score(mixed, NestedRidge::kLanes, degrees, 3, b.data(), nullptr);
  nr.score(four, 1, degrees, 3, c.data(), nullptr);
  for (int t = 0; t < 3; ++t) {
    const std::size_t base = static_cast<std::size_t>(t) * NestedRidge::kLanes;
    BOOST_TEST(a[base] == a[base + 1]);
    BOOST_TEST(a[base] == b[base + 1]);
    BOOST_TEST(a[base] == c[base]);
  }
}

BOOST_AUTO_TEST_CASE(rank_deficient_degrees_are_not_usable) {
  // Only 4 distinct t values: degrees >= 4 (4 centred columns need 5 points) are singular.
  Problem p = make_problem(20, 6, 5);
  std::vector<double> row(7);
  for (int i = 0; i < 20; ++i) {
    chebyshev_row(-0.9 + 0.6 * (i % 4), 6, row.data());
    for (int k = 0; k < 6; ++k) p.X(i, k) = row[static_cast<std::size_t>(k) + 1];
  }
  NestedRidge nr;
  nr.factor(p.X, p.y.data(), range(0, 20), 6, true);
  BOOST_TEST(nr.usable() == 3);
}

BOOST_AUTO_TEST_CASE(coefficients_and_condition_number_match_the_svd_path) {
  for (bool intercept : {true, false}) {
    const Problem p = make_problem(40, 7, intercept ? 11 : 12);
    NestedRidge nr;
    nr.factor(p.X, p.y.data(), range(0, 40), 7, intercept);
    for (int d : {1, 4, 7}) {
      Eigen::MatrixXd Xd = p.X.leftCols(d);
      const Eigen::VectorXd y = Eigen::Map<const Eigen::VectorXd>(p.y.data(), 40);
      const RidgePath path(Xd, y, intercept);
      BOOST_TEST(std::fabs(nr.condition_number(d) - path.condition_number()) <=
                 1e-10 * path.condition_number());
      for (double lambda : {0.0, 1e-9, 1e-2}) {
        Eigen::VectorXd b_svd, b_qr(d);
        double b0_svd = 0, b0_qr = 0;
        path.coefficients(lambda, b_svd, b0_svd);
        nr.coefficients(d, lambda, b_qr.data(), b0_qr);
        BOOST_TEST((b_qr - b_svd).norm() <= 1e-11 * (1.0 + b_svd.norm()),
                   "d " << d << " lambda " << lambda);
        BOOST_TEST(std::fabs(b0_qr - b0_svd) <= 1e-11 * (1.0 + std::fabs(b0_svd)));
      }
    }
  }
}
