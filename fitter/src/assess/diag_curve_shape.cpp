// Checks of the curve's shape along the reading: monotonicity, and
// hysteresis between up and down sweeps.
#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <map>

#include "ridgecal/diag_common.hpp"
#include "ridgecal/diagnostics.hpp"

namespace ridgecal {

using detail::make_warning;

std::vector<Warning> check_monotonic(const Calibration& cal) {
  // The sign of dv/du over the calibrated input range (the transforms are
  // monotonic, so a sign change of dv/du is one of d reference / d reading).
  // Defined along one input: not applied to a model with an aux input.
  const Model model = general_model(cal);
  if (model.has_aux || model.terms.empty()) return {};
  const std::vector<std::vector<double>> mono = model.monomial_in_scaled();
  const AxisScaling& sc = model.input;
  const auto slope = [&](double u) {
    const double t = sc.to_scaled(u);
    double d = 0.0;
    for (std::size_t k = mono.size(); k-- > 1;) d = d * t + static_cast<double>(k) * mono[k][0];
    return d / sc.half_width;
  };
  const int m = 2000;
  double dmax = 0;
  std::vector<double> d(m + 1);
  for (int i = 0; i <= m; ++i) {
    d[static_cast<std::size_t>(i)] = slope(sc.min + (sc.max - sc.min) * i / m);
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
      const double x = sc.min + (sc.max - sc.min) * i / m;
      return {make_warning(
          DiagnosticCode::NonMonotonic,
          fmt::format(
              "The curve is not monotonic over the calibrated range: its slope changes sign near "
              "{}reading {:g}, so one calibrated value can come from two readings (a problem when "
              "firmware inverts the curve); lower the degree or raise lambda.",
              model.transforms.identity() ? "" : "transformed ", x),
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
  // With an aux input the setpoints are keyed by aux level: the aux setpoint
  // label, else the aux value rounded to cal.aux_step.
  const bool keyed = general_model(cal).has_aux;
  const double step = cal.aux_step > 0.0 ? cal.aux_step : 1.0;
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
    std::string key = p.setpoint;
    if (keyed)
      key += " @ aux " + (!ob.aux_setpoint.empty()
                              ? ob.aux_setpoint
                              : fmt::format("{:g}", std::round(ob.aux / step) * step + 0.0));
    if (!acc.count(key)) order.push_back(key);
    Acc& a = acc[key];
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
  return {make_warning(
      DiagnosticCode::Hysteresis,
      fmt::format(
          "Hysteresis: at {} of {} setpoints measured in both directions the up and down sweeps "
          "differ by more than the tolerance; worst at setpoint '{}', up minus down = {:.3g} "
          "against {:.3g}. "
          "One curve cannot serve both directions within the tolerance.",
          exceeded, paired, worst_id, worst_diff, worst_limit),
      worst_lines, worst_ratio)};
}

}  // namespace ridgecal
