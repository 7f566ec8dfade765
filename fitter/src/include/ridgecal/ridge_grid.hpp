// ridgecal: scoring a whole (degree, lambda) ridge grid for one
// training/validation split, sharing the work across degrees.
//
// Same problem and conventions as RidgePath (ridge_path.hpp): for the first d
// columns X_d of a design, minimise (1/m)||y - b0 - X_d b||^2 + lambda ||b||^2,
// intercept unpenalised (X and y centred on the training means).
//
// Nested bases: the design of each candidate is the first d columns of the
// design of the largest candidate (D columns); e.g. the Chebyshev degrees of
// one input, or total degrees with an aux input (fit_grid.hpp). One
// Householder QR of the centred m x D training design, Xc = Q R, serves every
// degree: R's leading d x d block is the R factor of degree d. For a penalty
// lambda the ridge problem of degree d is the least-squares problem
// [R_d; sqrt(m lambda) I] b = [z_d; 0] (z = Q^T yc), solved by Givens
// rotations that fold the penalty rows into R. Those rotations proceed column
// by column, so the leading d x d block of the rotated matrix is again exactly
// the factor of degree d: one O(D^3) update per lambda serves all degrees, and
// each degree then costs one triangular solve (d^2/2). This is as accurate as
// the SVD path (orthogonal transformations only; the normal equations are
// never formed).
//
// Rank: when a leading diagonal entry of R is tiny relative to the largest
// (below kRankTolerance), the degrees from there on are reported as not
// usable() and the caller falls back to RidgePath, whose truncated SVD defines
// the result at lambda = 0 for rank-deficient designs.
//
// No heap allocation after the first use of an object: buffers keep their
// capacity, and per-lambda scratch is fixed-size.
#pragma once

#include <Eigen/Dense>
#include <array>
#include <cstddef>
#include <vector>

namespace ridgecal {

class NestedRidge {
 public:
  static constexpr int kMaxColumns = 20;
  static constexpr double kRankTolerance = 1e-9;

  /// Factorises the training rows `rows` of the first `cols` columns of X
  /// (n x >= cols) against y (n values). With `intercept` false nothing is
  /// centred. Preconditions: 1 <= cols <= kMaxColumns, rows not empty.
  void factor(const Eigen::MatrixXd& X, const double* y, const std::vector<std::size_t>& rows,
              int cols, bool intercept);

  /// Penalty lambda * ||F b||^2 instead of lambda * ||b||^2: F is the upper
  /// triangular D x D factor (D = columns(), row-major, F[j * D + k]) of a
  /// penalty matrix F^T F whose leading d x d block is the penalty of degree d
  /// (e.g. curvature_factor(), roughness.hpp). Call after factor(); nullptr
  /// restores the plain ridge penalty (F = I). The penalty rows
  /// sqrt(m lambda) F are rotated in as for the identity, so every degree is
  /// still served by one update per lambda.
  void set_penalty_factor(const double* F);
  /// Sets the rows at which predictions are scored (validation rows).
  void set_validation(const Eigen::MatrixXd& X, const double* y,
                      const std::vector<std::size_t>& rows);

  int columns() const { return D_; }
  int rows() const { return m_; }
  /// Leading degrees 1..usable() can be solved here; higher ones need RidgePath.
  int usable() const { return usable_; }

  /// Penalties processed together: the per-lambda arithmetic runs in lanes
  /// (SIMD), each lane doing exactly the scalar operations, so results do not
  /// depend on how lambdas are batched.
  static constexpr int kLanes = 4;

  /// For the penalties lambdas[0..nl) (nl <= kLanes, each >= 0) and every
  /// degree in degrees[0..count) (ascending, each <= usable()): the mean
  /// squared error at the validation rows (val_mse, if not null) and at the
  /// training rows (train_mse, if not null), written to [t * kLanes + q] for
  /// degree t and lambda q.
  void score(const double* lambdas, int nl, const int* degrees, int count, double* val_mse,
             double* train_mse);

  /// As score(), but writes the predictions at the validation rows instead of
  /// their mean squared error: pred[(t * validation_rows() + i) * kLanes + q]
  /// for degree t, row i and lambda q (for errors measured after a transform).
  void predict_lanes(const double* lambdas, int nl, const int* degrees, int count, double* pred);
  int validation_rows() const { return nv_; }

  /// Coefficients of degree d <= usable() for penalty lambda: b[0..d) and the
  /// intercept b0 (as RidgePath::coefficients).
  void coefficients(int d, double lambda, double* b, double& b0);
  /// Ratio of the largest to the smallest singular value of the centred
  /// design of degree d <= usable() (the singular values of R's leading block).
  double condition_number(int d) const;

  /// Predictions at the validation rows of degree d <= usable(), penalty lambda.
  void predict_validation(int d, double lambda, double* out);

 private:
  void rotate_in_penalty(const double* mu);  // Rt_, zt_ from R_, z_ (per lane)
  // score() and predict_lanes(): one loop over the degrees, each output optional.
  void sweep(const double* lambdas, int nl, const int* degrees, int count, double* val_mse,
             double* train_mse, double* pred);
  void solve(int d);  // b_ from Rt_, zt_ (per lane)

  int D_ = 0, m_ = 0, nv_ = 0, usable_ = 0;
  bool intercept_ = true;
  bool factor_penalty_ = false;  // set_penalty_factor() given: P_ instead of I
  std::array<double, kMaxColumns * kMaxColumns> P_{};  // row-major, upper triangle
  double y_mean_ = 0.0;
  double rperp2_ = 0.0;     // squared norm of the part of yc outside span(Xc)
  std::vector<double> A_;   // m x D column-major work matrix (QR in place)
  std::vector<double> yw_;  // m
  std::vector<double> W_;   // nv x D row-major: centred validation design
  std::vector<double> yv_;  // nv
  std::array<double, kMaxColumns> x_mean_{};
  std::array<double, kMaxColumns * kMaxColumns> R_{};  // row-major upper triangle
  std::array<double, kMaxColumns> z_{};
  // Per-lane scratch: one lane vector (GCC/Clang vector extension, plain IEEE
  // double arithmetic per lane) per matrix entry.
  // (The alignment is spelled out: without it a vector type is 16-aligned in
  // baseline code but assumed 32-aligned by the AVX2 clones.)
  typedef double Lanes __attribute__((vector_size(sizeof(double) * kLanes)));
  alignas(
      32) Lanes Rt_[kMaxColumns * kMaxColumns] = {};  // R with the penalty rotated in, row-major
  alignas(32) Lanes zt_[kMaxColumns] = {};
  alignas(32) Lanes b_[kMaxColumns] = {};
};

}  // namespace ridgecal
