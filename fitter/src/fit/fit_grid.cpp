#include "ridgecal/fit_grid.hpp"

#include <algorithm>
#include <cassert>
#include <cmath>
#include <limits>

#include "ridgecal/ridge_grid.hpp"
#include "ridgecal/ridge_path.hpp"

namespace ridgecal {

namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

// One factorisation per fold plus one for all training points, kept for the
// final fit and the held-out predictions of the chosen cell. Thread-local so
// that their buffers are reused from unit to unit (no allocation once warm).
std::vector<NestedRidge>& engines(std::size_t count) {
  thread_local std::vector<NestedRidge> e;
  if (e.size() < count) e.resize(count);
  return e;
}

Eigen::MatrixXd take_rows(const Eigen::MatrixXd& X, const std::vector<std::size_t>& idx, int cols) {
  Eigen::MatrixXd out(static_cast<Eigen::Index>(idx.size()), cols);
  for (std::size_t i = 0; i < idx.size(); ++i)
    out.row(static_cast<Eigen::Index>(i)) = X.row(static_cast<Eigen::Index>(idx[i])).head(cols);
  return out;
}

Eigen::VectorXd take(const std::vector<double>& v, const std::vector<std::size_t>& idx) {
  Eigen::VectorXd out(static_cast<Eigen::Index>(idx.size()));
  for (std::size_t i = 0; i < idx.size(); ++i) out(static_cast<Eigen::Index>(i)) = v[idx[i]];
  return out;
}

}  // namespace

// RMSE in reference units of the fitted-unit predictions vhat[i * stride]
// at `rows` (long double sums).
double FitGrid::rmse(const double* vhat, std::size_t stride,
                     const std::vector<std::size_t>& rows) const {
  long double ss = 0;
  for (std::size_t i = 0; i < rows.size(); ++i) {
    const double e = p_.output.output_inverse(vhat[i * stride]) - p_.y[rows[i]];
    ss += static_cast<long double>(e) * e;
  }
  return std::sqrt(static_cast<double>(ss / static_cast<long double>(rows.size())));
}

void FitGrid::store(int k, std::size_t c, std::size_t l, double value) {
  if (k >= 0)
    fold_rmse_[(static_cast<std::size_t>(k) * nc_ + c) * nl_ + l] = value;
  else
    train_rmse_[c * nl_ + l] = value;
}

FitGrid::FitGrid(const GridProblem& problem, bool cv) : p_(problem) {
  nc_ = p_.cols.size();
  nl_ = p_.lambdas.size();
  nk_ = cv ? p_.fold_train.size() : 0;
  assert(p_.designs.size() == (p_.nested ? 1u : nc_));
  fold_rmse_.assign(nk_ * nc_ * nl_, kNaN);
  train_rmse_.assign(nc_ * nl_, kNaN);
  for (std::size_t k = 0; k < nk_; ++k)
    score_problem(static_cast<int>(k), p_.fold_train[k], &p_.fold_val[k]);
  score_problem(-1, p_.train, nullptr);
}

