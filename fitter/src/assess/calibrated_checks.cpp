// The warnings reworked for issue 13 so that each has a stated false-alarm
// rate on clean data (lack_of_fit.hpp; rates measured in docs/monte-carlo.md).
#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <functional>
#include <memory>
#include <sstream>

#include "ridgecal/diag_common.hpp"
#include "ridgecal/lack_of_fit.hpp"
#include "ridgecal/repeat_groups.hpp"
#include "ridgecal/uncertainty.hpp"

namespace ridgecal {

namespace {

// The repeat scatter that scales the outlier test is pooled from a reading's
// own setpoint and its nearest setpoints along the range (and the aux input)
// until it has this many degrees of freedom: six setpoints of 3 repeats, or
// twelve pairs. 12 degrees of freedom put the t limit near 5 at a 1 %
// family-wise rate over 30-70 readings, while the noise changes little across
// so few setpoints (our judgement; measured on the NTC scenarios, whose noise
// grows 4.4-fold over the range, in docs/monte-carlo.md).
constexpr double kOutlierPoolDf = 12.0;

using detail::make_warning;

}  // namespace

std::vector<Warning> check_outliers_bonferroni(const Dataset& data, const Calibration& cal,
                                               const DiagnosticOptions& o) {
  // Test setpoints too: the comparison with the other repeats does not use the curve.
  const std::vector<detail::RepeatGroup> groups = detail::training_groups(data, cal, true);
  std::vector<std::size_t> repeated, single;
  std::size_t n_tested = 0;  // independent comparisons: one per pair, one per reading otherwise
  for (std::size_t g = 0; g < groups.size(); ++g) {
    const std::size_t m = groups[g].points.size();
    if (m >= 2) {
      repeated.push_back(g);
      n_tested += m == 2 ? 1 : m;
    } else if (cal.points[groups[g].points[0]].role == SetRole::Train) {
      single.push_back(g);
    }
  }
  // Residual scale of the whole fit for readings without repeats.
  double s_fit = std::numeric_limits<double>::quiet_NaN(), dof_fit = 0.0;
  std::function<double(const PointResult&)> leverage;
  std::shared_ptr<FitCovariance> fc;
  if (!single.empty()) {
    fc = std::make_shared<FitCovariance>(cal);
    if (fc->ok()) {
      const bool aux = fc->model().has_aux;
      s_fit = fc->residual_sd_fitted();  // the residual SD itself without a reference transform
      dof_fit = fc->dof();
      leverage = [fc, aux](const PointResult& p) {
        return fc->leverage(p.reading, aux ? p.aux : 0.0);
      };
    }
    if (std::isfinite(s_fit) && s_fit > 0.0 && dof_fit >= 3.0) n_tested += single.size();
  }
  if (n_tested == 0) return {};
  const double a = o.outlier_alpha / static_cast<double>(n_tested);  // Bonferroni

  // Scaled positions of the repeated groups, for the neighbourhoods.
  double rlo = 0, rhi = 0, alo = 0, ahi = 0;
  bool first = true;
  for (std::size_t g : repeated) {
    const double r = groups[g].mean_reference, x = groups[g].mean_aux;
    if (first) {
      rlo = rhi = r;
      alo = ahi = x;
      first = false;
    }
    rlo = std::min(rlo, r);
    rhi = std::max(rhi, r);
    alo = std::min(alo, x);
    ahi = std::max(ahi, x);
  }
  const double rw = rhi > rlo ? rhi - rlo : 1.0, aw = ahi > alo ? ahi - alo : 1.0;

  std::vector<Warning> out;
  for (std::size_t g : repeated) {
    const detail::RepeatGroup& G = groups[g];
    std::vector<std::pair<double, std::size_t>> dist;
    for (std::size_t h : repeated)
      if (h != g) {
        const double dr = (groups[h].mean_reference - G.mean_reference) / rw;
        const double da = (groups[h].mean_aux - G.mean_aux) / aw;
        dist.emplace_back(dr * dr + da * da, h);
      }
    std::sort(dist.begin(), dist.end());
    double ss_nb = 0.0, df_nb = 0.0;
    const double df_own = static_cast<double>(G.points.size()) - 2.0;
    for (std::size_t k = 0; k < dist.size() && df_nb + df_own < kOutlierPoolDf; ++k) {
      ss_nb += groups[dist[k].second].ss_pure;
      df_nb += static_cast<double>(groups[dist[k].second].points.size()) - 1.0;
    }
    const double m = static_cast<double>(G.points.size());
    double worst_t = 0.0, worst_lim = 0.0;
    std::size_t worst_k = 0;
    for (std::size_t k = 0; k < G.points.size(); ++k) {
      // The other repeats of this setpoint: their mean and their own scatter.
      double mo = 0.0;
      for (std::size_t q = 0; q < G.points.size(); ++q)
        if (q != k) mo += G.residuals[q];
      mo /= m - 1.0;
      double ss_o = 0.0;
      for (std::size_t q = 0; q < G.points.size(); ++q)
        if (q != k) ss_o += (G.residuals[q] - mo) * (G.residuals[q] - mo);
      const double df = df_nb + (m - 2.0);
      if (!(df >= 1.0)) continue;
      const double s2 = (ss_nb + ss_o) / df;
      if (!(s2 > 0.0)) continue;
      const double t = (G.residuals[k] - mo) / std::sqrt(s2 * (1.0 + 1.0 / (m - 1.0)));
      const double lim = student_t_two_sided_critical(a, df);
      if (std::fabs(t) > lim && std::fabs(t) / lim > worst_t / std::max(worst_lim, 1e-300)) {
        worst_t = t;
        worst_lim = lim;
        worst_k = k;
      }
    }
    if (worst_lim > 0.0) {
      const PointResult& p = cal.points[G.points[worst_k]];
      out.push_back(make_warning(
          DiagnosticCode::Outlier,
          fmt::format("Line {} (setpoint '{}', reading {:g}) is an outlier: it departs from the "
                      "other {} repeats of its setpoint by {:.1f} times their scatter (limit "
                      "{:.2g}, a {:g} % chance over all {} comparisons on clean data); check the "
                      "reading there.",
                      p.line, G.key, p.reading, G.points.size() - 1, worst_t, worst_lim,
                      100.0 * o.outlier_alpha, n_tested),
          {p.line}, worst_t));
    }
  }
  if (leverage && std::isfinite(s_fit) && s_fit > 0.0 && dof_fit >= 3.0) {
    const double lim = student_t_two_sided_critical(a, dof_fit - 1.0);
    for (std::size_t g : single) {
      const std::size_t i = groups[g].points[0];
      const PointResult& p = cal.points[i];
      const double h = std::min(leverage(p), 1.0 - 1e-12);
      if (!std::isfinite(h)) continue;
      const double r = groups[g].residuals[0] / (s_fit * std::sqrt(1.0 - h));
      const double denom = dof_fit - r * r;
      if (!(denom > 1e-12)) continue;
      const double t = r * std::sqrt((dof_fit - 1.0) / denom);  // externally studentized
      if (std::fabs(t) > lim)
        out.push_back(make_warning(
            DiagnosticCode::Outlier,
            fmt::format("Line {} (setpoint '{}', reading {:g}) is an outlier: studentized "
                        "residual {:.1f} (limit {:.2g}, a {:g} % chance over all {} comparisons on "
                        "clean data); check the reading and the reference there.",
                        p.line, groups[g].key, p.reading, t, lim, 100.0 * o.outlier_alpha,
                        n_tested),
            {p.line}, t));
    }
  }
  return out;
}

std::vector<Warning> check_repeat_drift(const Dataset& data, const Calibration& cal,
                                        const DiagnosticOptions& o) {
  for (const Observation& ob : data.rows)
    if (ob.direction != SweepDirection::Unspecified) return {};
  const std::vector<detail::RepeatGroup> groups = detail::training_groups(data, cal);
  double sxy = 0.0, sxx = 0.0, ss_pure = 0.0, df_pure = 0.0;
  std::size_t used = 0;
  for (const detail::RepeatGroup& g : groups) {
    const std::size_t m = g.points.size();
    if (m < 2) continue;
    ++used;
    ss_pure += g.ss_pure;
    df_pure += static_cast<double>(m) - 1.0;
    for (std::size_t k = 0; k < m; ++k) {
      const double c = static_cast<double>(k) - (static_cast<double>(m) - 1.0) / 2.0;
      sxy += c * (g.residuals[k] - g.mean_residual);
      sxx += c * c;
    }
  }
  if (used == 0 || !(sxx > 0.0) || !(df_pure >= 2.0)) return {};
  const double b = sxy / sxx;  // change of the residual per repeat
  const double ss_res = ss_pure - b * b * sxx;
  const double df = df_pure - 1.0;
  if (!(ss_res > 0.0)) return {};
  const double t = b * std::sqrt(sxx) / std::sqrt(ss_res / df);
  const double p = student_t_two_sided_p(t, df);
  if (!(p < o.drift_alpha)) return {};
  return {make_warning(
      DiagnosticCode::DriftBetweenRepeats,
      fmt::format(
          "The repeats drift: at the {} setpoints with repeats, each repeat in file order is on "
          "average {:.3g} (fitted output units) {} than the one before (t = {:.2f}, p = {:.2g}, "
          "below {:g}). The sensor or the reference was not settled; the repeats' scatter then "
          "overstates the noise and hides other faults.",
          used, std::fabs(b), b > 0 ? "higher" : "lower", t, p, o.drift_alpha),
      {}, t)};
}

std::vector<Warning> check_spare_setpoints(const Calibration& cal, const DiagnosticOptions& o) {
  std::size_t ntr = 0;
  for (const SetpointResult& sp : cal.setpoints)
    if (sp.role == SetRole::Train) ++ntr;
  const std::size_t terms =
      general_model(cal).terms.size() - (is_extended(cal) || cal.intercept ? 0 : 1);
  if (terms == 0) return {};
  const double spare = static_cast<double>(ntr) - static_cast<double>(terms);
  if (!(spare < o.min_spare_setpoints)) return {};
  return {make_warning(
      DiagnosticCode::FewSetpointsPerCoefficient,
      fmt::format("Only {} training setpoints for {} coefficients ({:g} to spare, fewer than "
                  "{:g}): the curve passes through every setpoint mean and nothing in the data "
                  "checks its shape between setpoints (no degree of freedom is left for the "
                  "lack-of-fit test); add setpoints or use fewer terms.",
                  ntr, terms, spare, o.min_spare_setpoints),
      {}, spare)};
}

std::vector<Warning> check_test_vs_validation_f(const Calibration& cal,
                                                const DiagnosticOptions& o) {
  const Metrics& t = cal.test;
  const Metrics& v = cal.validation;
  if (t.empty() || v.empty() || !(std::isfinite(t.rmse) && std::isfinite(v.rmse)) ||
      !(v.rmse > 0.0))
    return {};
  double n_test = 0, n_val = 0;
  for (const SetpointResult& sp : cal.setpoints) {
    if (sp.role == SetRole::Test) n_test += 1;
    if (sp.role == SetRole::Train && sp.fold >= 0) n_val += 1;
  }
  if (n_test < 1 || n_val < 1) return {};
  const double ratio = t.rmse / v.rmse;
  const double p = f_distribution_sf(ratio * ratio, n_test, n_val);
  if (!(p < o.test_alpha)) return {};
  return {make_warning(
      DiagnosticCode::TestMuchWorseThanValidation,
      fmt::format(
          "The test RMSE ({:.3g}) is {:.1f} times the validation RMSE ({:.3g}), more than chance "
          "allows with {:g} test and {:g} validated setpoints (F test, p = {:.2g}, below {:g}): "
          "the test points differ from the training points (a wrong reference or a stuck "
          "reading at a test setpoint, a drift, or an overfit).",
          t.rmse, ratio, v.rmse, n_test, n_val, p, o.test_alpha),
      {}, ratio)};
}

std::vector<Warning> check_grid_edges_feasible(const Calibration& cal, const LackOfFit* lof) {
  std::vector<Warning> all = check_grid_edges(cal);
  // The repeats show no lack of fit: the top degree suffices, whatever CV preferred.
  const bool fit_adequate = lof && lof->computed && !(lof->p < lof->alpha);
  const SelectionInfo& s = cal.selection;
  if (s.chosen < 0) return all;
  const GridCell& c = s.grid[static_cast<std::size_t>(s.chosen)];
  // Notes of the fitter: "degree D dropped: ..." or "degree D / aux degree A dropped: ...".
  bool degree_dropped = false, aux_dropped = false;
  for (const std::string& n : s.notes) {
    if (n.find(" dropped") == std::string::npos) continue;
    int d = -1, ad = -1;
    std::istringstream in(n);
    std::string w;
    in >> w >> d;
    if (w == "degree" && d > c.degree) degree_dropped = true;
    const auto pos = n.find("aux degree ");
    if (pos != std::string::npos) {
      std::istringstream ia(n.substr(pos + 11));
      ia >> ad;
      if (ad > c.aux_degree) aux_dropped = true;
    }
  }
  std::vector<Warning> out;
  for (Warning& w : all) {
    if (w.code == DiagnosticCode::DegreeAtGridEdge &&
        w.message.find("is the highest candidate") != std::string::npos) {
      const bool is_aux = w.message.find("chosen aux degree") != std::string::npos;
      if (fit_adequate || (is_aux ? aux_dropped : degree_dropped)) continue;
    }
    out.push_back(std::move(w));
  }
  return out;
}

}  // namespace ridgecal
