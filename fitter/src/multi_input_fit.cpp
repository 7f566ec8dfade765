#include "ridgecal/multi_input_fit.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cassert>
#include <cmath>
#include <limits>
#include <map>
#include <memory>

#include "ridgecal/errors.hpp"
#include "ridgecal/ridge_path.hpp"

namespace ridgecal {

namespace {
constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
constexpr int kMaxDegree = 20;
constexpr int kMaxAuxDegree = 10;
constexpr int kMaxTerms = 120;
}  // namespace

std::string CompensationOptions::validate(const FitOptions& fit) const {
  if (const std::string e = transforms.validate(); !e.empty()) return e;
  if (!fit.intercept)
    return "intercept is false; extended models (transforms, aux, powers) always have the (0,0) "
           "term or none via powers";
  if (aux && !(std::isfinite(aux_step) && aux_step > 0.0))
    return fmt::format("aux_step is {}; it must be a finite number > 0", aux_step);
  if (!aux && !aux_degrees.empty())
    return "aux_degrees is given without an aux input; name the aux column";
  for (int a : aux_degrees)
    if (a < 0 || a > kMaxAuxDegree)
      return fmt::format("aux_degrees contains {}; every aux degree must be between 0 and {}", a,
                         kMaxAuxDegree);
  if (fit.fixed_degree && aux_degrees.size() > 1)
    return "aux_degrees has several values with a fixed model; give one aux degree with --degree "
           "and --lambda";
  if (!powers.empty()) {
    std::vector<int> p = powers;
    std::sort(p.begin(), p.end());
    if (std::adjacent_find(p.begin(), p.end()) != p.end())
      return "powers contains a value twice; list each power once";
    if (p.front() < 0 || p.back() > kMaxDegree)
      return fmt::format("powers contains {}; every power must be between 0 and {}",
                         p.front() < 0 ? p.front() : p.back(), kMaxDegree);
    if (p.back() < 1) return "powers is {0}; give at least one power >= 1";
    if (aux && aux_degrees.empty())
      return "powers and an aux input need aux_degrees (the aux degree limit, --aux-degree)";
    if (fit.fixed_degree && *fit.fixed_degree != p.back())
      return fmt::format("fixed_degree is {} but the largest allowed power is {}; they must agree",
                         *fit.fixed_degree, p.back());
  }
  return {};
}

namespace {

struct Group {
  std::string id;
  std::vector<std::size_t> rows;
  double mean_reading = 0, mean_reference = 0, mean_aux = kNaN;
  std::string level;
  int level_index = 0;
  UserRole user_role = UserRole::Unspecified;
  bool boundary = false;
};

std::string aux_key(const Observation& ob, double step) {
  if (!ob.aux_setpoint.empty()) return ob.aux_setpoint;
  const double v = std::round(ob.aux / step) * step + 0.0;  // + 0.0: no "-0"
  return fmt::format("{}", v);
}

std::vector<Group> make_groups(const Dataset& ds, const CompensationOptions& comp) {
  std::map<std::string, std::size_t> index;
  std::vector<Group> groups;
  for (std::size_t r = 0; r < ds.rows.size(); ++r) {
    const Observation& ob = ds.rows[r];
    const std::string level = comp.aux ? aux_key(ob, comp.aux_step) : std::string();
    const std::string id = comp.aux ? ob.setpoint + "|" + level : ob.setpoint;
    auto [it, inserted] = index.emplace(id, groups.size());
    if (inserted) {
      Group g;
      g.id = id;
      g.level = level;
      g.user_role = ob.role;
      groups.push_back(g);
    }
    Group& g = groups[it->second];
    if (g.user_role != ob.role)
      throw InputError(
          ds.file, ob.line,
          fmt::format("setpoint '{}' has rows with different roles ('{}' here, '{}' on line {})",
                      g.id, to_string(ob.role), to_string(g.user_role),
                      ds.rows[g.rows.front()].line),
          "repeated readings at one setpoint must share one role");
    g.rows.push_back(r);
  }
  for (Group& g : groups) {
    long double sr = 0, sf = 0, sa = 0;
    for (std::size_t r : g.rows) {
      sr += ds.rows[r].reading;
      sf += ds.rows[r].reference;
      sa += comp.aux ? ds.rows[r].aux : 0.0;
    }
    const long double n = static_cast<long double>(g.rows.size());
    g.mean_reading = static_cast<double>(sr / n);
    g.mean_reference = static_cast<double>(sf / n);
    if (comp.aux) g.mean_aux = static_cast<double>(sa / n);
  }
  if (!comp.aux) {
    std::sort(groups.begin(), groups.end(), [](const Group& a, const Group& b) {
      if (a.mean_reading != b.mean_reading) return a.mean_reading < b.mean_reading;
      return a.id < b.id;
    });
    if (!groups.empty()) groups.front().boundary = groups.back().boundary = true;
    return groups;
  }
  // Aux levels ordered by their mean aux value.
  std::map<std::string, std::pair<long double, std::size_t>> level_sum;
  for (const Group& g : groups) {
    auto& ls = level_sum[g.level];
    ls.first += static_cast<long double>(g.mean_aux) * static_cast<long double>(g.rows.size());
    ls.second += g.rows.size();
  }
  std::vector<std::pair<double, std::string>> levels;
  for (const auto& [name, s] : level_sum)
    levels.emplace_back(static_cast<double>(s.first / static_cast<long double>(s.second)), name);
  std::sort(levels.begin(), levels.end());
  std::map<std::string, int> level_index;
  for (std::size_t i = 0; i < levels.size(); ++i)
    level_index[levels[i].second] = static_cast<int>(i);
  for (Group& g : groups) g.level_index = level_index[g.level];
  std::sort(groups.begin(), groups.end(), [](const Group& a, const Group& b) {
    if (a.level_index != b.level_index) return a.level_index < b.level_index;
    if (a.mean_reading != b.mean_reading) return a.mean_reading < b.mean_reading;
    return a.id < b.id;
  });
  const int last_level = static_cast<int>(levels.size()) - 1;
  for (std::size_t g = 0; g < groups.size(); ++g) {
    const bool first_in_level = g == 0 || groups[g - 1].level_index != groups[g].level_index;
    const bool last_in_level =
        g + 1 == groups.size() || groups[g + 1].level_index != groups[g].level_index;
    groups[g].boundary = groups[g].level_index == 0 || groups[g].level_index == last_level ||
                         first_in_level || last_in_level;
  }
  return groups;
}

// The 1-D split of grouped_split.cpp, with "interior" meaning "not on the boundary".
Split make_boundary_split(const std::vector<Group>& groups, const SplitOptions& options,
                          std::size_t min_train) {
  const std::size_t n = groups.size();
  Split sp;
  sp.role.assign(n, SetRole::Train);
  sp.fold.assign(n, -1);
  SplitRng rng(options.seed);
  const bool user_roles = std::any_of(groups.begin(), groups.end(), [](const Group& g) {
    return g.user_role != UserRole::Unspecified;
  });
  std::vector<std::size_t> interior;
  for (std::size_t g = 0; g < n; ++g)
    if (!groups[g].boundary) interior.push_back(g);
  if (user_roles) {
    sp.user_named_test = true;
    for (std::size_t g = 0; g < n; ++g)
      if (groups[g].user_role == UserRole::Check) sp.role[g] = SetRole::Test;
  } else {
    std::size_t want =
        static_cast<std::size_t>(std::llround(options.test_fraction * static_cast<double>(n)));
    const std::size_t room = n > min_train ? n - min_train : 0;
    want = std::min({want, room, interior.size()});
    for (std::size_t g : stratified_pick(interior, want, rng)) sp.role[g] = SetRole::Test;
  }
  std::vector<std::size_t> cand;
  for (std::size_t g : interior)
    if (sp.role[g] == SetRole::Train) cand.push_back(g);
  if (cand.empty()) return sp;
  assign_folds(cand, options, rng, sp);
  return sp;
}

struct Candidate {
  int degree = 0;
  int aux_degree = -1;
  std::vector<Term> terms;
};

Eigen::VectorXd take(const std::vector<double>& v, const std::vector<std::size_t>& idx) {
  Eigen::VectorXd out(static_cast<Eigen::Index>(idx.size()));
  for (std::size_t i = 0; i < idx.size(); ++i) out(static_cast<Eigen::Index>(i)) = v[idx[i]];
  return out;
}

Eigen::MatrixXd take_rows(const Eigen::MatrixXd& X, const std::vector<std::size_t>& idx) {
  Eigen::MatrixXd out(static_cast<Eigen::Index>(idx.size()), X.cols());
  for (std::size_t i = 0; i < idx.size(); ++i)
    out.row(static_cast<Eigen::Index>(i)) = X.row(static_cast<Eigen::Index>(idx[i]));
  return out;
}

// RMSE in reference units of fitted-output predictions `vhat` against y.
double rmse_ref(const Transforms& tr, const Eigen::VectorXd& vhat, const Eigen::VectorXd& y) {
  long double ss = 0;
  for (Eigen::Index i = 0; i < y.size(); ++i) {
    const double e = tr.output_inverse(vhat(i)) - y(i);
    ss += static_cast<long double>(e) * e;
  }
  return std::sqrt(static_cast<double>(ss / static_cast<long double>(y.size())));
}

}  // namespace

FitOutcome fit_compensated(const Dataset& data, const FitOptions& options,
                           const CompensationOptions& comp) {
  assert(options.validate().empty() && comp.validate(options).empty());
  FitOutcome out;
  Calibration& cal = out.calibration;
  cal.split_options = options.split;
  const std::size_t n = data.rows.size();
  const Transforms& tr = comp.transforms;

  // Transformed inputs and outputs; domain errors name the line.
  std::vector<double> x(n), y(n), u(n), v(n), a(n, 0.0);
  for (std::size_t r = 0; r < n; ++r) {
    const Observation& ob = data.rows[r];
    x[r] = ob.reading;
    y[r] = ob.reference;
    u[r] = tr.input(ob.reading);
    v[r] = tr.output(ob.reference);
    if (!std::isfinite(u[r]))
      throw InputError(
          data.file, ob.line,
          fmt::format("the reading {} is outside the domain of the reading transforms ({})",
                      ob.reading, tr.describe()),
          tr.divider.enabled ? fmt::format("divider counts must lie strictly between 0 and {}",
                                           tr.divider.full_scale)
                             : "ln needs a reading > 0");
    if (!std::isfinite(v[r]))
      throw InputError(
          data.file, ob.line,
          fmt::format("the reference {} is outside the domain of the reference transform",
                      ob.reference),
          "reciprocal-kelvin needs a reference in degC above -273.15");
    if (comp.aux) {
      if (!std::isfinite(ob.aux))
        throw InputError(data.file, ob.line, "the row has no aux value",
                         "name the aux column with --aux");
      a[r] = ob.aux;
    }
  }

  // Candidate term sets.
  const bool fixed = options.fixed_degree.has_value();
  const SurfaceBasis basis = comp.powers.empty() ? SurfaceBasis::Chebyshev : SurfaceBasis::Power;
  std::vector<int> degrees = fixed ? std::vector<int>{*options.fixed_degree} : options.degrees;
  std::sort(degrees.begin(), degrees.end());
  degrees.erase(std::unique(degrees.begin(), degrees.end()), degrees.end());
  std::vector<int> aux_degrees = comp.aux_degrees;
  std::sort(aux_degrees.begin(), aux_degrees.end());
  aux_degrees.erase(std::unique(aux_degrees.begin(), aux_degrees.end()), aux_degrees.end());
  std::vector<int> powers = comp.powers;
  std::sort(powers.begin(), powers.end());
  std::vector<double> lambdas =
      fixed ? std::vector<double>{*options.fixed_lambda} : options.lambdas;
  std::sort(lambdas.begin(), lambdas.end());
  lambdas.erase(std::unique(lambdas.begin(), lambdas.end()), lambdas.end());

  std::vector<Candidate> cands;
  SelectionInfo& sel = cal.selection;
  if (!powers.empty()) {
    if (!fixed && options.degrees != FitOptions{}.degrees)
      sel.notes.push_back("the candidate degrees are ignored: --powers fixes the reading terms");
    for (int ad : comp.aux ? aux_degrees : std::vector<int>{0})
      cands.push_back({powers.back(), comp.aux ? ad : -1, terms_powers(powers, ad)});
  } else if (!comp.aux) {
    for (int d : degrees) cands.push_back({d, -1, terms_reading_only(d)});
  } else if (aux_degrees.empty()) {
    for (int d : degrees) cands.push_back({d, -1, terms_total_degree(d)});
  } else {
    for (int d : degrees)
      for (int ad : aux_degrees) cands.push_back({d, ad, terms_rectangle(d, ad)});
  }
  const bool intercept = std::find(cands.front().terms.begin(), cands.front().terms.end(),
                                   Term{0, 0}) != cands.front().terms.end();
  cal.intercept = intercept;

  const std::vector<Group> groups = make_groups(data, comp);
  std::size_t min_terms = cands.front().terms.size();
  for (const Candidate& c : cands) min_terms = std::min(min_terms, c.terms.size());
  const std::size_t min_needed = std::max<std::size_t>(min_terms, 2);
  if (groups.size() < min_needed) {
    out.status =
        Status::failure(fmt::format("only {} distinct setpoint group(s); the smallest candidate "
                                    "model ({} terms) needs at least {}",
                                    groups.size(), min_terms, min_needed));
    return out;
  }
  const Split split = make_boundary_split(groups, options.split, min_needed);
  cal.user_named_test = split.user_named_test;

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
    SetpointResult sp{groups[g].id,          groups[g].mean_reading, groups[g].mean_reference,
                      groups[g].rows.size(), split.role[g],          split.fold[g]};
    sp.mean_aux = groups[g].mean_aux;
    cal.setpoints.push_back(sp);
  }
  for (std::size_t r = 0; r < n; ++r)
    (row_role[r] == SetRole::Train ? train_rows : test_rows).push_back(r);