void FitGrid::score_problem(int k, const std::vector<std::size_t>& tr,
                            const std::vector<std::size_t>* va) {
  const std::vector<std::size_t>& at = va ? *va : tr;  // the rows scored
  // Candidates without columns: the mean of the training targets (no CV score).
  std::vector<std::size_t> pos;  // candidates with columns, in order
  for (std::size_t c = 0; c < nc_; ++c) {
    if (p_.cols[c] > 0) {
      pos.push_back(c);
    } else if (k < 0) {
      const double mean = take(p_.v, tr).mean();
      buf_.assign(at.size(), mean);
      for (std::size_t l = 0; l < nl_; ++l) store(k, c, l, rmse(buf_.data(), 1, at));
    }
  }
  if (pos.empty()) return;

  // Nested path: the candidates the engine can solve (`fast` of them).
  std::size_t fast = 0;
  const bool identity = p_.output.identity();
  if (p_.nested) {
    NestedRidge& engine = engines(nk_ + 1)[k >= 0 ? static_cast<std::size_t>(k) : nk_];
    const Eigen::MatrixXd& X = p_.designs.front();
    engine.factor(X, p_.v.data(), tr, std::min(p_.cols[pos.back()], NestedRidge::kMaxColumns),
                  p_.centred);
    if (va || !identity) engine.set_validation(X, p_.v.data(), at);
    std::vector<int> cols;
    for (std::size_t c : pos) {
      if (p_.cols[c] > engine.usable()) break;
      cols.push_back(p_.cols[c]);
    }
    fast = cols.size();
    constexpr std::size_t kLanes = NestedRidge::kLanes;
    buf_.resize(identity ? fast * kLanes : fast * at.size() * kLanes);
    const int count = static_cast<int>(fast);
    for (std::size_t l0 = 0; fast > 0 && l0 < nl_; l0 += kLanes) {
      const std::size_t nl = std::min(kLanes, nl_ - l0);
      const double* lam = p_.lambdas.data() + l0;
      if (!identity) {
        engine.predict_lanes(lam, static_cast<int>(nl), cols.data(), count, buf_.data());
        for (std::size_t t = 0; t < fast; ++t)
          for (std::size_t q = 0; q < nl; ++q)
            store(k, pos[t], l0 + q, rmse(buf_.data() + t * at.size() * kLanes + q, kLanes, at));
        continue;
      }
      engine.score(lam, static_cast<int>(nl), cols.data(), count, va ? buf_.data() : nullptr,
                   va ? nullptr : buf_.data());
      for (std::size_t t = 0; t < fast; ++t)
        for (std::size_t q = 0; q < nl; ++q)
          store(k, pos[t], l0 + q, std::sqrt(buf_[t * kLanes + q]));
    }
  }

  // General path: one thin SVD per remaining candidate.
  Eigen::VectorXd pred;
  for (std::size_t t = fast; t < pos.size(); ++t) {
    const std::size_t c = pos[t];
    const Eigen::MatrixXd& X = design(c);
    const RidgePath path(take_rows(X, tr, p_.cols[c]), take(p_.v, tr), p_.centred);
    const Eigen::MatrixXd W = path.project(take_rows(X, at, p_.cols[c]));
    for (std::size_t l = 0; l < nl_; ++l) {
      path.predict(W, p_.lambdas[l], pred);
      store(k, c, l, rmse(pred.data(), 1, at));
    }
  }
}

Status FitGrid::solve(std::size_t c, double lambda, Eigen::VectorXd& b, double& b0, double& cond) {
  const int d = p_.cols[c];
  assert(d > 0);
  if (p_.nested) {
    NestedRidge& full = engines(nk_ + 1)[nk_];  // factorised while scoring
    if (full.columns() >= d && full.usable() >= d) {
      // The same orthogonal-transformation solve, no second factorisation.
      b.resize(d);
      full.coefficients(d, lambda, b.data(), b0);
      cond = full.condition_number(d);
      return Status{};
    }
  }
  const RidgePath path(take_rows(design(c), p_.train, d), take(p_.v, p_.train), p_.centred);
  if (!path.status().ok && lambda == 0.0)
    return Status::failure(path.status().message +
                           "; add setpoints, lower the degree or use lambda > 0");
  path.coefficients(lambda, b, b0);
  cond = path.condition_number();
  return Status{};
}

void FitGrid::held_out(std::size_t c, double lambda, std::vector<double>& out) {
  const int d = p_.cols[c];
  assert(d > 0);
  Eigen::VectorXd pred;
  for (std::size_t k = 0; k < nk_; ++k) {
    const auto& tr = p_.fold_train[k];
    const auto& va = p_.fold_val[k];
    NestedRidge* engine = p_.nested ? &engines(nk_ + 1)[k] : nullptr;  // factorised while scoring
    if (engine && engine->columns() >= d && engine->usable() >= d) {
      pred.resize(static_cast<Eigen::Index>(va.size()));
      engine->predict_validation(d, lambda, pred.data());
    } else {
      const RidgePath path(take_rows(design(c), tr, d), take(p_.v, tr), p_.centred);
      path.predict(path.project(take_rows(design(c), va, d)), lambda, pred);
    }
    for (std::size_t i = 0; i < va.size(); ++i) out[va[i]] = pred(static_cast<Eigen::Index>(i));
  }
}

}  // namespace ridgecal
