#include "ridgecal/surface_assessment.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cassert>
#include <cmath>
#include <limits>

namespace ridgecal {

namespace {
constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

Warning make(DiagnosticCode c, std::string msg, std::vector<std::size_t> lines = {},
             double value = kNaN) {
  Warning w;
  w.code = c;
  w.message = std::move(msg);
  w.lines = std::move(lines);
  w.value = value;
  return w;
}

void append(std::vector<Warning>& to, std::vector<Warning> from) {
  for (Warning& w : from) to.push_back(std::move(w));
}

std::string line_list(const std::vector<std::size_t>& lines, std::size_t max_shown = 8) {
  std::string s;
  for (std::size_t i = 0; i < lines.size() && i < max_shown; ++i)
    s += (i ? ", " : "") + std::to_string(lines[i]);
  if (lines.size() > max_shown) s += fmt::format(" and {} more", lines.size() - max_shown);
  return s;
}
}  // namespace

std::string surface_assessment_unsupported(const AssessmentOptions&) {
  return {};
}

std::vector<Warning> check_cv_vs_training(const Calibration& cal, const DiagnosticOptions& o) {
  const Metrics& v = cal.validation;
  const Metrics& t = cal.training;
  if (v.empty() || t.empty() || !(std::isfinite(v.rmse) && std::isfinite(t.rmse)) ||
      !(t.rmse > 0.0))
    return {};
  const double ratio = v.rmse / t.rmse;
  if (!(ratio > o.cv_training_ratio)) return {};
  return {make(
      DiagnosticCode::ValidationMuchWorseThanTraining,
      fmt::format(
          "The validation (cross-validated) RMSE ({:.3g}) is {:.1f} times the training RMSE "
          "({:.3g}): "
          "the model follows the training points more closely than it predicts points it has not "
          "seen (overfit); use fewer terms, a larger lambda or more setpoints.",
          v.rmse, ratio, t.rmse),
      {}, ratio)};
}

std::vector<Warning> check_surface_grid_edges(const Calibration& cal) {
  std::vector<Warning> out;
  const SelectionInfo& s = cal.selection;
  if (s.mode != SelectionMode::CrossValidation || s.chosen < 0) return out;
  const GridCell& c = s.grid[static_cast<std::size_t>(s.chosen)];
  // Degree and lambda as in 1-D (with --powers the degree is fixed, one candidate).
  for (Warning& w : check_grid_edges(cal)) out.push_back(std::move(w));
  if (s.aux_degrees.size() > 1 && c.aux_degree >= 0) {
    const int hi = *std::max_element(s.aux_degrees.begin(), s.aux_degrees.end());
    if (c.aux_degree == hi)
      out.push_back(make(
          DiagnosticCode::DegreeAtGridEdge,
          fmt::format(
              "The chosen aux degree {} is the highest candidate: a higher degree in the second "
              "input might fit better; widen --aux-degree and refit.",
              c.aux_degree),
          {}, c.aux_degree));
  }
  return out;
}

std::vector<Warning> check_groups_per_term(const Calibration& cal, const DiagnosticOptions& o) {
  std::size_t ntr = 0;
  for (const SetpointResult& sp : cal.setpoints)
    if (sp.role == SetRole::Train) ++ntr;
  const std::size_t terms = cal.surface ? cal.surface->terms.size() : 0;
  if (terms == 0) return {};
  const double per = static_cast<double>(ntr) / static_cast<double>(terms);
  if (!(per < o.min_setpoints_per_coefficient)) return {};
  return {make(DiagnosticCode::FewSetpointsPerCoefficient,
               fmt::format("Only {} training setpoint groups for {} terms ({:.1f} per term, fewer "
                           "than {:g}): the model "
                           "between the groups is poorly constrained; add setpoints or levels of "
                           "the second input, or "
                           "use fewer terms.",
                           ntr, terms, per, o.min_setpoints_per_coefficient),
               {}, per)};
}

std::vector<Warning> check_surface_outliers(const Calibration& cal, const DiagnosticOptions& o) {
  std::vector<Warning> out;
  if (!cal.surface) return out;
  const SurfaceCovariance cov(cal);
  const double s = cov.residual_sd_fitted();
  const double dof = cov.dof();
  if (!(std::isfinite(s) && s > 0.0) || dof < 2.0) return out;
  const SurfaceModel& m = *cal.surface;
  for (const PointResult& p : cal.points) {
    if (p.role != SetRole::Train) continue;
    const double e =
        m.eval_fitted(m.transforms.input(p.reading), p.aux) - m.transforms.output(p.reference);
    const double h = std::min(cov.leverage(p.reading, p.aux), 1.0 - 1e-12);
    if (!(std::isfinite(e) && std::isfinite(h))) continue;
    const double r = e / (s * std::sqrt(1.0 - h));  // internally studentized
    const double denom = dof - r * r;
    if (!(denom > 1e-12)) continue;
    const double t = r * std::sqrt((dof - 1.0) / denom);  // externally studentized
    if (std::fabs(t) > o.outlier_limit)
      out.push_back(make(
          DiagnosticCode::Outlier,
          fmt::format(
              "Line {} (setpoint '{}', reading {:g}{}) is an outlier: studentized residual {:.1f} "
              "(limit {:g}); check the reading and the reference there.",
              p.line, p.setpoint, p.reading,
              m.has_aux ? fmt::format(", aux {:g}", p.aux) : std::string(), t, o.outlier_limit),
          {p.line}, t));
  }
  return out;
}

std::vector<Warning> check_surface_extrapolation(const SurfaceModel& m,
                                                 const std::vector<double>& readings,
                                                 const std::vector<double>& aux,
                                                 const std::vector<std::size_t>& lines,
                                                 const std::string& what) {
  std::vector<std::size_t> out_reading, out_aux;
  double worst = 0.0;  // in half-widths of the scaled input beyond [-1, 1]
  for (std::size_t i = 0; i < readings.size(); ++i) {
    const std::size_t line = i < lines.size() ? lines[i] : 0;
    const double u = m.transforms.input(readings[i]);
    if (!std::isfinite(u) || !m.input.contains(u)) {
      out_reading.push_back(line);
      if (std::isfinite(u)) worst = std::max(worst, std::fabs(m.input.to_scaled(u)) - 1.0);
    }
    if (m.has_aux && i < aux.size() && !m.aux.contains(aux[i])) {
      out_aux.push_back(line);
      if (std::isfinite(aux[i])) worst = std::max(worst, std::fabs(m.aux.to_scaled(aux[i])) - 1.0);
    }
  }
  if (out_reading.empty() && out_aux.empty()) return {};
  std::vector<std::size_t> all = out_reading;
  all.insert(all.end(), out_aux.begin(), out_aux.end());
  std::sort(all.begin(), all.end());
  all.erase(std::unique(all.begin(), all.end()), all.end());
  std::string parts;
  if (!out_reading.empty())
    parts += fmt::format("{} outside the calibrated reading range {:g}..{:g}{} (lines {})",
                         out_reading.size(), m.input.min, m.input.max,
                         m.transforms.identity() ? "" : " (transformed)", line_list(out_reading));
  if (!out_aux.empty())
    parts += fmt::format("{}{} outside the calibrated aux range {:g}..{:g} (lines {})",
                         parts.empty() ? "" : "; ", out_aux.size(), m.aux.min, m.aux.max,
                         line_list(out_aux));
  return {make(DiagnosticCode::Extrapolation,
               fmt::format("{} {} lie outside the calibrated region: {}; up to {:.3g} half-widths "
                           "beyond it. There the "
                           "model is an extrapolation and the uncertainty is not valid.",
                           all.size(), what, parts, worst),
               all, worst)};
}

std::vector<Warning> diagnose_surface_fit(const Calibration& cal,
                                          const DiagnosticOptions& options) {
  assert(cal.surface);
  std::vector<Warning> out;
  append(out, check_test_vs_validation(cal, options));
  append(out, check_cv_vs_training(cal, options));
  append(out, check_surface_grid_edges(cal));
  append(out, check_groups_per_term(cal, options));
  append(out, check_surface_outliers(cal, options));
  append(out, check_condition(cal, options));
  std::vector<double> xs, as;
  std::vector<std::size_t> ls;
  for (const PointResult& p : cal.points)
    if (p.role == SetRole::Test) {
      xs.push_back(p.reading);
      as.push_back(p.aux);
      ls.push_back(p.line);
    }
  append(out, check_surface_extrapolation(*cal.surface, xs, as, ls, "test points"));
  return out;
}

Assessment assess_surface_calibration(const Calibration& cal, const AssessmentOptions& options) {
  assert(cal.surface && options.validate().empty());
  Assessment a;
  const SurfaceUncertainty unc(cal, options.uncertainty);
  a.uncertainty = unc.budget();
  if (options.tolerance) {
    ToleranceSpec tol = *options.tolerance;
    resolve_span(tol, cal, options.diagnostics);
    a.tolerance = tol;
    std::vector<PointToJudge> pts;
    for (const PointResult& p : cal.points)
      pts.push_back({p.line, p.role == SetRole::Train ? "training" : "test", p.reference, p.error,
                     unc.expanded_at(p.reading, p.aux)});
    for (const PointResult& p : cal.points)
      if (p.role == SetRole::Train && std::isfinite(p.cv_predicted))
        pts.push_back({p.line, "validation", p.reference, p.cv_predicted - p.reference,
                       unc.expanded_at(p.reading, p.aux)});
    if (tol.validate().empty()) a.decision = judge(pts, tol, options.rule, {"validation"});
  }
  a.warnings = diagnose_surface_fit(cal, options.diagnostics);
  return a;
}

}  // namespace ridgecal