  // Scalings over the training rows.
  double umin = std::numeric_limits<double>::infinity(), umax = -umin, amin = umin, amax = -umin;
  for (std::size_t r : train_rows) {
    umin = std::min(umin, u[r]);
    umax = std::max(umax, u[r]);
    amin = std::min(amin, a[r]);
    amax = std::max(amax, a[r]);
  }
  if (!(umax > umin)) {
    out.status = Status::failure(
        "all training readings are equal after the transforms; a calibration needs readings that "
        "vary");
    return out;
  }
  if (comp.aux && !(amax > amin)) {
    out.status = Status::failure("all training aux values are equal; a second input must vary");
    return out;
  }
  SurfaceModel model;
  model.transforms = tr;
  model.has_aux = comp.aux;
  model.basis = basis;
  model.input = basis == SurfaceBasis::Chebyshev ? AxisScaling::centered(umin, umax)
                                                 : AxisScaling::about_zero(umin, umax);
  if (comp.aux) model.aux = AxisScaling::centered(amin, amax);
  std::vector<double> ts(n), ss(n, 0.0);
  for (std::size_t r = 0; r < n; ++r) {
    ts[r] = model.input.to_scaled(u[r]);
    if (comp.aux) ss[r] = model.aux.to_scaled(a[r]);
  }

