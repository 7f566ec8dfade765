#include "ridgecal/roughness.hpp"

#include <cassert>
#include <cmath>

namespace ridgecal {

void gauss_legendre(int n, Eigen::VectorXd& nodes, Eigen::VectorXd& weights) {
  assert(n >= 1);
  // Golub-Welsch: the nodes are the eigenvalues of the Jacobi matrix of the
  // Legendre recurrence, the weights 2 * (first eigenvector component)^2.
  Eigen::MatrixXd J = Eigen::MatrixXd::Zero(n, n);
  for (int k = 1; k < n; ++k) {
    const double b = k / std::sqrt(4.0 * k * k - 1.0);
    J(k, k - 1) = b;
    J(k - 1, k) = b;
  }
  const Eigen::SelfAdjointEigenSolver<Eigen::MatrixXd> es(J);
  nodes = es.eigenvalues();
  weights.resize(n);
  for (int i = 0; i < n; ++i) weights(i) = 2.0 * es.eigenvectors()(0, i) * es.eigenvectors()(0, i);
}

Eigen::MatrixXd chebyshev_curvature_gram(int D) {
  assert(D >= 1);
  Eigen::MatrixXd omega = Eigen::MatrixXd::Zero(D, D);
  if (D < 2) return omega;
  Eigen::VectorXd t, w;
  gauss_legendre(D, t, w);
  // T_k, T_k', T_k'' by the three-term recurrence and its derivatives.
  Eigen::VectorXd T(D + 1), T1(D + 1), T2(D + 1);
  for (int q = 0; q < t.size(); ++q) {
    const double x = t(q);
    T(0) = 1.0, T1(0) = 0.0, T2(0) = 0.0;
    T(1) = x, T1(1) = 1.0, T2(1) = 0.0;
    for (int k = 2; k <= D; ++k) {
      T(k) = 2.0 * x * T(k - 1) - T(k - 2);
      T1(k) = 2.0 * T(k - 1) + 2.0 * x * T1(k - 1) - T1(k - 2);
      T2(k) = 4.0 * T1(k - 1) + 2.0 * x * T2(k - 1) - T2(k - 2);
    }
    for (int j = 2; j <= D; ++j)
      for (int k = 2; k <= D; ++k) omega(j - 1, k - 1) += 0.5 * w(q) * T2(j) * T2(k);
  }
  return omega;
}

Eigen::MatrixXd curvature_factor(int D) {
  const Eigen::MatrixXd omega = chebyshev_curvature_gram(D);
  Eigen::MatrixXd F = Eigen::MatrixXd::Zero(D, D);
  if (D < 2) return F;
  const Eigen::LLT<Eigen::MatrixXd> llt(omega.bottomRightCorner(D - 1, D - 1));
  assert(llt.info() == Eigen::Success);
  F.bottomRightCorner(D - 1, D - 1) = llt.matrixU();
  return F;
}

}  // namespace ridgecal