namespace ridgecal {

std::vector<Warning> check_surface_hysteresis(const Dataset& data, const Calibration& cal,
                                              const ToleranceSpec* tolerance) {
  if (!tolerance || !cal.surface || data.rows.size() != cal.points.size()) return {};
  Calibration keyed = cal;
  if (cal.surface->has_aux)
    for (std::size_t i = 0; i < data.rows.size(); ++i) {
      const Observation& ob = data.rows[i];
      const double step = cal.aux_step > 0.0 ? cal.aux_step : 1.0;
      const std::string level = !ob.aux_setpoint.empty()
                                    ? ob.aux_setpoint
                                    : fmt::format("{:g}", std::round(ob.aux / step) * step + 0.0);
      keyed.points[i].setpoint += " @ aux " + level;
    }
  return check_hysteresis(data, keyed, UncertaintyBudget{}, tolerance);
}

Assessment assess_surface_calibration(const Dataset& data, const Calibration& cal,
                                      const AssessmentOptions& options) {
  Assessment a;
  try {
    a = assess_surface_calibration(cal, options);
  } catch (const InputError& e) {  // e.g. a zero span: name the data file
    if (!e.file().empty()) throw;
    throw InputError(data.file, e.line(), e.message(), e.hint());
  }
  for (Warning& w : check_surface_hysteresis(data, cal, a.tolerance ? &*a.tolerance : nullptr))
    a.warnings.push_back(std::move(w));
  return a;
}

}  // namespace ridgecal