  // Folds.
  const int K = split.n_folds;
  std::vector<std::vector<std::size_t>> fold_train(static_cast<std::size_t>(K)),
      fold_val(static_cast<std::size_t>(K));
  std::vector<std::size_t> fold_groups(static_cast<std::size_t>(K), 0);
  for (std::size_t g = 0; g < groups.size(); ++g)
    if (split.fold[g] >= 0) ++fold_groups[static_cast<std::size_t>(split.fold[g])];
  for (std::size_t r : train_rows)
    for (int k = 0; k < K; ++k)
      (row_fold[r] == k ? fold_val : fold_train)[static_cast<std::size_t>(k)].push_back(r);
  std::size_t min_fold_train_groups = n_train_groups;
  for (int k = 0; k < K; ++k)
    min_fold_train_groups =
        std::min(min_fold_train_groups, n_train_groups - fold_groups[static_cast<std::size_t>(k)]);
  std::size_t n_levels = 0;
  if (comp.aux) {
    std::map<std::string, int> lv;
    for (std::size_t g = 0; g < groups.size(); ++g)
      if (split.role[g] == SetRole::Train) lv[groups[g].level] = 1;
    n_levels = lv.size();
  }

  sel.mode = fixed ? SelectionMode::Fixed : SelectionMode::CrossValidation;
  sel.rule = options.rule;
  sel.scheme = split.scheme;
  sel.n_folds = K;
  sel.lambdas = lambdas;
  sel.aux_degrees = aux_degrees;
  sel.powers = powers;
  std::vector<Candidate> scored;
  for (const Candidate& c : cands) {
    const std::size_t need = c.terms.size();
    const std::string name = c.aux_degree >= 0
                                 ? fmt::format("degree {} / aux degree {}", c.degree, c.aux_degree)
                                 : fmt::format("degree {}", c.degree);
    int max_j = 0;
    for (const Term& t : c.terms) max_j = std::max(max_j, t.j);
    if (need > kMaxTerms) {
      sel.notes.push_back(
          fmt::format("{} dropped: {} terms exceed the limit of {}", name, need, kMaxTerms));
      continue;
    }
    if (n_train_groups < need) {
      sel.notes.push_back(
          fmt::format("{} dropped: it has {} terms, there are {} training setpoint groups", name,
                      need, n_train_groups));
      continue;
    }
    if (comp.aux && n_levels < static_cast<std::size_t>(max_j) + 1) {
      sel.notes.push_back(
          fmt::format("{} dropped: aux degree {} needs {} aux levels in training, there are {}",
                      name, max_j, max_j + 1, n_levels));
      continue;
    }
    if (!fixed && K > 0 && min_fold_train_groups < need) {
      sel.notes.push_back(
          fmt::format("{} dropped: a cross-validation fold would train on {} groups, it needs {}",
                      name, min_fold_train_groups, need));
      continue;
    }
    scored.push_back(c);
    if (std::find(sel.degrees.begin(), sel.degrees.end(), c.degree) == sel.degrees.end())
      sel.degrees.push_back(c.degree);
  }
  if (scored.empty()) {
    out.status = Status::failure(fmt::format(
        "fewer distinct training setpoint groups ({}) than the smallest candidate model needs",
        n_train_groups));
    return out;
  }
  const bool can_cv = K >= 2;
  if (!fixed && !can_cv && scored.size() * lambdas.size() > 1) {
    out.status = Status::failure(
        fmt::format("only {} training setpoint groups off the boundary: too few to cross-validate "
                    "(the boundary groups always "
                    "stay in training); give a fixed model with --degree and --lambda",
                    split.n_folds));
    return out;
  }

