#include "ridgecal/diagnostics.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <map>
#include <stdexcept>

#include "json_read.hpp"
#include "ridgecal/lack_of_fit.hpp"
#include "ridgecal/surface_uncertainty.hpp"

namespace ridgecal {

namespace {
constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

struct CodeName {
  DiagnosticCode code;
  const char* name;
};
constexpr CodeName kCodes[] = {
    {DiagnosticCode::TestMuchWorseThanValidation, "test-much-worse-than-validation"},
    {DiagnosticCode::DegreeAtGridEdge, "degree-at-grid-edge"},
    {DiagnosticCode::LambdaAtGridEdge, "lambda-at-grid-edge"},
    {DiagnosticCode::FewSetpointsPerCoefficient, "few-setpoints-per-coefficient"},
    {DiagnosticCode::RangeNotCovered, "range-not-covered"},
    {DiagnosticCode::CoverageGap, "coverage-gap"},
    {DiagnosticCode::Outlier, "outlier"},
    {DiagnosticCode::ResidualPattern, "residual-pattern"},
    {DiagnosticCode::NonMonotonic, "non-monotonic"},
    {DiagnosticCode::Hysteresis, "hysteresis"},
    {DiagnosticCode::HighConditionNumber, "high-condition-number"},
    {DiagnosticCode::Extrapolation, "extrapolation"},
    {DiagnosticCode::RecordModified, "record-modified"},
    {DiagnosticCode::ValidationMuchWorseThanTraining, "validation-much-worse-than-training"},
    {DiagnosticCode::LackOfFit, "lack-of-fit"},
    {DiagnosticCode::DriftBetweenRepeats, "drift-between-repeats"},
};

std::string line_list(const std::vector<std::size_t>& lines, std::size_t max_shown = 8) {
  std::string s;
  for (std::size_t i = 0; i < lines.size() && i < max_shown; ++i)
    s += (i ? ", " : "") + std::to_string(lines[i]);
  if (lines.size() > max_shown) s += fmt::format(" and {} more", lines.size() - max_shown);
  return s;
}

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
}  // namespace

std::string to_string(DiagnosticCode c) {
  for (const CodeName& cn : kCodes)
    if (cn.code == c) return cn.name;
  return "unknown";
}

DiagnosticCode diagnostic_code_from_string(const std::string& s) {
  for (const CodeName& cn : kCodes)
    if (s == cn.name) return cn.code;
  throw std::invalid_argument("unknown diagnostic code '" + s + "'");
}

std::vector<DiagnosticCode> all_diagnostic_codes() {
  std::vector<DiagnosticCode> v;
  for (const CodeName& cn : kCodes) v.push_back(cn.code);
  return v;
}

std::string DiagnosticOptions::validate() const {
  if (!(std::isfinite(test_validation_ratio) && test_validation_ratio > 1.0))
    return fmt::format("test_validation_ratio is {}; it must be a finite number > 1",
                       test_validation_ratio);
  if (!(std::isfinite(cv_training_ratio) && cv_training_ratio > 1.0))
    return fmt::format("cv_training_ratio is {}; it must be a finite number > 1",
                       cv_training_ratio);
  if (!(std::isfinite(min_setpoints_per_coefficient) && min_setpoints_per_coefficient >= 0.0))
    return fmt::format("min_setpoints_per_coefficient is {}; it must be a finite number >= 0",
                       min_setpoints_per_coefficient);
  if (!(coverage_end_fraction >= 0.0 && coverage_end_fraction <= 0.5))
    return fmt::format("coverage_end_fraction is {}; it must be between 0 and 0.5",
                       coverage_end_fraction);
  if (!(std::isfinite(gap_factor) && gap_factor > 1.0))
    return fmt::format("gap_factor is {}; it must be a finite number > 1", gap_factor);
  if (!(std::isfinite(outlier_limit) && outlier_limit > 0.0))
    return fmt::format("outlier_limit is {}; it must be a finite number > 0", outlier_limit);
  if (!(std::isfinite(runs_z) && runs_z > 0.0))
    return fmt::format("runs_z is {}; it must be a finite number > 0", runs_z);
  if (runs_min_setpoints < 4)
    return fmt::format("runs_min_setpoints is {}; it must be >= 4", runs_min_setpoints);
  if (!(condition_limit > 1.0))
    return fmt::format("condition_limit is {}; it must be > 1", condition_limit);
  for (const auto& [name, v] :
       {std::pair<const char*, double>{"lack_of_fit_alpha", lack_of_fit_alpha},
        {"outlier_alpha", outlier_alpha},
        {"drift_alpha", drift_alpha},
        {"test_alpha", test_alpha}})
    if (!(v > 0.0 && v < 1.0))
      return fmt::format("{} is {}; it must be between 0 and 1 (exclusive)", name, v);
  if (!(std::isfinite(min_spare_setpoints) && min_spare_setpoints >= 0.0))
    return fmt::format("min_spare_setpoints is {}; it must be a finite number >= 0",
                       min_spare_setpoints);
  if (std::isnan(span_low) != std::isnan(span_high))
    return "span_low and span_high go together; give both or neither";
  if (has_span() && !(span_high > span_low))
    return fmt::format("span is {}..{}; span_high must be greater than span_low", span_low,
                       span_high);
  return {};
}

std::vector<Warning> check_test_vs_validation(const Calibration& cal, const DiagnosticOptions& o) {
  const Metrics& t = cal.test;
  const Metrics& v = cal.validation;
  if (t.empty() || v.empty() || !(std::isfinite(t.rmse) && std::isfinite(v.rmse)) ||
      !(v.rmse > 0.0))
    return {};
  const double ratio = t.rmse / v.rmse;
  if (!(ratio > o.test_validation_ratio)) return {};
  return {make(
      DiagnosticCode::TestMuchWorseThanValidation,
      fmt::format(
          "The test RMSE ({:.3g}) is {:.1f} times the validation RMSE ({:.3g}): the model may be "
          "overfitted, or the test points differ from the training points (a leak, a drift, or "
          "setpoints unlike the others).",
          t.rmse, ratio, v.rmse),
      {}, ratio)};
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

std::vector<Warning> check_grid_edges(const Calibration& cal) {
  const SelectionInfo& s = cal.selection;
  std::vector<Warning> out;
  if (s.mode != SelectionMode::CrossValidation || s.chosen < 0) return out;
  const GridCell& c = s.grid[static_cast<std::size_t>(s.chosen)];
  if (s.degrees.size() > 1) {
    const int lo = *std::min_element(s.degrees.begin(), s.degrees.end());
    const int hi = *std::max_element(s.degrees.begin(), s.degrees.end());
    if (c.degree == hi)
      out.push_back(make(
          DiagnosticCode::DegreeAtGridEdge,
          fmt::format("The chosen degree {} is the highest candidate: a higher degree might fit "
                      "better; widen --degrees and refit.",
                      c.degree),
          {}, c.degree));
    else if (c.degree == lo && lo > 1)
      out.push_back(
          make(DiagnosticCode::DegreeAtGridEdge,
               fmt::format(
                   "The chosen degree {} is the lowest candidate: a lower degree might do as well; "
                   "widen --degrees and refit.",
                   c.degree),
               {}, c.degree));
  }
  if (s.lambdas.size() > 1) {
    const double lo = s.lambdas.front(), hi = s.lambdas.back();
    if (c.lambda == hi)
      out.push_back(
          make(DiagnosticCode::LambdaAtGridEdge,
               fmt::format(
                   "The chosen lambda {:g} is the largest candidate: the curve is shrunk as far as "
                   "the grid allows; widen --lambdas or lower the degree.",
                   c.lambda),
               {}, c.lambda));
    else if (c.lambda == lo && lo > 0.0)
      out.push_back(make(
          DiagnosticCode::LambdaAtGridEdge,
          fmt::format("The chosen lambda {:g} is the smallest candidate and the grid has no 0: a "
                      "smaller penalty might fit better; widen --lambdas.",
                      c.lambda),
          {}, c.lambda));
  }
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

std::vector<Warning> check_setpoints_per_coefficient(const Calibration& cal,
                                                     const DiagnosticOptions& o) {
  std::size_t ntr = 0;
  for (const SetpointResult& sp : cal.setpoints)
    if (sp.role == SetRole::Train) ++ntr;
  if (cal.surface) {
    // Extended fits: training setpoint groups per model term.
    const std::size_t terms = cal.surface->terms.size();
    if (terms == 0) return {};
    const double per = static_cast<double>(ntr) / static_cast<double>(terms);
    if (!(per < o.min_setpoints_per_coefficient)) return {};
    return {
        make(DiagnosticCode::FewSetpointsPerCoefficient,
             fmt::format("Only {} training setpoint groups for {} terms ({:.1f} per term, fewer "
                         "than {:g}): the model "
                         "between the groups is poorly constrained; add setpoints or levels of "
                         "the second input, or "
                         "use fewer terms.",
                         ntr, terms, per, o.min_setpoints_per_coefficient),
             {}, per)};
  }
  const int coefs = cal.model.degree() + (cal.intercept ? 1 : 0);
  if (coefs <= 0) return {};
  const double per = static_cast<double>(ntr) / coefs;
  if (!(per < o.min_setpoints_per_coefficient)) return {};
  return {make(
      DiagnosticCode::FewSetpointsPerCoefficient,
      fmt::format(
          "Only {} training setpoints for {} coefficients ({:.1f} per coefficient, fewer than "
          "{:g}): "
          "the curve between setpoints is poorly constrained; add setpoints or lower the degree.",
          ntr, coefs, per, o.min_setpoints_per_coefficient),
      {}, per)};
}

std::vector<Warning> check_coverage(const Calibration& cal, const DiagnosticOptions& o) {
  std::vector<Warning> out;
  // All setpoints, training and test: a test setpoint inside a gap checks the curve there.
  std::vector<const SetpointResult*> tr;
  for (const SetpointResult& sp : cal.setpoints) tr.push_back(&sp);
  std::sort(tr.begin(), tr.end(), [](const SetpointResult* a, const SetpointResult* b) {
    return a->mean_reading < b->mean_reading;
  });
  if (tr.size() < 2) return out;
  if (o.has_span()) {
    double rmin = tr.front()->mean_reference, rmax = rmin;
    for (const SetpointResult* sp : tr) {
      rmin = std::min(rmin, sp->mean_reference);
      rmax = std::max(rmax, sp->mean_reference);
    }
    const double slack = o.coverage_end_fraction * (o.span_high - o.span_low);
    if (rmin > o.span_low + slack || rmax < o.span_high - slack)
      out.push_back(
          make(DiagnosticCode::RangeNotCovered,
               fmt::format(
                   "The setpoints cover references {:g}..{:g} but the declared span is {:g}..{:g}: "
                   "outside the covered part the curve is an extrapolation; add setpoints near the "
                   "span ends.",
                   rmin, rmax, o.span_low, o.span_high),
               {}, (rmax - rmin) / (o.span_high - o.span_low)));
  }
  if (tr.size() >= 3) {
    const double range = tr.back()->mean_reading - tr.front()->mean_reading;
    const double mean_gap = range / static_cast<double>(tr.size() - 1);
    double worst = 0;
    std::size_t at = 0;
    for (std::size_t i = 1; i < tr.size(); ++i) {
      const double g = tr[i]->mean_reading - tr[i - 1]->mean_reading;
      if (g > worst) {
        worst = g;
        at = i;
      }
    }
    if (mean_gap > 0 && worst > o.gap_factor * mean_gap)
      out.push_back(
          make(DiagnosticCode::CoverageGap,
               fmt::format(
                   "There is a gap in coverage between setpoints '{}' and '{}' (readings {:g} to "
                   "{:g}), {:.1f} times the mean spacing: the curve is poorly constrained there; "
                   "add a setpoint inside the gap.",
                   tr[at - 1]->id, tr[at]->id, tr[at - 1]->mean_reading, tr[at]->mean_reading,
                   worst / mean_gap),
               {}, worst / mean_gap));
  }
  return out;
}

namespace {
// check_outliers of an extended fit: residuals in the fitted output v.
std::vector<Warning> extended_outliers(const Calibration& cal, const DiagnosticOptions& o) {
  std::vector<Warning> out;
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
}  // namespace

std::vector<Warning> check_outliers(const Calibration& cal, const DiagnosticOptions& o) {
  if (cal.surface) return extended_outliers(cal, o);
  std::vector<Warning> out;
  const FitCovariance cov(cal);
  const double s = cov.residual_sd();
  const double dof = cov.dof();
  if (!(std::isfinite(s) && s > 0.0) || dof < 2.0) return out;
  for (const PointResult& p : cal.points) {
    if (p.role != SetRole::Train) continue;
    const double h = std::min(cov.leverage(p.reading), 1.0 - 1e-12);
    const double r = p.error / (s * std::sqrt(1.0 - h));  // internally studentized
    const double denom = dof - r * r;
    if (!(denom > 1e-12)) continue;
    const double t = r * std::sqrt((dof - 1.0) / denom);  // externally studentized
    if (std::fabs(t) > o.outlier_limit)
      out.push_back(make(
          DiagnosticCode::Outlier,
          fmt::format("Line {} (setpoint '{}', reading {:g}) is an outlier: studentized residual "
                      "{:.1f} (limit {:g}); check the reading and the reference there.",
                      p.line, p.setpoint, p.reading, t, o.outlier_limit),
          {p.line}, t));
  }
  return out;
}

double runs_test_z(const std::vector<double>& values) {
  std::vector<int> signs;
  for (double v : values)
    if (v > 0)
      signs.push_back(1);
    else if (v < 0)
      signs.push_back(-1);
  double n1 = 0, n2 = 0;
  for (int sg : signs) (sg > 0 ? n1 : n2) += 1;
  if (n1 < 2 || n2 < 2) return kNaN;
  double runs = 1;
  for (std::size_t i = 1; i < signs.size(); ++i)
    if (signs[i] != signs[i - 1]) runs += 1;
  const double n = n1 + n2;
  const double mu = 2 * n1 * n2 / n + 1;
  const double var = 2 * n1 * n2 * (2 * n1 * n2 - n) / (n * n * (n - 1));
  if (!(var > 0)) return kNaN;
  return (runs - mu) / std::sqrt(var);
}

std::vector<Warning> check_residual_runs(const Calibration& cal, const DiagnosticOptions& o) {
  // Mean residual per training setpoint, in order of reading (repeats at one
  // setpoint would otherwise form runs of their own).
  std::map<std::string, std::pair<double, int>> by_id;
  for (const PointResult& p : cal.points)
    if (p.role == SetRole::Train) {
      auto& e = by_id[p.setpoint];
      e.first += p.error;
      e.second += 1;
    }
  std::vector<double> seq;
  for (const SetpointResult& sp : cal.setpoints) {
    const auto it = by_id.find(sp.id);
    if (sp.role == SetRole::Train && it != by_id.end())
      seq.push_back(it->second.first / it->second.second);
  }
  if (seq.size() < o.runs_min_setpoints) return {};
  const double z = runs_test_z(seq);
  if (!(z < -o.runs_z)) return {};
  double rms = 0;
  for (double v : seq) rms += v * v;
  rms = std::sqrt(rms / static_cast<double>(seq.size()));
  return {make(
      DiagnosticCode::ResidualPattern,
      fmt::format(
          "The residuals of the {} training setpoints (RMS {:.3g}) change sign less often than "
          "chance allows (runs test z = {:.2f}): a systematic pattern, a sign that the curve "
          "underfits; consider a higher degree or a smaller lambda.",
          seq.size(), rms, z),
      {}, z)};
}

std::vector<Warning> check_monotonic(const PolyModel& model) {
  const Scaling& sc = model.scaling;
  const int m = 2000;
  double dmax = 0;
  std::vector<double> d(m + 1);
  for (int i = 0; i <= m; ++i) {
    d[static_cast<std::size_t>(i)] = model.derivative(sc.x_min + (sc.x_max - sc.x_min) * i / m);
    dmax = std::max(dmax, std::fabs(d[static_cast<std::size_t>(i)]));
  }
  if (!(dmax > 0)) return {};
  const double tiny = 1e-9 * dmax;
  int sign = 0;
  for (int i = 0; i <= m; ++i) {
    const double v = d[static_cast<std::size_t>(i)];
    if (std::fabs(v) <= tiny) continue;
    const int sg = v > 0 ? 1 : -1;
    if (sign != 0 && sg != sign) {
      const double x = sc.x_min + (sc.x_max - sc.x_min) * i / m;
      return {make(
          DiagnosticCode::NonMonotonic,
          fmt::format(
              "The curve is not monotonic over the calibrated range: its slope changes sign near "
              "reading {:g}, so one calibrated value can come from two readings (a problem when "
              "firmware inverts the curve); lower the degree or raise lambda.",
              x),
          {}, x)};
    }
    sign = sg;
  }
  return {};
}

std::vector<Warning> check_hysteresis(const Dataset& data, const Calibration& cal,
                                      const UncertaintyBudget& uncertainty,
                                      const ToleranceSpec* tolerance) {
  (void)uncertainty;
  if (!tolerance || data.rows.size() != cal.points.size()) return {};
  if (cal.surface && cal.surface->has_aux) {
    // Key the setpoints by aux level, then judge them as in one input.
    Calibration keyed = cal;
    keyed.surface->has_aux = false;
    for (std::size_t i = 0; i < data.rows.size(); ++i) {
      const Observation& ob = data.rows[i];
      const double step = cal.aux_step > 0.0 ? cal.aux_step : 1.0;
      const std::string level = !ob.aux_setpoint.empty()
                                    ? ob.aux_setpoint
                                    : fmt::format("{:g}", std::round(ob.aux / step) * step + 0.0);
      keyed.points[i].setpoint += " @ aux " + level;
    }
    return check_hysteresis(data, keyed, uncertainty, tolerance);
  }
  struct Acc {
    double up = 0, down = 0, ref = 0, reading = 0;
    int nu = 0, nd = 0;
    std::vector<std::size_t> lines;
  };
  std::map<std::string, Acc> acc;
  std::vector<std::string> order;
  for (std::size_t i = 0; i < data.rows.size(); ++i) {
    const Observation& ob = data.rows[i];
    if (ob.direction == SweepDirection::Unspecified) continue;
    const PointResult& p = cal.points[i];
    if (!acc.count(p.setpoint)) order.push_back(p.setpoint);
    Acc& a = acc[p.setpoint];
    (ob.direction == SweepDirection::Up ? a.up : a.down) += p.error;
    (ob.direction == SweepDirection::Up ? a.nu : a.nd) += 1;
    a.ref += p.reference;
    a.reading += p.reading;
    a.lines.push_back(p.line);
  }
  std::size_t exceeded = 0, paired = 0;
  double worst_ratio = 0, worst_diff = 0, worst_limit = 0;
  std::string worst_id;
  std::vector<std::size_t> worst_lines;
  for (const std::string& id : order) {
    const Acc& a = acc[id];
    if (a.nu == 0 || a.nd == 0) continue;
    ++paired;
    const int cnt = a.nu + a.nd;
    const double diff = a.up / a.nu - a.down / a.nd;
    const double limit = tolerance->limit(a.ref / cnt);
    if (!(limit > 0)) continue;
    const double ratio = std::fabs(diff) / limit;
    if (ratio > 1.0) ++exceeded;
    if (ratio > worst_ratio) {
      worst_ratio = ratio;
      worst_diff = diff;
      worst_limit = limit;
      worst_id = id;
      worst_lines = a.lines;
    }
  }
  if (exceeded == 0) return {};
  return {make(
      DiagnosticCode::Hysteresis,
      fmt::format(
          "Hysteresis: at {} of {} setpoints measured in both directions the up and down sweeps "
          "differ by more than the tolerance; worst at setpoint '{}', up minus down = {:.3g} "
          "against {:.3g}. "
          "One curve cannot serve both directions within the tolerance.",
          exceeded, paired, worst_id, worst_diff, worst_limit),
      worst_lines, worst_ratio)};
}

std::vector<Warning> check_condition(const Calibration& cal, const DiagnosticOptions& o) {
  if (!(cal.condition_number > o.condition_limit)) return {};
  return {make(
      DiagnosticCode::HighConditionNumber,
      fmt::format(
          "The fit's design has condition number {:.3g} (above {:.3g}): the coefficients are "
          "sensitive to small changes in the data; lower the degree, raise lambda or spread the "
          "setpoints.",
          cal.condition_number, o.condition_limit),
      {}, cal.condition_number)};
}

std::vector<Warning> check_extrapolation(const std::vector<double>& readings,
                                         const std::vector<std::size_t>& lines,
                                         const Scaling& range, const std::string& what) {
  std::vector<std::size_t> outside;
  double worst = 0;
  const double hw = range.half_width();
  for (std::size_t i = 0; i < readings.size(); ++i)
    if (!range.contains(readings[i])) {
      outside.push_back(i < lines.size() ? lines[i] : 0);
      worst = std::max(worst, std::fabs(range.to_t(readings[i])) - 1.0);
    }
  if (outside.empty()) return {};
  return {make(
      DiagnosticCode::Extrapolation,
      fmt::format(
          "{} {} lie outside the calibrated reading range {:g}..{:g} (lines {}), up to {:.3g} "
          "reading units beyond it: there the curve is an extrapolation and the uncertainty is not "
          "valid.",
          outside.size(), what, range.x_min, range.x_max, line_list(outside), worst * hw),
      outside, worst * hw)};
}

std::vector<Warning> check_extrapolation(const SurfaceModel& m, const std::vector<double>& readings,
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

std::vector<Warning> diagnose_fit(const Dataset& data, const Calibration& cal,
                                  const UncertaintyBudget& uncertainty,
                                  const ToleranceSpec* tolerance,
                                  const DiagnosticOptions& options) {
  std::vector<Warning> out;
  // Issue 13: the calibrated checks of lack_of_fit.hpp replace the fixed-limit
  // test-vs-validation, grid-edge, setpoints-per-coefficient and outlier checks.
  const LackOfFit lof = lack_of_fit_test(data, cal, options.lack_of_fit_alpha);
  if (cal.surface) {
    append(out, check_test_vs_validation_f(cal, options));
    append(out, check_cv_vs_training(cal, options));
    append(out, check_grid_edges_feasible(cal, &lof));
    append(out, check_spare_setpoints(cal, options));
    append(out, check_outliers_bonferroni(data, cal, options));
    append(out, check_lack_of_fit(lof));
    append(out, check_repeat_drift(data, cal, options));
    append(out, check_condition(cal, options));
    std::vector<double> xs, as;
    std::vector<std::size_t> ls;
    for (const PointResult& p : cal.points)
      if (p.role == SetRole::Test) {
        xs.push_back(p.reading);
        as.push_back(p.aux);
        ls.push_back(p.line);
      }
    append(out, check_extrapolation(*cal.surface, xs, as, ls, "test points"));
    append(out, check_hysteresis(data, cal, uncertainty, tolerance));
    return out;
  }
  append(out, check_test_vs_validation_f(cal, options));
  append(out, check_grid_edges_feasible(cal, &lof));
  append(out, check_spare_setpoints(cal, options));
  append(out, check_coverage(cal, options));
  append(out, check_outliers_bonferroni(data, cal, options));
  append(out, check_lack_of_fit(lof));
  append(out, check_repeat_drift(data, cal, options));
  append(out, check_residual_runs(cal, options));
  append(out, check_monotonic(cal.model));
  append(out, check_hysteresis(data, cal, uncertainty, tolerance));
  append(out, check_condition(cal, options));
  std::vector<double> xs;
  std::vector<std::size_t> ls;
  for (const PointResult& p : cal.points)
    if (p.role == SetRole::Test) {
      xs.push_back(p.reading);
      ls.push_back(p.line);
    }
  append(out, check_extrapolation(xs, ls, cal.model.scaling, "check points"));
  return out;
}

nlohmann::json to_json(const Warning& w) {
  nlohmann::json j{{"code", to_string(w.code)}, {"message", w.message}};
  if (!w.lines.empty()) j["lines"] = w.lines;
  if (std::isfinite(w.value)) j["value"] = w.value;
  return j;
}

nlohmann::json to_json(const std::vector<Warning>& ws) {
  nlohmann::json a = nlohmann::json::array();
  for (const Warning& w : ws) a.push_back(to_json(w));
  return a;
}

std::vector<Warning> warnings_from_json(const nlohmann::json& j, const std::string& file) {
  const detail::JsonReader r{file};
  if (!j.is_array()) r.fail("warnings", "is not an array");
  std::vector<Warning> out;
  for (const nlohmann::json& e : j) {
    Warning w;
    w.code = r.enum_value(e, "code", "warnings[]", diagnostic_code_from_string);
    w.message = r.text(e, "message", "warnings[]");
    if (e.contains("lines"))
      for (const nlohmann::json& l : r.array(e, "lines", "warnings[]")) {
        if (!l.is_number_unsigned())
          r.fail("warnings[].lines", "holds a value that is not a line number");
        w.lines.push_back(l.get<std::size_t>());
      }
    if (e.contains("value")) w.value = r.number(e, "value", "warnings[]");
    out.push_back(std::move(w));
  }
  return out;
}

std::string format_warnings(const std::vector<Warning>& ws) {
  std::string s;
  for (const Warning& w : ws) s += fmt::format("warning [{}]: {}\n", to_string(w.code), w.message);
  return s;
}

}  // namespace ridgecal
