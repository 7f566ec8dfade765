// The one fit (fit_model.hpp): values, groups and split, scaling, candidates,
// the scored grid, the choice, the final model and the results.
#include "ridgecal/fit_model.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cassert>
#include <cmath>
#include <limits>
#include <set>

#include "ridgecal/errors.hpp"
#include "ridgecal/fit_grid.hpp"

namespace ridgecal {

namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
constexpr std::size_t kMaxTerms = 120;

template <class T>
std::vector<T> sorted_unique(std::vector<T> v) {
  std::sort(v.begin(), v.end());
  v.erase(std::unique(v.begin(), v.end()), v.end());
  return v;
}

bool extreme(double v) {
  return !std::isfinite(v) ||
         (v != 0.0 && (std::fabs(v) > kMaxMagnitude || std::fabs(v) < kMinMagnitude));
}

}  // namespace

FitOutcome fit_model(const Dataset& data, const FitOptions& options, const ExtendedOptions& comp) {
  assert(options.validate().empty() && comp.validate(options).empty());
  FitOutcome out;
  Calibration& cal = out.calibration;
  cal.split_options = options.split;
  const std::size_t n = data.rows.size();
  const Transforms& tr = comp.transforms;
  const bool origin = !options.intercept;  // through the origin: plain fits only (validate)

  // Values: magnitudes (status), then the transforms' domains (InputError, with the line).
  std::vector<double> x(n), y(n), u(n), v(n), a(n, 0.0);
  for (std::size_t r = 0; r < n; ++r) {
    const Observation& ob = data.rows[r];
    x[r] = ob.reading;
    y[r] = ob.reference;
    for (const double val : {x[r], y[r]})
      if (extreme(val)) {
        out.status =
            Status::failure(fmt::format("line {}: the value {} is not finite or its magnitude is "
                                        "outside the supported range [{:g}, {:g}]",
                                        ob.line, val, kMinMagnitude, kMaxMagnitude));
        return out;
      }
  }
  for (std::size_t r = 0; r < n; ++r) {
    const Observation& ob = data.rows[r];
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
  // With an identity reference transform, work on values scaled by an exact
  // power of two when their magnitude is extreme, so that squared errors
  // neither overflow nor underflow (1e300 and 1e-300 fit like 1). Ridge
  // regression is linear in them, so the choice and the coefficients are the
  // same; they are scaled back below.
  int y_exp = 0;
  if (tr.reference == ReferenceTransform::None) {
    double vmax = 0.0;
    for (double val : v) vmax = std::max(vmax, std::fabs(val));
    if (vmax > 0.0 && (vmax < 0x1p-64 || vmax > 0x1p64)) {
      std::frexp(vmax, &y_exp);
      for (std::size_t r = 0; r < n; ++r) {
        v[r] = std::ldexp(v[r], -y_exp);
        y[r] = std::ldexp(y[r], -y_exp);
      }
    }
  }
  const auto [xmin_it, xmax_it] = std::minmax_element(x.begin(), x.end());
  if (n == 0 || *xmin_it == *xmax_it) {
    out.status = Status::failure(
        fmt::format("all {} readings are equal ({}); a calibration needs readings that vary", n,
                    n ? *xmin_it : 0.0));
    return out;
  }

  // Candidate term lists.
  const bool fixed = options.fixed_degree.has_value();
  const TermRule rule = term_rule(comp);
  const std::vector<int> degrees =
      sorted_unique(fixed ? std::vector<int>{*options.fixed_degree} : options.degrees);
  const std::vector<int> aux_degrees = sorted_unique(comp.aux_degrees);
  const std::vector<int> powers = sorted_unique(comp.powers);
  const std::vector<double> lambdas =
      sorted_unique(fixed ? std::vector<double>{*options.fixed_lambda} : options.lambdas);
  SelectionInfo& sel = cal.selection;
  if (rule == TermRule::Powers && !fixed && options.degrees != FitOptions{}.degrees)
    sel.notes.push_back("the candidate degrees are ignored: --powers fixes the reading terms");
  const std::vector<Candidate> cands = candidate_models(rule, degrees, aux_degrees, powers);
  const std::vector<Term>& first_terms = cands.front().terms;
  // An unpenalised intercept: the (0,0) term is present and not forced by the origin.
  const bool centred =
      !origin && std::find(first_terms.begin(), first_terms.end(), Term{0, 0}) != first_terms.end();
  cal.intercept = centred;
  // Free coefficients of a candidate: the model's complexity and the
  // setpoints it needs.
  auto free_terms = [&](const Candidate& c) {
    return design_terms(c.terms).size() + (centred ? 1 : 0);
  };

  // Groups and split (the boundary rule, grouped_split.hpp).
  const std::vector<SetpointGroup> groups =
      group_by_setpoint(data, AuxGrouping{comp.aux, comp.aux_step});
  const Candidate* smallest = &cands.front();
  for (const Candidate& c : cands)
    if (free_terms(c) < free_terms(*smallest)) smallest = &c;
  const std::size_t min_needed = std::max<std::size_t>(free_terms(*smallest), 2);
  if (groups.size() < min_needed) {
    out.status = Status::failure(
        fmt::format("only {} distinct setpoint(s); the smallest candidate model ({}, {} terms) "
                    "needs at least {}",
                    groups.size(), candidate_name(*smallest), free_terms(*smallest), min_needed));
    return out;
  }
  const Split split = make_split(groups, options.split, min_needed);
  cal.user_named_test = split.user_named_test;

  std::vector<int> row_fold(n, -1);
  std::vector<SetRole> row_role(n, SetRole::Train);
  GridProblem prob;
  std::size_t n_train_groups = 0;
  std::set<int> train_levels;
  for (std::size_t g = 0; g < groups.size(); ++g) {
    if (split.role[g] == SetRole::Train) {
      ++n_train_groups;
      train_levels.insert(groups[g].level);
    }
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
    if (row_role[r] == SetRole::Train) prob.train.push_back(r);

  // Scalings over the training rows.
  double umin = std::numeric_limits<double>::infinity(), umax = -umin, amin = umin, amax = -umin;
  for (std::size_t r : prob.train) {
    umin = std::min(umin, u[r]);
    umax = std::max(umax, u[r]);
    amin = std::min(amin, a[r]);
    amax = std::max(amax, a[r]);
  }
  if (!(umax > umin)) {
    out.status = Status::failure(
        fmt::format("all training readings are equal{}; a calibration needs readings that vary",
                    tr.identity() ? "" : " after the transforms"));
    return out;
  }
  if (comp.aux && !(amax > amin)) {
    out.status = Status::failure("all training aux values are equal; a second input must vary");
    return out;
  }
  Model model;
  model.transforms = tr;
  model.has_aux = comp.aux;
  model.basis = rule == TermRule::Powers ? ModelBasis::Power : ModelBasis::Chebyshev;
  model.input = model.basis == ModelBasis::Chebyshev ? AxisScaling::centered(umin, umax)
                                                     : AxisScaling::about_zero(umin, umax);
  if (comp.aux) model.aux = AxisScaling::centered(amin, amax);
  std::vector<double> ts(n), ss(n, 0.0);
  for (std::size_t r = 0; r < n; ++r) {
    ts[r] = model.input.to_scaled(u[r]);
    if (comp.aux) ss[r] = model.aux.to_scaled(a[r]);
  }

  // Folds; a candidate is scored only if every fold's training part has enough groups.
  const int K = split.n_folds;
  const std::size_t KK = static_cast<std::size_t>(std::max(K, 0));
  prob.fold_train.resize(KK);
  prob.fold_val.resize(KK);
  std::vector<std::size_t> fold_groups(KK, 0);
  for (std::size_t g = 0; g < groups.size(); ++g)
    if (split.fold[g] >= 0) ++fold_groups[static_cast<std::size_t>(split.fold[g])];
  for (auto& f : prob.fold_train) f.reserve(prob.train.size());
  for (auto& f : prob.fold_val) f.reserve(prob.train.size());
  for (std::size_t r : prob.train)
    for (std::size_t k = 0; k < KK; ++k)
      (row_fold[r] == static_cast<int>(k) ? prob.fold_val : prob.fold_train)[k].push_back(r);
  std::size_t min_fold_train_groups = n_train_groups;
  for (std::size_t k = 0; k < KK; ++k)
    min_fold_train_groups = std::min(min_fold_train_groups, n_train_groups - fold_groups[k]);

  sel.mode = fixed ? SelectionMode::Fixed : SelectionMode::CrossValidation;
  sel.rule = options.rule;
  sel.scheme = split.scheme;
  sel.n_folds = K;
  sel.lambdas = lambdas;
  if (comp.active()) {
    sel.aux_degrees = aux_degrees;
    sel.powers = powers;
  }
  std::vector<Candidate> scored;
  for (const Candidate& c : cands) {
    const std::size_t need = free_terms(c);
    const std::string name = candidate_name(c);
    int max_j = 0;
    for (const Term& t : c.terms) max_j = std::max(max_j, t.j);
    if (need > kMaxTerms) {
      sel.notes.push_back(
          fmt::format("{} dropped: {} terms exceed the limit of {}", name, need, kMaxTerms));
      continue;
    }
    if (n_train_groups < need) {
      sel.notes.push_back(
          fmt::format("{} dropped: it has {} terms, there are {} training setpoints", name, need,
                      n_train_groups));
      continue;
    }
    if (comp.aux && train_levels.size() < static_cast<std::size_t>(max_j) + 1) {
      sel.notes.push_back(
          fmt::format("{} dropped: aux degree {} needs {} aux levels in training, there are {}",
                      name, max_j, max_j + 1, train_levels.size()));
      continue;
    }
    if (!fixed && K > 0 && min_fold_train_groups < need) {
      sel.notes.push_back(fmt::format(
          "{} dropped: a cross-validation fold would train on {} setpoints, it needs {}", name,
          min_fold_train_groups, need));
      continue;
    }
    scored.push_back(c);
    if (std::find(sel.degrees.begin(), sel.degrees.end(), c.degree) == sel.degrees.end())
      sel.degrees.push_back(c.degree);
  }
  if (scored.empty()) {
    out.status = Status::failure(fmt::format(
        "fewer distinct training setpoints ({}) than the smallest candidate model needs",
        n_train_groups));
    return out;
  }
  const bool can_cv = K >= 2;
  if (!fixed && !can_cv && scored.size() * lambdas.size() > 1) {
    out.status = Status::failure(
        fmt::format("only {} training setpoints, {} of them off the boundary: too few to "
                    "cross-validate (the boundary setpoints always stay in training); give a "
                    "fixed model with --degree and --lambda",
                    n_train_groups, std::max(K, 0)));
    return out;
  }

  // Designs: one for nested candidates (the largest one's columns), else one per candidate.
  std::vector<double> origin_row;
  if (origin) {
    // Through the origin the columns hold B(t(0)); refuse when reading 0 is so
    // far outside the calibrated range that these overflow.
    const std::vector<Term> cols = design_terms(scored.back().terms);
    origin_row.resize(cols.size());
    std::vector<double> row0(static_cast<std::size_t>(scored.back().degree) + 1);
    chebyshev_row(model.input.to_scaled(tr.input(0.0)), scored.back().degree, row0.data());
    for (std::size_t q = 0; q < cols.size(); ++q) {
      origin_row[q] = row0[static_cast<std::size_t>(cols[q].i)];
      if (!std::isfinite(origin_row[q]) || std::fabs(origin_row[q]) > 1e150) {
        out.status = Status::failure(
            fmt::format("reading 0 lies too far outside the calibrated range {:g} .. {:g} for a "
                        "fit through the origin",
                        umin, umax));
        return out;
      }
    }
  }
  prob.nested = nested(rule);
  for (std::size_t c = 0; c < scored.size(); ++c) {
    prob.cols.push_back(static_cast<int>(design_terms(scored[c].terms).size()));
    if (!prob.nested || c + 1 == scored.size())
      prob.designs.push_back(make_design(design_terms(scored[c].terms), model.basis, ts, ss,
                                         origin ? origin_row.data() : nullptr));
  }
  prob.v = v;
  prob.y = y;
  prob.output = tr;
  prob.centred = centred;
  prob.lambdas = lambdas;

  // Score the grid.
  FitGrid fit_grid(prob, can_cv);
  const std::size_t L = lambdas.size();
  sel.grid.reserve(scored.size() * L);
  for (std::size_t c = 0; c < scored.size(); ++c)
    for (std::size_t l = 0; l < L; ++l) {
      GridCell cell;
      cell.degree = scored[c].degree;
      cell.aux_degree = scored[c].aux_degree;
      cell.terms = static_cast<int>(free_terms(scored[c]));
      cell.lambda = lambdas[l];
      cell.cv_rmse = cell.cv_se = kNaN;
      if (can_cv && prob.cols[c] > 0) {
        double m = 0;
        for (std::size_t k = 0; k < KK; ++k) m += fit_grid.fold_rmse(k, c, l);
        m /= static_cast<double>(KK);
        double s2 = 0;
        for (std::size_t k = 0; k < KK; ++k) {
          const double q = fit_grid.fold_rmse(k, c, l);
          s2 += (q - m) * (q - m);
        }
        cell.cv_rmse = m;
        cell.cv_se = KK > 1 ? std::sqrt(s2 / static_cast<double>(KK - 1)) /
                                  std::sqrt(static_cast<double>(KK))
                            : 0.0;
      }
      cell.train_rmse = fit_grid.train_rmse(c, l);
      sel.grid.push_back(cell);
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
  const std::size_t ci = static_cast<std::size_t>(best) / L;
  const Candidate& chosen = scored[ci];
  cal.lambda = sel.grid[static_cast<std::size_t>(best)].lambda;

  // Final fit on all training points.
  const std::vector<Term> cols = design_terms(chosen.terms);
  std::vector<double> coef;  // per model term
  if (cols.empty()) {
    Eigen::VectorXd vt(static_cast<Eigen::Index>(prob.train.size()));
    for (std::size_t i = 0; i < prob.train.size(); ++i)
      vt(static_cast<Eigen::Index>(i)) = v[prob.train[i]];
    coef = {vt.mean()};
    model.terms = {Term{0, 0}};
    cal.condition_number = 1.0;
  } else {
    Eigen::VectorXd b;
    double b0 = 0.0;
    const Status st = fit_grid.solve(ci, cal.lambda, b, b0, cal.condition_number);
    if (!st.ok) {
      out.status = st;
      return out;
    }
    if (centred || origin) {
      model.terms.push_back(Term{0, 0});
      if (origin) {
        long double s = 0;
        for (std::size_t q = 0; q < cols.size(); ++q)
          s += static_cast<long double>(b(static_cast<Eigen::Index>(q))) * origin_row[q];
        b0 = static_cast<double>(-s);
      }
      coef.push_back(b0);
    }
    for (std::size_t q = 0; q < cols.size(); ++q) {
      model.terms.push_back(cols[q]);
      coef.push_back(b(static_cast<Eigen::Index>(q)));
    }
  }

  // Held-out predictions of the chosen cell, in reference units.
  std::vector<double> cv_pred(n, kNaN);
  if (can_cv && !cols.empty()) {
    fit_grid.held_out(ci, cal.lambda, cv_pred);
    for (double& p : cv_pred)
      if (!std::isnan(p)) p = tr.output_inverse(p);
  }

  // Back to reference units (exact: powers of two).
  if (y_exp != 0) {
    for (double& c : coef) c = std::ldexp(c, y_exp);
    for (double& p : cv_pred) p = std::ldexp(p, y_exp);
    for (GridCell& c : sel.grid) {
      c.cv_rmse = std::ldexp(c.cv_rmse, y_exp);
      c.cv_se = std::ldexp(c.cv_se, y_exp);
      c.train_rmse = std::ldexp(c.train_rmse, y_exp);
    }
  }
  for (double c : coef)
    if (!std::isfinite(c)) {
      out.status = Status::failure(
          "the fit produced a non-finite coefficient; the data are too extreme for this model "
          "(lower the degree, use lambda > 0, or rescale the columns)");
      return out;
    }
  model.coefficients = coef;
  cal.model = std::move(model);  // every fit (the one-input polynomial: its N = 1 case)
  if (comp.aux && data.columns.aux_setpoint_column.empty()) cal.aux_step = comp.aux_step;
  assert(is_extended(cal) == comp.active());

  // Points and metrics.
  std::vector<double> tr_ref, tr_pred, va_ref, va_pred, te_ref, te_pred;
  for (std::size_t r = 0; r < n; ++r) {
    PointResult p;
    p.line = data.rows[r].line;
    p.setpoint = data.rows[r].setpoint;
    p.reading = x[r];
    p.reference = data.rows[r].reference;
    p.aux = comp.aux ? a[r] : kNaN;
    p.predicted = cal.model.eval(x[r], a[r]);
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
          Status::failure(fmt::format("line {}: the fitted model gives a non-finite value at "
                                      "reading {}; the data are too extreme for this "
                                      "model (lower the degree, or rescale the columns)",
                                      p.line, p.reading));
      return out;
    }
    cal.points.push_back(std::move(p));
  }
  const int predictors = static_cast<int>(cols.size());
  cal.training = compute_metrics(tr_ref, tr_pred, predictors, centred);
  cal.validation = compute_metrics(va_ref, va_pred, predictors, centred);
  cal.test = compute_metrics(te_ref, te_pred, predictors, centred);
  return out;
}

}  // namespace ridgecal