  // Univariate basis values per row, then the design of each candidate.
  int Dmax = 0, Amax = 0;
  for (const Candidate& c : scored)
    for (const Term& t : c.terms) {
      Dmax = std::max(Dmax, t.i);
      Amax = std::max(Amax, t.j);
    }
  SurfaceModel probe = model;
  auto design = [&](const std::vector<Term>& terms) {
    std::vector<Term> cols;
    for (const Term& t : terms)
      if (!(t == Term{0, 0})) cols.push_back(t);
    probe.terms = cols;
    Eigen::MatrixXd X(static_cast<Eigen::Index>(n), static_cast<Eigen::Index>(cols.size()));
    std::vector<double> row(cols.size());
    for (std::size_t r = 0; r < n; ++r) {
      if (!cols.empty()) probe.basis_row(ts[r], ss[r], row.data());
      for (std::size_t q = 0; q < cols.size(); ++q)
        X(static_cast<Eigen::Index>(r), static_cast<Eigen::Index>(q)) = row[q];
    }
    return X;
  };

  const Eigen::VectorXd v_train = take(v, train_rows), y_train = take(y, train_rows);
  const std::size_t L = lambdas.size();
  Eigen::VectorXd pred;
  std::vector<Eigen::MatrixXd> designs;
  for (const Candidate& c : scored) {
    const Eigen::MatrixXd X = design(c.terms);
    designs.push_back(X);
    const bool has_cols = X.cols() > 0;
    std::vector<std::vector<double>> fold_rmse(L);
    if (can_cv && has_cols) {
      for (int k = 0; k < K; ++k) {
        const auto& trr = fold_train[static_cast<std::size_t>(k)];
        const auto& va = fold_val[static_cast<std::size_t>(k)];
        const RidgePath path(take_rows(X, trr), take(v, trr), intercept);
        const Eigen::MatrixXd W = path.project(take_rows(X, va));
        const Eigen::VectorXd yv = take(y, va);
        for (std::size_t l = 0; l < L; ++l) {
          path.predict(W, lambdas[l], pred);
          fold_rmse[l].push_back(rmse_ref(tr, pred, yv));
        }
      }
    }
    std::unique_ptr<RidgePath> full;
    Eigen::MatrixXd Wt;
    if (has_cols) {
      full = std::make_unique<RidgePath>(take_rows(X, train_rows), v_train, intercept);
      Wt = full->project(take_rows(X, train_rows));
    }
    for (std::size_t l = 0; l < L; ++l) {
      GridCell cell;
      cell.degree = c.degree;
      cell.aux_degree = c.aux_degree;
      cell.terms = static_cast<int>(c.terms.size());
      cell.lambda = lambdas[l];
      const auto& fr = fold_rmse[l];
      if (!fr.empty()) {
        double m = 0;
        for (double q : fr) m += q;
        m /= static_cast<double>(fr.size());
        double s2 = 0;
        for (double q : fr) s2 += (q - m) * (q - m);
        cell.cv_rmse = m;
        cell.cv_se = fr.size() > 1 ? std::sqrt(s2 / static_cast<double>(fr.size() - 1)) /
                                         std::sqrt(static_cast<double>(fr.size()))
                                   : 0.0;
      } else {
        cell.cv_rmse = cell.cv_se = kNaN;
      }
      if (full) {
        full->predict(Wt, lambdas[l], pred);
        cell.train_rmse = rmse_ref(tr, pred, y_train);
      } else {
        cell.train_rmse =
            rmse_ref(tr, Eigen::VectorXd::Constant(v_train.size(), v_train.mean()), y_train);
      }
      sel.grid.push_back(cell);
    }
  }

