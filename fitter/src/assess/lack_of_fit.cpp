// The lack-of-fit F test against pure error and the distribution functions
// the calibrated checks use (lack_of_fit.hpp).
#include "ridgecal/lack_of_fit.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <boost/math/distributions/fisher_f.hpp>
#include <boost/math/distributions/students_t.hpp>
#include <cmath>
#include <map>

#include "ridgecal/json_read.hpp"
#include "ridgecal/repeat_groups.hpp"
#include "ridgecal/uncertainty.hpp"

namespace ridgecal {

namespace {
constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
}  // namespace

double f_distribution_sf(double f, double d1, double d2) {
  if (!(std::isfinite(f) && d1 > 0.0 && d2 > 0.0 && std::isfinite(d1) && std::isfinite(d2)))
    return kNaN;
  if (f <= 0.0) return 1.0;
  const boost::math::fisher_f_distribution<double> dist(d1, d2);
  return boost::math::cdf(boost::math::complement(dist, f));
}

double student_t_two_sided_critical(double a, double df) {
  if (!(a > 0.0 && a < 1.0 && df > 0.0 && std::isfinite(df))) return kNaN;
  const boost::math::students_t_distribution<double> dist(df);
  return boost::math::quantile(boost::math::complement(dist, a / 2.0));
}

double student_t_two_sided_p(double t, double df) {
  if (!(std::isfinite(t) && df > 0.0 && std::isfinite(df))) return kNaN;
  const boost::math::students_t_distribution<double> dist(df);
  return 2.0 * boost::math::cdf(boost::math::complement(dist, std::fabs(t)));
}

namespace detail {

std::vector<double> fitted_residuals(const Calibration& cal) {
  const Model m = general_model(cal);
  std::vector<double> e(cal.points.size(), kNaN);
  for (std::size_t i = 0; i < cal.points.size(); ++i) {
    const PointResult& p = cal.points[i];
    e[i] = m.eval_fitted(m.transforms.input(p.reading), m.has_aux ? p.aux : 0.0) -
           m.transforms.output(p.reference);
  }
  return e;
}

std::vector<RepeatGroup> training_groups(const Dataset& data, const Calibration& cal,
                                         bool with_test) {
  const bool has_aux = cal.model.has_aux;
  const bool rows_match = data.rows.size() == cal.points.size();
  const std::vector<double> e = fitted_residuals(cal);
  std::vector<RepeatGroup> groups;
  std::map<std::string, std::size_t> index;
  for (std::size_t i = 0; i < cal.points.size(); ++i) {
    const PointResult& p = cal.points[i];
    if ((p.role != SetRole::Train && !with_test) || !std::isfinite(e[i])) continue;
    std::string key = p.setpoint;
    if (has_aux) {
      const double step = cal.aux_step > 0.0 ? cal.aux_step : 1.0;
      const std::string level = rows_match && !data.rows[i].aux_setpoint.empty()
                                    ? data.rows[i].aux_setpoint
                                    : fmt::format("{:g}", std::round(p.aux / step) * step + 0.0);
      key += " @ aux " + level;
    }
    if (p.role != SetRole::Train) key += " (test)";
    auto it = index.find(key);
    if (it == index.end()) {
      it = index.emplace(key, groups.size()).first;
      groups.push_back(RepeatGroup{});
      groups.back().key = key;
    }
    RepeatGroup& g = groups[it->second];
    g.points.push_back(i);
    g.residuals.push_back(e[i]);
    g.mean_reference += p.reference;
    g.mean_aux += has_aux ? p.aux : 0.0;
  }
  for (RepeatGroup& g : groups) {
    // Repeats in file order (the order they were taken, as far as the file tells).
    std::vector<std::size_t> order(g.points.size());
    for (std::size_t k = 0; k < order.size(); ++k) order[k] = k;
    std::sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) {
      return cal.points[g.points[a]].line < cal.points[g.points[b]].line;
    });
    std::vector<std::size_t> pts;
    std::vector<double> res;
    for (std::size_t k : order) {
      pts.push_back(g.points[k]);
      res.push_back(g.residuals[k]);
    }
    g.points = std::move(pts);
    g.residuals = std::move(res);
    const double m = static_cast<double>(g.points.size());
    g.mean_reference /= m;
    g.mean_aux /= m;
    double s = 0.0;
    for (double r : g.residuals) s += r;
    g.mean_residual = s / m;
    for (double r : g.residuals) g.ss_pure += (r - g.mean_residual) * (r - g.mean_residual);
  }
  return groups;
}

