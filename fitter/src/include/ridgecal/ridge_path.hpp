// ridgecal: ridge regression along a whole path of penalties from one thin SVD.
//
// Problem, for a design X (n rows, p columns, no intercept column) and y:
//   minimise (1/n) * || y - b0 - X b ||^2 + lambda * || b ||^2
// The intercept b0 is never penalised: X and y are centred on their training
// means, b is solved on the centred data and b0 = mean(y) - mean(X) b.
// Lambda is per observation (the data term is a mean), so the same lambda
// means the same relative shrinkage whatever the number of points.
//
// With the thin SVD  Xc = U S V^T  one has  b(lambda) = V diag(f) U^T yc  with
// filter factors f_j = s_j / (s_j^2 + n lambda); lambda = 0 is the minimum-norm
// least-squares solution, singular values below a relative threshold dropped.
// Every lambda costs O(p^2) (coefficients) or O(m p) (m predictions); the SVD
// is computed once.
#pragma once

#include <Eigen/Dense>

#include "ridgecal/errors.hpp"

namespace ridgecal {

class RidgePath {
 public:
  /// Factorises the problem. With `intercept` false nothing is centred and b0 = 0.
  /// Preconditions: X.rows() == y.size(), X.cols() >= 1, all values finite.
  RidgePath(const Eigen::Ref<const Eigen::MatrixXd>& X, const Eigen::Ref<const Eigen::VectorXd>& y,
            bool intercept = true);

  /// ok unless the design is rank deficient (then lambda = 0 drops directions).
  const Status& status() const { return status_; }
  int rank() const { return rank_; }
  /// Ratio of largest to smallest singular value of the centred design (inf if rank deficient).
  double condition_number() const;

  /// Coefficients for a penalty lambda >= 0.
  void coefficients(double lambda, Eigen::VectorXd& b, double& b0) const;

  /// Prepares predictions at other rows: returns W = (Xnew - mean) V, which
  /// `predict` combines with the filter factors of any lambda.
  Eigen::MatrixXd project(const Eigen::Ref<const Eigen::MatrixXd>& Xnew) const;
  /// Predictions at the rows given to `project`, for penalty lambda.
  void predict(const Eigen::MatrixXd& W, double lambda, Eigen::VectorXd& out) const;

  int n() const { return n_; }

 private:
  void filter(double lambda, Eigen::VectorXd& fz) const;  // fz_j = f_j z_j

  Status status_;
  bool intercept_;
  int n_ = 0;
  int rank_ = 0;
  Eigen::RowVectorXd x_mean_;
  double y_mean_ = 0.0;
  Eigen::MatrixXd V_;
  Eigen::VectorXd s_;
  Eigen::VectorXd z_;  // U^T yc
};

}  // namespace ridgecal
