#include "ridgecal/ridge_path.hpp"

#include <fmt/format.h>

#include <cassert>
#include <cmath>
#include <limits>

namespace ridgecal {

RidgePath::RidgePath(const Eigen::Ref<const Eigen::MatrixXd>& X,
                     const Eigen::Ref<const Eigen::VectorXd>& y, bool intercept)
    : intercept_(intercept), n_(static_cast<int>(X.rows())) {
  assert(X.rows() == y.size() && X.cols() >= 1);
  const Eigen::Index p = X.cols();
  Eigen::MatrixXd Xc;
  Eigen::VectorXd yc;
  if (intercept) {
    x_mean_ = X.colwise().mean();
    y_mean_ = y.mean();
    Xc = X.rowwise() - x_mean_;
    yc = y.array() - y_mean_;
  } else {
    x_mean_ = Eigen::RowVectorXd::Zero(p);
    Xc = X;
    yc = y;
  }
  Eigen::JacobiSVD<Eigen::MatrixXd> svd(Xc, Eigen::ComputeThinU | Eigen::ComputeThinV);
  V_ = svd.matrixV();
  s_ = svd.singularValues();
  z_ = svd.matrixU().transpose() * yc;
  const double smax = s_.size() > 0 ? s_(0) : 0.0;
  const double tol = smax * std::numeric_limits<double>::epsilon() *
                     static_cast<double>(std::max<Eigen::Index>(X.rows(), p));
  rank_ = 0;
  for (Eigen::Index j = 0; j < s_.size(); ++j)
    if (s_(j) > tol) ++rank_;
  if (rank_ < p)
    status_ = Status::failure(
        fmt::format("the design is rank deficient (rank {} of {} columns)", rank_, p));
}

double RidgePath::condition_number() const {
  if (rank_ < s_.size() || s_.size() == 0) return std::numeric_limits<double>::infinity();
  return s_(0) / s_(s_.size() - 1);
}

void RidgePath::filter(double lambda, Eigen::VectorXd& fz) const {
  assert(lambda >= 0.0);
  fz.resize(s_.size());
  const double nl = static_cast<double>(n_) * lambda;
  for (Eigen::Index j = 0; j < s_.size(); ++j) {
    const double s = s_(j);
    if (j >= rank_)
      fz(j) = lambda > 0.0 ? s / (s * s + nl) * z_(j) : 0.0;
    else
      fz(j) = s / (s * s + nl) * z_(j);
  }
}

void RidgePath::coefficients(double lambda, Eigen::VectorXd& b, double& b0) const {
  Eigen::VectorXd fz;
  filter(lambda, fz);
  b = V_ * fz;
  b0 = intercept_ ? y_mean_ - x_mean_.dot(b) : 0.0;
}

Eigen::MatrixXd RidgePath::project(const Eigen::Ref<const Eigen::MatrixXd>& Xnew) const {
  return (Xnew.rowwise() - x_mean_) * V_;
}

void RidgePath::predict(const Eigen::MatrixXd& W, double lambda, Eigen::VectorXd& out) const {
  Eigen::VectorXd fz;
  filter(lambda, fz);
  out = (W * fz).array() + (intercept_ ? y_mean_ : 0.0);
}

}  // namespace ridgecal