double effective_parameters(const Calibration& cal) {
  const FitCovariance cov(cal);
  return cov.ok() ? cov.effective_parameters() : (cal.intercept ? 1.0 : 0.0);
}

}  // namespace detail

LackOfFit lack_of_fit_test(const Dataset& data, const Calibration& cal, double alpha) {
  LackOfFit l;
  l.alpha = alpha;
  const std::vector<detail::RepeatGroup> groups = detail::training_groups(data, cal);
  l.setpoints = groups.size();
  double ss_pure = 0.0, ss_lack = 0.0, df_pure = 0.0, worst = -1.0;
  for (const detail::RepeatGroup& g : groups) {
    const double m = static_cast<double>(g.points.size());
    if (g.points.size() >= 2) ++l.repeated_setpoints;
    ss_pure += g.ss_pure;
    df_pure += m - 1.0;
    const double lack = m * g.mean_residual * g.mean_residual;
    ss_lack += lack;
    if (lack > worst) {
      worst = lack;
      l.worst_setpoint = g.key;
    }
  }
  const double df_lack = static_cast<double>(groups.size()) - detail::effective_parameters(cal);
  if (l.repeated_setpoints == 0 || !(df_pure >= 1.0) || !(df_lack >= 1.0)) return l;
  l.df_pure = df_pure;
  l.df_lack = df_lack;
  if (!(ss_pure > 0.0)) {
    // Repeats that agree exactly: any lack of fit is infinitely significant,
    // none is no evidence either way.
    if (!(ss_lack > 0.0)) return l;
    l.f = std::numeric_limits<double>::infinity();
    l.p = 0.0;
  } else {
    l.f = (ss_lack / df_lack) / (ss_pure / df_pure);
    l.p = f_distribution_sf(l.f, df_lack, df_pure);
  }
  l.computed = std::isfinite(l.p);
  return l;
}

std::vector<Warning> check_lack_of_fit(const LackOfFit& l) {
  if (!l.computed || !(l.p < l.alpha)) return {};
  Warning w;
  w.code = DiagnosticCode::LackOfFit;
  w.value = l.p;
  w.message = fmt::format(
      "Lack of fit: the setpoint means depart from the curve more than the scatter of the repeats "
      "allows (F = {:.3g} on {:.3g} and {:g} degrees of freedom, p = {:.2g}, below {:g}); worst "
      "at setpoint '{}'. The curve family or degree cannot follow the sensor, or a setpoint's "
      "reference or readings are wrong; the uncertainty does not cover that error.",
      l.f, l.df_lack, l.df_pure, l.p, l.alpha, l.worst_setpoint);
  return {w};
}

nlohmann::json to_json(const LackOfFit& l) {
  nlohmann::json j{{"computed", l.computed},
                   {"setpoints", l.setpoints},
                   {"repeated_setpoints", l.repeated_setpoints},
                   {"alpha", l.alpha}};
  if (l.computed) {
    j["f"] = std::isfinite(l.f) ? nlohmann::json(l.f) : nlohmann::json("inf");
    j["df_lack"] = l.df_lack;
    j["df_pure"] = l.df_pure;
    j["p"] = l.p;
    j["worst_setpoint"] = l.worst_setpoint;
  }
  return j;
}

LackOfFit lack_of_fit_from_json(const nlohmann::json& j, const std::string& file) {
  const detail::JsonReader r{file};
  if (!j.is_object()) r.fail("lack_of_fit", "is not an object");
  LackOfFit l;
  if (!j.contains("computed") || !j["computed"].is_boolean())
    r.fail("lack_of_fit.computed", "is missing or not true/false");
  l.computed = j["computed"].get<bool>();
  l.setpoints = static_cast<std::size_t>(r.number(j, "setpoints", "lack_of_fit"));
  l.repeated_setpoints = static_cast<std::size_t>(r.number(j, "repeated_setpoints", "lack_of_fit"));
  l.alpha = r.number(j, "alpha", "lack_of_fit");
  if (l.computed) {
    if (j.contains("f") && j["f"].is_string() && j["f"].get<std::string>() == "inf")
      l.f = std::numeric_limits<double>::infinity();
    else
      l.f = r.number(j, "f", "lack_of_fit");
    l.df_lack = r.number(j, "df_lack", "lack_of_fit");
    l.df_pure = r.number(j, "df_pure", "lack_of_fit");
    l.p = r.number(j, "p", "lack_of_fit");
    l.worst_setpoint = r.text(j, "worst_setpoint", "lack_of_fit");
  }
  return l;
}

}  // namespace ridgecal