  // Choose (a single cell without CV scores: the fixed model).
  int best = choose_cell(sel.grid, options.rule);
  if (best < 0) {
    if (sel.grid.size() > 1) {
      out.status = Status::failure(
          "no candidate model could be scored (every held-out prediction left the reference "
          "transform's domain); give a fixed model with --degree and --lambda");
      return out;
    }
    best = 0;
  }
  sel.chosen = best;
  const GridCell& chosen = sel.grid[static_cast<std::size_t>(best)];
  const std::size_t ci = static_cast<std::size_t>(best) / L;
  const Candidate& cc = scored[ci];
  const Eigen::MatrixXd& X = designs[ci];
  cal.lambda = chosen.lambda;

  // Final fit.
  std::vector<Term> cols;
  for (const Term& t : cc.terms)
    if (!(t == Term{0, 0})) cols.push_back(t);
  model.terms.clear();
  model.coefficients.clear();
  if (X.cols() == 0) {
    model.terms = {Term{0, 0}};
    model.coefficients = {v_train.mean()};
    cal.condition_number = 1.0;
  } else {
    const RidgePath path(take_rows(X, train_rows), v_train, intercept);
    if (!path.status().ok && cal.lambda == 0.0) {
      out.status = Status::failure(path.status().message +
                                   "; add setpoints, lower the degree or use lambda > 0");
      return out;
    }
    Eigen::VectorXd b;
    double b0 = 0.0;
    path.coefficients(cal.lambda, b, b0);
    if (intercept) {
      model.terms.push_back(Term{0, 0});
      model.coefficients.push_back(b0);
    }
    for (std::size_t q = 0; q < cols.size(); ++q) {
      model.terms.push_back(cols[q]);
      model.coefficients.push_back(b(static_cast<Eigen::Index>(q)));
    }
    cal.condition_number = path.condition_number();
  }
  cal.surface = model;
  if (comp.aux && data.columns.aux_setpoint_column.empty()) cal.aux_step = comp.aux_step;

