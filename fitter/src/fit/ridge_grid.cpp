#include "ridgecal/ridge_grid.hpp"

#include <algorithm>
#include <cassert>
#include <cmath>
#include <limits>

namespace ridgecal {

void NestedRidge::factor(const Eigen::MatrixXd& X, const double* y,
                         const std::vector<std::size_t>& rows, int cols, bool intercept) {
  assert(cols >= 1 && cols <= kMaxColumns && !rows.empty() && X.cols() >= cols);
  D_ = cols;
  m_ = static_cast<int>(rows.size());
  intercept_ = intercept;
  const std::size_t m = rows.size();
  A_.resize(m * static_cast<std::size_t>(D_));
  yw_.resize(m);

  // Gather (and centre) the training rows, column-major.
  double ysum = 0.0;
  for (std::size_t i = 0; i < m; ++i) ysum += y[rows[i]];
  y_mean_ = intercept ? ysum / static_cast<double>(m) : 0.0;
  for (std::size_t i = 0; i < m; ++i) yw_[i] = y[rows[i]] - y_mean_;
  for (int k = 0; k < D_; ++k) {
    double* col = A_.data() + static_cast<std::size_t>(k) * m;
    const double* src = X.data() + static_cast<std::size_t>(k) * static_cast<std::size_t>(X.rows());
    double s = 0.0;
    for (std::size_t i = 0; i < m; ++i) {
      col[i] = src[rows[i]];
      s += col[i];
    }
    const double mean = intercept ? s / static_cast<double>(m) : 0.0;
    x_mean_[static_cast<std::size_t>(k)] = mean;
    for (std::size_t i = 0; i < m; ++i) col[i] -= mean;
  }

  // Householder QR, unblocked (D is small). Reflector j: H = I - tau v v^T with
  // v_j = 1 and v_i (i > j) stored below the diagonal of column j.
  double maxdiag = 0.0;
  bool finite = true;
  for (int j = 0; j < D_; ++j) {
    double* cj = A_.data() + static_cast<std::size_t>(j) * m;
    const std::size_t jj = static_cast<std::size_t>(j);
    double scale = 0.0;
    for (std::size_t i = jj; i < m; ++i) scale = std::max(scale, std::fabs(cj[i]));
    double beta = 0.0, tau = 0.0;
    if (jj + 1 < m && scale > 0.0) {
      const double inv = 1.0 / scale;
      double sigma = 0.0;
      for (std::size_t i = jj + 1; i < m; ++i) sigma += (cj[i] * inv) * (cj[i] * inv);
      const double alpha = cj[jj];
      if (sigma == 0.0) {
        beta = alpha;  // already zero below the diagonal: H = I
      } else {
        const double norm = scale * std::sqrt((alpha * inv) * (alpha * inv) + sigma);
        beta = alpha >= 0.0 ? -norm : norm;
        tau = (beta - alpha) / beta;
        const double f = 1.0 / (alpha - beta);
        for (std::size_t i = jj + 1; i < m; ++i) cj[i] *= f;
      }
    } else {
      beta = jj < m ? cj[jj] : 0.0;
    }
    cj[jj] = beta;
    if (tau != 0.0) {
      for (int k = j + 1; k < D_; ++k) {
        double* ck = A_.data() + static_cast<std::size_t>(k) * m;
        double w = ck[jj];
        for (std::size_t i = jj + 1; i < m; ++i) w += cj[i] * ck[i];
        w *= tau;
        ck[jj] -= w;
        for (std::size_t i = jj + 1; i < m; ++i) ck[i] -= w * cj[i];
      }
      double w = yw_[jj];
      for (std::size_t i = jj + 1; i < m; ++i) w += cj[i] * yw_[i];
      w *= tau;
      yw_[jj] -= w;
      for (std::size_t i = jj + 1; i < m; ++i) yw_[i] -= w * cj[i];
    }
    if (!std::isfinite(beta)) finite = false;
    maxdiag = std::max(maxdiag, std::fabs(beta));
  }

  // R (row-major), z = (Q^T yc)[0..D), and the residual outside the span.
  R_.fill(0.0);
  const std::size_t rows_in_r = std::min<std::size_t>(m, static_cast<std::size_t>(D_));
  for (std::size_t j = 0; j < rows_in_r; ++j)
    for (int k = static_cast<int>(j); k < D_; ++k)
      R_[j * kMaxColumns + static_cast<std::size_t>(k)] = A_[static_cast<std::size_t>(k) * m + j];
  for (int j = 0; j < D_; ++j)
    z_[static_cast<std::size_t>(j)] =
        static_cast<std::size_t>(j) < m ? yw_[static_cast<std::size_t>(j)] : 0.0;
  rperp2_ = 0.0;
  for (std::size_t i = static_cast<std::size_t>(D_); i < m; ++i) rperp2_ += yw_[i] * yw_[i];

  // Usable leading degrees: a diagonal entry too small for an unpivoted
  // solve (or a design whose squares would overflow) goes to RidgePath.
  // The test is on the leading block only, so degree d is usable or not
  // whatever the number of columns factorised.
  usable_ = 0;
  if (finite && maxdiag < 1e100 && std::isfinite(rperp2_)) {
    double lead = 0.0;
    while (usable_ < static_cast<int>(rows_in_r)) {
      const double djj = std::fabs(R_[static_cast<std::size_t>(usable_) * (kMaxColumns + 1)]);
      lead = std::max(lead, djj);
      if (!(djj > kRankTolerance * lead)) break;
      ++usable_;
    }
  }
  nv_ = 0;
  factor_penalty_ = false;
}

void NestedRidge::set_penalty_factor(const double* F) {
  factor_penalty_ = F != nullptr;
  if (!F) return;
  P_.fill(0.0);
  for (int j = 0; j < D_; ++j)
    for (int k = j; k < D_; ++k)
      P_[static_cast<std::size_t>(j) * kMaxColumns + static_cast<std::size_t>(k)] =
          F[static_cast<std::size_t>(j) * static_cast<std::size_t>(D_) +
            static_cast<std::size_t>(k)];
}

void NestedRidge::set_validation(const Eigen::MatrixXd& X, const double* y,
                                 const std::vector<std::size_t>& rows) {
  nv_ = static_cast<int>(rows.size());
  W_.resize(rows.size() * static_cast<std::size_t>(D_));
  yv_.resize(rows.size());
  const std::size_t ld = static_cast<std::size_t>(X.rows());
  for (std::size_t i = 0; i < rows.size(); ++i) {
    yv_[i] = y[rows[i]];
    for (int k = 0; k < D_; ++k)
      W_[i * static_cast<std::size_t>(D_) + static_cast<std::size_t>(k)] =
          X.data()[static_cast<std::size_t>(k) * ld + rows[i]] -
          x_mean_[static_cast<std::size_t>(k)];
  }
}

// Lanes: GCC/Clang vector extension types; + - * / act per lane with the
// same IEEE operations a scalar loop would do (no FMA contraction at the
// default target), and sqrt is taken lane by lane.
namespace {
constexpr int L = NestedRidge::kLanes;
constexpr std::size_t S = NestedRidge::kMaxColumns;
inline std::size_t at(int j, int k) {
  return static_cast<std::size_t>(j) * S + static_cast<std::size_t>(k);
}
}  // namespace

// The lane kernels are compiled twice, for AVX2 and for the baseline x86-64
// target, and the loader picks one (GCC function multi-versioning). AVX2 does
// not include FMA, so both clones do the same IEEE operations: identical
// results on every machine.
#if defined(__GNUC__) && defined(__x86_64__) && !defined(__clang__)
#define RIDGECAL_LANE_CLONES __attribute__((target_clones("avx2", "default")))
#else
#define RIDGECAL_LANE_CLONES
#endif

RIDGECAL_LANE_CLONES void NestedRidge::rotate_in_penalty(const double* mu) {
  const int D = usable_;
  for (int j = 0; j < D; ++j) {
    for (int k = j; k < D; ++k) {
      const double r = R_[at(j, k)];
      Rt_[at(j, k)] = Lanes{} + r;
    }
    zt_[static_cast<std::size_t>(j)] = Lanes{} + z_[static_cast<std::size_t>(j)];
  }
  bool any = false;
  for (int q = 0; q < L; ++q) any = any || mu[q] > 0.0;
  if (!any) return;
  // Penalty row i (mu at column i) is rotated into rows i..D-1 of Rt. With
  // mu = 0 in a lane the rotations are exact sign changes (c = +-1, s = 0).
  Lanes a[S];
  Lanes mu_v;
  for (int q = 0; q < L; ++q) mu_v[q] = mu[q];
  for (int i = 0; i < D; ++i) {
    if (factor_penalty_) {
      // Penalty row i is mu * F[i, i..D); an all-zero row (the null space,
      // e.g. the linear term of the curvature penalty) adds nothing.
      bool nonzero = false;
      for (int k = i; k < D; ++k) {
        const double f = P_[at(i, k)];
        a[k] = mu_v * f;
        nonzero = nonzero || f != 0.0;
      }
      if (!nonzero) continue;
    } else {
      for (int k = i; k < D; ++k) a[k] = Lanes{};
      a[i] = mu_v;
    }
    Lanes rho = Lanes{};
    for (int j = i; j < D; ++j) {
      Lanes* rj = Rt_ + at(j, 0);
      const Lanes r = rj[j], aj = a[j];
      Lanes g2 = r * r + aj * aj, g;
      for (int q = 0; q < L; ++q) g[q] = std::sqrt(g2[q]);
      const Lanes c = r / g, s = aj / g;
      rj[j] = g;
      for (int k = j + 1; k < D; ++k) {
        const Lanes t = rj[k], u = a[k];
        rj[k] = c * t + s * u;
        a[k] = c * u - s * t;
      }
      const Lanes t = zt_[static_cast<std::size_t>(j)];
      zt_[static_cast<std::size_t>(j)] = c * t + s * rho;
      rho = c * rho - s * t;
    }
  }
}

RIDGECAL_LANE_CLONES void NestedRidge::solve(int d) {
  for (int j = d - 1; j >= 0; --j) {
    const Lanes* rj = Rt_ + at(j, 0);
    Lanes acc = zt_[static_cast<std::size_t>(j)];
    for (int k = j + 1; k < d; ++k) acc -= rj[k] * b_[static_cast<std::size_t>(k)];
    b_[static_cast<std::size_t>(j)] = acc / rj[j];
  }
}

void NestedRidge::score(const double* lambdas, int nl, const int* degrees, int count,
                        double* val_mse, double* train_mse) {
  sweep(lambdas, nl, degrees, count, val_mse, train_mse, nullptr);
}

void NestedRidge::predict_lanes(const double* lambdas, int nl, const int* degrees, int count,
                                double* pred) {
  sweep(lambdas, nl, degrees, count, nullptr, nullptr, pred);
}

RIDGECAL_LANE_CLONES void NestedRidge::sweep(const double* lambdas, int nl, const int* degrees,
                                             int count, double* val_mse, double* train_mse,
                                             double* pred) {
  assert(nl >= 1 && nl <= L);
  double mu[L];
  for (int q = 0; q < L; ++q) mu[q] = std::sqrt(static_cast<double>(m_) * lambdas[q < nl ? q : 0]);
  rotate_in_penalty(mu);
  const std::size_t D = static_cast<std::size_t>(D_);
  for (int t = 0; t < count; ++t) {
    const int d = degrees[t];
    assert(d >= 1 && d <= usable_);
    solve(d);
    if (val_mse || pred) {
      // The predictions at the validation rows: stored (pred) or scored (val_mse).
      Lanes sse = Lanes{};
      for (int i = 0; i < nv_; ++i) {
        const double* w = W_.data() + static_cast<std::size_t>(i) * D;
        Lanes p = Lanes{} + y_mean_;
        for (int k = 0; k < d; ++k) p += w[k] * b_[static_cast<std::size_t>(k)];
        if (pred) {
          double* out = pred + (static_cast<std::size_t>(t) * static_cast<std::size_t>(nv_) +
                                static_cast<std::size_t>(i)) *
                                   L;
          for (int q = 0; q < L; ++q) out[q] = p[q];
        }
        if (val_mse) {
          const Lanes e = p - yv_[static_cast<std::size_t>(i)];
          sse += e * e;
        }
      }
      if (val_mse)
        for (int q = 0; q < L; ++q) val_mse[t * L + q] = nv_ > 0 ? sse[q] / nv_ : 0.0;
    }
    if (train_mse) {
      // ||yc - Xc_d b||^2 = ||z_d - R_d b||^2 + sum_{j >= d} z_j^2 + rperp2.
      double tail = rperp2_;
      for (int j = d; j < D_; ++j)
        tail += z_[static_cast<std::size_t>(j)] * z_[static_cast<std::size_t>(j)];
      Lanes sse = Lanes{} + tail;
      for (int j = 0; j < d; ++j) {
        const double* rj = R_.data() + at(j, 0);
        Lanes r = Lanes{} + z_[static_cast<std::size_t>(j)];
        for (int k = j; k < d; ++k) r -= rj[k] * b_[static_cast<std::size_t>(k)];
        sse += r * r;
      }
      for (int q = 0; q < L; ++q) train_mse[t * L + q] = sse[q] / m_;
    }
  }
}

void NestedRidge::predict_validation(int d, double lambda, double* out) {
  assert(d >= 1 && d <= usable_);
  double mu[L];
  for (int q = 0; q < L; ++q) mu[q] = std::sqrt(static_cast<double>(m_) * lambda);
  rotate_in_penalty(mu);
  solve(d);
  const std::size_t D = static_cast<std::size_t>(D_);
  for (int i = 0; i < nv_; ++i) {
    const double* w = W_.data() + static_cast<std::size_t>(i) * D;
    double p = y_mean_;
    for (int k = 0; k < d; ++k) p += w[k] * b_[static_cast<std::size_t>(k)][0];
    out[i] = p;
  }
}

void NestedRidge::coefficients(int d, double lambda, double* b, double& b0) {
  assert(d >= 1 && d <= usable_);
  double mu[L];
  for (int q = 0; q < L; ++q) mu[q] = std::sqrt(static_cast<double>(m_) * lambda);
  rotate_in_penalty(mu);
  solve(d);
  double dot = 0.0;
  for (int k = 0; k < d; ++k) {
    b[k] = b_[static_cast<std::size_t>(k)][0];
    dot += x_mean_[static_cast<std::size_t>(k)] * b[k];
  }
  b0 = intercept_ ? y_mean_ - dot : 0.0;
}

double NestedRidge::condition_number(int d) const {
  assert(d >= 1 && d <= usable_);
  Eigen::MatrixXd Rd(d, d);
  for (int j = 0; j < d; ++j)
    for (int k = 0; k < d; ++k) Rd(j, k) = R_[at(j, k)];
  const Eigen::VectorXd s = Eigen::JacobiSVD<Eigen::MatrixXd>(Rd).singularValues();
  return s(d - 1) > 0.0 ? s(0) / s(d - 1) : std::numeric_limits<double>::infinity();
}

}  // namespace ridgecal
