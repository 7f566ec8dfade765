#include "ridgecal/calibration.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cassert>
#include <cmath>
#include <limits>
#include <memory>
#include <stdexcept>

#include "ridgecal/multi_input_fit.hpp"
#include "ridgecal/ridge_grid.hpp"
#include "ridgecal/ridge_path.hpp"

namespace ridgecal {

std::string to_string(SelectionRule r) {
  return r == SelectionRule::MinCv ? "min-cv" : "one-se";
}
SelectionRule selection_rule_from_string(const std::string& s) {
  if (s == "min-cv") return SelectionRule::MinCv;
  if (s == "one-se") return SelectionRule::OneSe;
  throw std::invalid_argument("selection rule must be 'min-cv' or 'one-se', got '" + s + "'");
}

std::string to_string(SelectionMode m) {
  return m == SelectionMode::CrossValidation ? "cv" : "fixed";
}
SelectionMode selection_mode_from_string(const std::string& s) {
  if (s == "cv") return SelectionMode::CrossValidation;
  if (s == "fixed") return SelectionMode::Fixed;
  throw std::invalid_argument("selection mode must be 'cv' or 'fixed', got '" + s + "'");
}

int choose_cell(const std::vector<GridCell>& grid, SelectionRule rule) {
  int best = -1;
  for (std::size_t i = 0; i < grid.size(); ++i)
    if (!std::isnan(grid[i].cv_rmse) &&
        (best < 0 || grid[i].cv_rmse < grid[static_cast<std::size_t>(best)].cv_rmse))
      best = static_cast<int>(i);
  if (best < 0 || rule != SelectionRule::OneSe) return best;
  const double limit =
      grid[static_cast<std::size_t>(best)].cv_rmse + grid[static_cast<std::size_t>(best)].cv_se;
  int pick = best;
  for (std::size_t i = 0; i < grid.size(); ++i) {
    const GridCell& c = grid[i];
    if (!(c.cv_rmse <= limit)) continue;
    const GridCell& p = grid[static_cast<std::size_t>(pick)];
    if (c.terms < p.terms || (c.terms == p.terms && c.lambda > p.lambda))
      pick = static_cast<int>(i);
  }
  return pick;
}

std::vector<double> default_lambda_grid() {
  std::vector<double> g{0.0};
  const int count = 30;
  for (int i = 0; i < count; ++i) g.push_back(std::pow(10.0, -12.0 + 13.0 * i / (count - 1)));
  return g;
}

namespace {
constexpr int kMaxDegree = 20;
// The largest penalty accepted. Lambda is dimensionless (O(1) Chebyshev
// columns, a mean-square data term): above about 1e3 every coefficient but the
// intercept is already shrunk to nothing, and far larger values overflow n *
// lambda. 1e6 leaves three decades of margin.
constexpr double kMaxLambda = 1e6;
}  // namespace

std::string FitOptions::validate() const {
  if (fixed_degree.has_value() != fixed_lambda.has_value())
    return "fixed_degree and fixed_lambda go together; give both or neither";
  if (fixed_degree) {
    if (*fixed_degree < (intercept ? 0 : 1) || *fixed_degree > kMaxDegree)
      return fmt::format("fixed_degree is {}; it must be between {} and {}", *fixed_degree,
                         intercept ? 0 : 1, kMaxDegree);
    if (!(*fixed_lambda >= 0.0 && *fixed_lambda <= kMaxLambda))
      return fmt::format(
          "fixed_lambda is {}; it must be between 0 and {:g} (a penalty above about 1e3 already "
          "shrinks the curve to a constant)",
          *fixed_lambda, kMaxLambda);
  } else {
    if (degrees.empty()) return "degrees is empty; give at least one candidate degree";
    for (int d : degrees)
      if (d < 1 || d > kMaxDegree)
        return fmt::format("degrees contains {}; every candidate degree must be between 1 and {}",
                           d, kMaxDegree);
    if (lambdas.empty()) return "lambdas is empty; give at least one candidate penalty";
    for (double l : lambdas)
      if (!(l >= 0.0 && l <= kMaxLambda))
        return fmt::format(
            "lambdas contains {}; every penalty must be between 0 and {:g} (a penalty above about "
            "1e3 already shrinks the curve to a constant)",
            l, kMaxLambda);
  }
  return split.validate();
}

namespace {

// Design columns 1..D for every row: T_k(t), or T_k(t) - T_k(t0) through the origin.
Eigen::MatrixXd design(const std::vector<double>& readings, const Scaling& sc, int D,
                       bool intercept) {
  Eigen::MatrixXd X(static_cast<Eigen::Index>(readings.size()), D);
  std::vector<double> row(static_cast<std::size_t>(D) + 1), row0(static_cast<std::size_t>(D) + 1);
  chebyshev_row(sc.to_t(0.0), D, row0.data());
  for (std::size_t i = 0; i < readings.size(); ++i) {
    chebyshev_row(sc.to_t(readings[i]), D, row.data());
    for (int k = 1; k <= D; ++k)
      X(static_cast<Eigen::Index>(i), k - 1) = intercept ? row[k] : row[k] - row0[k];
  }
  return X;
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

std::vector<double> cheb_from_fit(const Eigen::VectorXd& b, double b0, const Scaling& sc,
                                  bool intercept) {
  const int D = static_cast<int>(b.size());
  std::vector<double> c(static_cast<std::size_t>(D) + 1);
  c[0] = b0;
  for (int k = 1; k <= D; ++k) c[static_cast<std::size_t>(k)] = b(k - 1);
  if (!intercept) {
    std::vector<double> row0(static_cast<std::size_t>(D) + 1);
    chebyshev_row(sc.to_t(0.0), D, row0.data());
    long double s = 0;
    for (int k = 1; k <= D; ++k)
      s += static_cast<long double>(b(k - 1)) * row0[static_cast<std::size_t>(k)];
    c[0] = static_cast<double>(-s);
  }
  return c;
}

}  // namespace

FitOutcome fit_calibration(const Dataset& data, const FitOptions& options) {
  assert(options.validate().empty());
  FitOutcome out;
  Calibration& cal = out.calibration;
  cal.intercept = options.intercept;
  cal.split_options = options.split;
  const std::size_t n = data.rows.size();

  std::vector<double> x(n), y(n);
  for (std::size_t i = 0; i < n; ++i) {
    x[i] = data.rows[i].reading;
    y[i] = data.rows[i].reference;
    for (const double v : {x[i], y[i]})
      if (!std::isfinite(v) ||
          (v != 0.0 && (std::fabs(v) > kMaxMagnitude || std::fabs(v) < kMinMagnitude))) {
        out.status =
            Status::failure(fmt::format("line {}: the value {} is not finite or its magnitude is "
                                        "outside the supported range [{:g}, {:g}]",
                                        data.rows[i].line, v, kMinMagnitude, kMaxMagnitude));
        return out;
      }
  }
  // Work on references scaled by an exact power of two when their magnitude is
  // extreme, so that squared errors neither overflow nor underflow (1e300 and
  // 1e-300 fit like 1). Ridge regression is linear in the references, so the
  // choice and the coefficients are the same; they are scaled back below.
  int y_exp = 0;
  {
    double ymax = 0.0;
    for (double v : y) ymax = std::max(ymax, std::fabs(v));
    if (ymax > 0.0 && (ymax < 0x1p-64 || ymax > 0x1p64)) {
      std::frexp(ymax, &y_exp);
      for (double& v : y) v = std::ldexp(v, -y_exp);
    }
  }
  const auto [xmin_it, xmax_it] = std::minmax_element(x.begin(), x.end());
  if (n == 0 || *xmin_it == *xmax_it) {
    out.status = Status::failure(
        fmt::format("all {} readings are equal ({}); a calibration needs readings that vary", n,
                    n ? *xmin_it : 0.0));
    return out;
  }

  const std::vector<SetpointGroup> groups = group_by_setpoint(data);
  const bool fixed = options.fixed_degree.has_value();
  std::vector<int> degrees = fixed ? std::vector<int>{*options.fixed_degree} : options.degrees;
  std::sort(degrees.begin(), degrees.end());
  degrees.erase(std::unique(degrees.begin(), degrees.end()), degrees.end());
  std::vector<double> lambdas =
      fixed ? std::vector<double>{*options.fixed_lambda} : options.lambdas;
  std::sort(lambdas.begin(), lambdas.end());
  lambdas.erase(std::unique(lambdas.begin(), lambdas.end()), lambdas.end());

  const int extra = options.intercept ? 1 : 0;  // groups needed = degree + intercept
  const std::size_t min_needed = static_cast<std::size_t>(std::max(1, degrees.front() + extra));
  if (groups.size() < std::max<std::size_t>(min_needed, 2)) {
    out.status = Status::failure(fmt::format(
        "only {} distinct setpoint(s); the smallest candidate model (degree {}) needs at least {}",
        groups.size(), degrees.front(), std::max<std::size_t>(min_needed, 2)));
    return out;
  }

  const Split split = make_split(groups, options.split, std::max<std::size_t>(min_needed, 2));
  cal.user_named_test = split.user_named_test;

  // Row sets.
  std::vector<int> row_fold(n, -1);
  std::vector<SetRole> row_role(n, SetRole::Train);
  std::vector<std::size_t> train_rows, test_rows;
  std::size_t n_train_groups = 0;
  for (std::size_t g = 0; g < groups.size(); ++g) {
    if (split.role[g] == SetRole::Train) ++n_train_groups;
    for (std::size_t r : groups[g].rows) {
      row_role[r] = split.role[g];
      row_fold[r] = split.fold[g];
    }
    cal.setpoints.push_back(SetpointResult{groups[g].id, groups[g].mean_reading,
                                           groups[g].mean_reference, groups[g].rows.size(),
                                           split.role[g], split.fold[g]});
  }
  for (std::size_t r = 0; r < n; ++r)
    (row_role[r] == SetRole::Train ? train_rows : test_rows).push_back(r);

  Scaling sc;
  sc.x_min = std::numeric_limits<double>::infinity();
  sc.x_max = -sc.x_min;
  for (std::size_t r : train_rows) {
    sc.x_min = std::min(sc.x_min, x[r]);
    sc.x_max = std::max(sc.x_max, x[r]);
  }
  if (!(sc.x_max > sc.x_min)) {
    out.status =
        Status::failure("all training readings are equal; a calibration needs readings that vary");
    return out;
  }
  cal.model.scaling = sc;

  // Fold row sets; a degree is scored only if every fold's training part has enough setpoints.
  const int K = split.n_folds;
  std::vector<std::vector<std::size_t>> fold_train(static_cast<std::size_t>(K)),
      fold_val(static_cast<std::size_t>(K));
  std::vector<std::size_t> fold_groups(static_cast<std::size_t>(K), 0);
  for (std::size_t g = 0; g < groups.size(); ++g)
    if (split.fold[g] >= 0) ++fold_groups[static_cast<std::size_t>(split.fold[g])];
  for (auto& v : fold_train) v.reserve(train_rows.size());
  for (auto& v : fold_val) v.reserve(train_rows.size());
  for (std::size_t r : train_rows)
    for (int k = 0; k < K; ++k)
      (row_fold[r] == k ? fold_val : fold_train)[static_cast<std::size_t>(k)].push_back(r);
  std::size_t min_fold_train_groups = n_train_groups;
  for (int k = 0; k < K; ++k)
    min_fold_train_groups =
        std::min(min_fold_train_groups, n_train_groups - fold_groups[static_cast<std::size_t>(k)]);

  SelectionInfo& sel = cal.selection;
  sel.mode = fixed ? SelectionMode::Fixed : SelectionMode::CrossValidation;
  sel.rule = options.rule;
  sel.scheme = split.scheme;
  sel.n_folds = K;
  sel.lambdas = lambdas;
  for (int d : degrees) {
    const std::size_t need = static_cast<std::size_t>(d + extra);
    if (n_train_groups < std::max<std::size_t>(need, 1)) {
      sel.notes.push_back(
          fmt::format("degree {} dropped: it needs {} training setpoints, there are {}", d, need,
                      n_train_groups));
      continue;
    }
    if (!fixed && K > 0 && min_fold_train_groups < need) {
      sel.notes.push_back(fmt::format(
          "degree {} dropped: a cross-validation fold would train on {} setpoints, it needs {}", d,
          min_fold_train_groups, need));
      continue;
    }
    sel.degrees.push_back(d);
  }
  if (sel.degrees.empty()) {
    out.status = Status::failure(fmt::format(
        "fewer distinct training setpoints ({}) than the smallest candidate model needs",
        n_train_groups));
    return out;
  }
  const bool can_cv = K >= 2;
  if (!fixed && !can_cv && sel.degrees.size() * lambdas.size() > 1) {
    out.status = Status::failure(
        fmt::format("only {} training setpoints: too few to cross-validate (at least 3 are needed, "
                    "the end setpoints "
                    "always stay in training); give a fixed model with --degree and --lambda",
                    n_train_groups));
    return out;
  }

  const int Dmax = std::max(1, sel.degrees.back());
  if (!options.intercept) {
    // Through the origin the design holds T_k(t(0)); refuse when reading 0 is
    // so far outside the calibrated range that these overflow.
    std::vector<double> row0(static_cast<std::size_t>(Dmax) + 1);
    chebyshev_row(sc.to_t(0.0), Dmax, row0.data());
    for (double v : row0)
      if (!std::isfinite(v) || std::fabs(v) > 1e150) {
        out.status =
            Status::failure(fmt::format("reading 0 lies too far outside the calibrated range {:g} "
                                        ".. {:g} for a fit through the origin",
                                        sc.x_min, sc.x_max));
        return out;
      }
  }
  const Eigen::MatrixXd X = design(x, sc, Dmax, options.intercept);
  const Eigen::VectorXd y_train = take(y, train_rows);

  // Score the grid. One NestedRidge factorisation per fold (and one for all
  // training points) serves every degree and lambda (see ridge_grid.hpp);
  // degrees it cannot solve safely (near rank deficiency) use RidgePath.
  const std::size_t L = lambdas.size();
  const std::size_t ND = sel.degrees.size();
  std::vector<int> pos_degrees;  // the scored degrees > 0, ascending
  for (int d : sel.degrees)
    if (d > 0) pos_degrees.push_back(d);
  const std::size_t first_pos =
      ND - pos_degrees.size();  // index of the first positive degree in sel.degrees
  const std::size_t KK = static_cast<std::size_t>(std::max(K, 0));
  // fold_mse[(k * ND + di) * L + l], train_mse[di * L + l]
  std::vector<double> fold_mse(can_cv ? KK * ND * L : 0), train_mse(ND * L);
  // One factorisation per fold plus one for all training points, kept for
  // the held-out predictions of the chosen cell. Thread-local so that their
  // buffers are reused from unit to unit (no allocation once warm).
  thread_local std::vector<NestedRidge> engines;
  if (engines.size() < KK + 1) engines.resize(KK + 1);
  std::vector<double> val_buf(pos_degrees.size() * NestedRidge::kLanes), train_buf(val_buf.size());
  Eigen::VectorXd pred;
  // Scores one problem (fold k, or k = -1: all training points) into the tables.
  auto score_problem = [&](int k, const std::vector<std::size_t>& tr,
                           const std::vector<std::size_t>* va) {
    if (pos_degrees.empty()) return;
    NestedRidge& engine = engines[k >= 0 ? static_cast<std::size_t>(k) : KK];
    engine.factor(X, y.data(), tr, pos_degrees.back(), options.intercept);
    if (va) engine.set_validation(X, y.data(), *va);
    const int fast =
        static_cast<int>(std::upper_bound(pos_degrees.begin(), pos_degrees.end(), engine.usable()) -
                         pos_degrees.begin());
    constexpr std::size_t kLanes = NestedRidge::kLanes;
    for (std::size_t l0 = 0; l0 < L; l0 += kLanes) {
      const std::size_t nl = std::min(kLanes, L - l0);
      engine.score(lambdas.data() + l0, static_cast<int>(nl), pos_degrees.data(), fast,
                   va ? val_buf.data() : nullptr, va ? nullptr : train_buf.data());
      for (int t = 0; t < fast; ++t) {
        const std::size_t di = first_pos + static_cast<std::size_t>(t);
        for (std::size_t q = 0; q < nl; ++q) {
          const std::size_t src = static_cast<std::size_t>(t) * kLanes + q;
          if (va)
            fold_mse[(static_cast<std::size_t>(k) * ND + di) * L + l0 + q] = val_buf[src];
          else
            train_mse[di * L + l0 + q] = train_buf[src];
        }
      }
    }
    for (std::size_t t = static_cast<std::size_t>(fast); t < pos_degrees.size(); ++t) {
      const int d = pos_degrees[t];
      const std::size_t di = first_pos + t;
      const RidgePath path(take_rows(X, tr, d), take(y, tr), options.intercept);
      const Eigen::MatrixXd W = path.project(take_rows(X, va ? *va : tr, d));
      const Eigen::VectorXd ref = take(y, va ? *va : tr);
      for (std::size_t l = 0; l < L; ++l) {
        path.predict(W, lambdas[l], pred);
        const double mse = (pred - ref).squaredNorm() / static_cast<double>(ref.size());
        if (va)
          fold_mse[(static_cast<std::size_t>(k) * ND + di) * L + l] = mse;
        else
          train_mse[di * L + l] = mse;
      }
    }
  };
  if (can_cv)
    for (int k = 0; k < K; ++k)
      score_problem(k, fold_train[static_cast<std::size_t>(k)],
                    &fold_val[static_cast<std::size_t>(k)]);
  score_problem(-1, train_rows, nullptr);

  sel.grid.reserve(ND * L);
  for (std::size_t di = 0; di < ND; ++di) {
    const int d = sel.degrees[di];
    for (std::size_t l = 0; l < L; ++l) {
      GridCell c;
      c.degree = d;
      c.lambda = lambdas[l];
      c.terms = d + extra;
      if (can_cv && d > 0) {
        double m = 0;
        for (std::size_t k = 0; k < KK; ++k) m += std::sqrt(fold_mse[(k * ND + di) * L + l]);
        m /= static_cast<double>(KK);
        double ss = 0;
        for (std::size_t k = 0; k < KK; ++k) {
          const double v = std::sqrt(fold_mse[(k * ND + di) * L + l]);
          ss += (v - m) * (v - m);
        }
        c.cv_rmse = m;
        c.cv_se = KK > 1 ? std::sqrt(ss / static_cast<double>(KK - 1)) /
                               std::sqrt(static_cast<double>(KK))
                         : 0.0;
      } else {
        c.cv_rmse = c.cv_se = std::numeric_limits<double>::quiet_NaN();
      }
      if (d > 0) {
        c.train_rmse = std::sqrt(train_mse[di * L + l]);
      } else {
        const double m = y_train.mean();
        c.train_rmse = std::sqrt((y_train.array() - m).square().mean());
      }
      sel.grid.push_back(c);
    }
  }

  // Choose (a single cell without CV scores: the fixed model).
  const int best = std::max(0, choose_cell(sel.grid, options.rule));
  sel.chosen = best;
  const GridCell& chosen = sel.grid[static_cast<std::size_t>(best)];
  const int d = chosen.degree;
  cal.lambda = chosen.lambda;

  // Final fit on all training points.
  if (d == 0) {
    cal.model.cheb = {y_train.mean()};
    cal.condition_number = 1.0;
  } else if (NestedRidge& full = engines[KK]; full.columns() >= d && full.usable() >= d) {
    // The factorisation of all training points made while scoring: the same
    // orthogonal-transformation solve, no second factorisation.
    Eigen::VectorXd b(d);
    double b0 = 0.0;
    full.coefficients(d, cal.lambda, b.data(), b0);
    cal.model.cheb = cheb_from_fit(b, b0, sc, options.intercept);
    cal.condition_number = full.condition_number(d);
  } else {
    const RidgePath path(take_rows(X, train_rows, d), y_train, options.intercept);
    if (!path.status().ok && cal.lambda == 0.0) {
      out.status = Status::failure(path.status().message +
                                   "; add setpoints, lower the degree or use lambda > 0");
      return out;
    }
    Eigen::VectorXd b;
    double b0 = 0.0;
    path.coefficients(cal.lambda, b, b0);
    cal.model.cheb = cheb_from_fit(b, b0, sc, options.intercept);
    cal.condition_number = path.condition_number();
  }

  // Held-out predictions of the chosen cell.
  std::vector<double> cv_pred(n, std::numeric_limits<double>::quiet_NaN());
  if (can_cv && d > 0) {
    for (int k = 0; k < K; ++k) {
      const auto& tr = fold_train[static_cast<std::size_t>(k)];
      const auto& va = fold_val[static_cast<std::size_t>(k)];
      NestedRidge& engine = engines[static_cast<std::size_t>(k)];  // factorised while scoring
      if (engine.usable() >= d) {
        pred.resize(static_cast<Eigen::Index>(va.size()));
        engine.predict_validation(d, cal.lambda, pred.data());
      } else {
        const RidgePath path(take_rows(X, tr, d), take(y, tr), options.intercept);
        path.predict(path.project(take_rows(X, va, d)), cal.lambda, pred);
      }
      for (std::size_t i = 0; i < va.size(); ++i)
        cv_pred[va[i]] = pred(static_cast<Eigen::Index>(i));
    }
  }

  // Back to reference units (exact: powers of two).
  if (y_exp != 0) {
    for (double& c : cal.model.cheb) c = std::ldexp(c, y_exp);
    for (double& v : cv_pred) v = std::ldexp(v, y_exp);
    for (GridCell& c : sel.grid) {
      c.cv_rmse = std::ldexp(c.cv_rmse, y_exp);
      c.cv_se = std::ldexp(c.cv_se, y_exp);
      c.train_rmse = std::ldexp(c.train_rmse, y_exp);
    }
  }
  for (double c : cal.model.cheb)
    if (!std::isfinite(c)) {
      out.status = Status::failure(
          "the fit produced a non-finite coefficient; the data are too extreme for this model "
          "(lower the degree, "
          "use lambda > 0, or rescale the columns)");
      return out;
    }

  std::vector<double> tr_ref, tr_pred, va_ref, va_pred, te_ref, te_pred;
  for (std::size_t r = 0; r < n; ++r) {
    PointResult p;
    p.line = data.rows[r].line;
    p.setpoint = data.rows[r].setpoint;
    p.reading = x[r];
    p.reference = data.rows[r].reference;
    p.predicted = cal.model.eval(x[r]);
    p.error = p.predicted - p.reference;
    p.role = row_role[r];
    p.fold = row_fold[r];
    p.cv_predicted = cv_pred[r];
    if (p.role == SetRole::Train) {
      tr_ref.push_back(p.reference);
      tr_pred.push_back(p.predicted);
      if (!std::isnan(p.cv_predicted)) {
        va_ref.push_back(p.reference);
        va_pred.push_back(p.cv_predicted);
      }
    } else {
      te_ref.push_back(p.reference);
      te_pred.push_back(p.predicted);
    }
    if (!std::isfinite(p.predicted) || !std::isfinite(p.error)) {
      out.status =
          Status::failure(fmt::format("line {}: the fitted curve gives a non-finite value at "
                                      "reading {}; the data are too extreme for this "
                                      "model (lower the degree, or rescale the columns)",
                                      p.line, p.reading));
      return out;
    }
    cal.points.push_back(std::move(p));
  }
  cal.training = compute_metrics(tr_ref, tr_pred, d, options.intercept);
  cal.validation = compute_metrics(va_ref, va_pred, d, options.intercept);
  cal.test = compute_metrics(te_ref, te_pred, d, options.intercept);
  return out;
}

bool is_extended(const Calibration& cal) {
  return cal.surface.has_value();
}

SurfaceModel general_model(const Calibration& cal) {
  if (cal.surface) return *cal.surface;
  SurfaceModel m;
  m.basis = SurfaceBasis::Chebyshev;
  m.input = AxisScaling{cal.model.scaling.x_min, cal.model.scaling.x_max,
                        cal.model.scaling.center(), cal.model.scaling.half_width()};
  m.terms = terms_reading_only(cal.model.degree());
  m.coefficients = cal.model.cheb;
  return m;
}

std::string Calibration::brief() const {
  std::string s;
  if (surface)
    s += surface_brief(*this);
  else {
    if (selection.mode == SelectionMode::Fixed)
      s += fmt::format("model: degree {}, lambda {:g} (fixed by the user)\n", model.degree(),
                       lambda);
    else
      s += fmt::format(
          "model: degree {}, lambda {:g} (chosen by {} grouped CV over {} folds, rule {})\n",
          model.degree(), lambda, to_string(selection.scheme), selection.n_folds,
          to_string(selection.rule));
    s += fmt::format("range: reading {:g} .. {:g}\n", model.scaling.x_min, model.scaling.x_max);
  }
  std::size_t ntr = 0, nte = 0;
  for (const auto& sp : setpoints) (sp.role == SetRole::Train ? ntr : nte)++;
  s += fmt::format("setpoints: {} training, {} test{}\n", ntr, nte,
                   user_named_test ? " (named by the role column)" : "");
  s += "training:   " + training.brief() + "\n";
  s += "validation: " + validation.brief() + "\n";
  s += "test:       " + test.brief() + "\n";
  return s;
}

std::string Calibration::full() const {
  std::string s = brief();
  // Non-finite figures print as n/a (never nan or inf).
  const auto g = [](double v, const char* spec) {
    return std::isfinite(v) ? fmt::format(fmt::runtime(spec), v) : std::string("n/a");
  };
  if (surface)
    s += surface_full(*this);
  else {
    s += "chebyshev coefficients (scaled reading t):";
    for (double c : model.cheb) s += " " + g(c, "{:.17g}");
    s += "\npower coefficients (raw reading x):";
    for (double c : model.power_in_x()) s += " " + g(c, "{:.17g}");
  }
  s += "\ncondition number: " + g(condition_number, "{:.3g}") + "\n";
  for (const auto& note : selection.notes) s += "note: " + note + "\n";
  return s;
}

}  // namespace ridgecal