  std::vector<double> cv_pred(n, kNaN);
  if (can_cv && X.cols() > 0) {
    for (int k = 0; k < K; ++k) {
      const auto& trr = fold_train[static_cast<std::size_t>(k)];
      const auto& va = fold_val[static_cast<std::size_t>(k)];
      const RidgePath path(take_rows(X, trr), take(v, trr), intercept);
      path.predict(path.project(take_rows(X, va)), cal.lambda, pred);
      for (std::size_t i = 0; i < va.size(); ++i)
        cv_pred[va[i]] = tr.output_inverse(pred(static_cast<Eigen::Index>(i)));
    }
  }

  const int predictors = static_cast<int>(model.terms.size()) - (intercept ? 1 : 0);
  std::vector<double> tr_ref, tr_pred, va_ref, va_pred, te_ref, te_pred;
  for (std::size_t r = 0; r < n; ++r) {
    PointResult p;
    p.line = data.rows[r].line;
    p.setpoint = data.rows[r].setpoint;
    p.reading = x[r];
    p.reference = y[r];
    p.aux = comp.aux ? a[r] : kNaN;
    p.predicted = model.eval(x[r], a[r]);
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
    cal.points.push_back(std::move(p));
  }
  cal.training = compute_metrics(tr_ref, tr_pred, predictors, intercept);
  cal.validation = compute_metrics(va_ref, va_pred, predictors, intercept);
  cal.test = compute_metrics(te_ref, te_pred, predictors, intercept);
  return out;
}

