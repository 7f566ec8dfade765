// ridgecal: the curvature (roughness) penalty on Chebyshev coefficients.
//
// For a curve p(t) = c_0 + sum_{k=1..D} c_k T_k(t) on the scaled range
// t in [-1, 1], the roughness is the mean of p''(t)^2 over that range:
//
//   R(c) = (1/2) * integral_{-1}^{1} p''(t)^2 dt = c^T Omega c,
//   Omega_jk = (1/2) * integral_{-1}^{1} T_j''(t) T_k''(t) dt   (j, k = 1..D).
//
// T_1'' = 0 (and the intercept c_0 is not a column), so the null space of
// Omega holds the constant and the linear term: a penalty lambda * R(c)
// never shrinks offset or gain. Omega is computed exactly by Gauss-Legendre
// quadrature (T_j'' T_k'' has degree <= 2D - 4; D nodes integrate degree
// 2D - 1 exactly).
//
// Nested degrees: Omega of degree d is the leading d x d block of Omega of
// degree D >= d. The factor F returned by curvature_factor() is upper
// triangular with F^T F = Omega (row 0 zero, rows 1.. the upper Cholesky
// factor of Omega on columns T_2..T_D), so its leading d x d block is again
// the factor of degree d: the property NestedRidge needs to fold the
// penalty rows sqrt(m lambda) F into R once for all degrees.
#pragma once
#include <Eigen/Dense>

namespace ridgecal {

/// Omega (D x D) over the columns T_1..T_D, as above. Precondition D >= 1.
Eigen::MatrixXd chebyshev_curvature_gram(int D);

/// Upper-triangular F (D x D) with F^T F = chebyshev_curvature_gram(D).
Eigen::MatrixXd curvature_factor(int D);

/// Gauss-Legendre nodes and weights on [-1, 1] (n >= 1), weights summing to 2.
void gauss_legendre(int n, Eigen::VectorXd& nodes, Eigen::VectorXd& weights);

}  // namespace ridgecal