namespace {
std::string term_name(const Term& t, bool aux) {
  if (!aux) return fmt::format("{}", t.i);
  return fmt::format("({},{})", t.i, t.j);
}
}  // namespace

std::string surface_brief(const Calibration& cal) {
  const SurfaceModel& m = *cal.surface;
  std::string s;
  std::string shape;
  if (!cal.selection.powers.empty()) {
    shape = "powers";
    for (std::size_t i = 0; i < cal.selection.powers.size(); ++i)
      shape += (i ? "," : " ") + std::to_string(cal.selection.powers[i]);
    if (m.has_aux) shape += fmt::format(", aux degree {}", m.aux_degree());
  } else if (m.has_aux) {
    const GridCell* c = cal.selection.chosen >= 0
                            ? &cal.selection.grid[static_cast<std::size_t>(cal.selection.chosen)]
                            : nullptr;
    shape = c && c->aux_degree >= 0
                ? fmt::format("degree {}, aux degree {}", m.reading_degree(), c->aux_degree)
                : fmt::format("total degree {}", m.total_degree());
  } else {
    shape = fmt::format("degree {}", m.reading_degree());
  }
  if (cal.selection.mode == SelectionMode::Fixed)
    s += fmt::format("model: {} ({} terms, {} basis), lambda {:g} (fixed by the user)\n", shape,
                     m.terms.size(), to_string(m.basis), cal.lambda);
  else
    s += fmt::format(
        "model: {} ({} terms, {} basis), lambda {:g} (chosen by {} grouped CV over {} folds, rule "
        "{})\n",
        shape, m.terms.size(), to_string(m.basis), cal.lambda, to_string(cal.selection.scheme),
        cal.selection.n_folds, to_string(cal.selection.rule));
  if (!m.transforms.identity()) s += "transforms: " + m.transforms.describe() + "\n";
  s += fmt::format("range: {} {:g} .. {:g}",
                   m.transforms.identity() ? "reading" : "transformed reading", m.input.min,
                   m.input.max);
  if (m.has_aux) s += fmt::format(", aux {:g} .. {:g}", m.aux.min, m.aux.max);
  s += "\n";
  return s;
}

std::string surface_full(const Calibration& cal) {
  const SurfaceModel& m = *cal.surface;
  std::string s = fmt::format("{} coefficients (scaled variables):", to_string(m.basis));
  for (std::size_t q = 0; q < m.terms.size(); ++q)
    s += fmt::format(" {}:{:.17g}", term_name(m.terms[q], m.has_aux), m.coefficients[q]);
  s += "\npower coefficients (transformed reading u";
  s += m.has_aux ? ", aux a; key (k,l) of u^k a^l):" : "; key k of u^k):";
  const auto pw = m.power_in_raw();
  for (std::size_t k = 0; k < pw.size(); ++k)
    for (std::size_t l = 0; l < pw[k].size(); ++l)
      if (pw[k][l] != 0.0)
        s += fmt::format(" {}:{:.17g}",
                         term_name(Term{static_cast<int>(k), static_cast<int>(l)}, m.has_aux),
                         pw[k][l]);
  return s;
}

}  // namespace ridgecal
