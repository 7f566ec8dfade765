// Checks of the calibrated range: the setpoints' coverage of the declared
// span and gaps between them, and points outside the calibrated region
// (extrapolation).
#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "ridgecal/diag_common.hpp"
#include "ridgecal/diagnostics.hpp"

namespace ridgecal {

using detail::line_list;
using detail::make_warning;

std::vector<Warning> check_coverage(const Calibration& cal, const DiagnosticOptions& o) {
  std::vector<Warning> out;
  // Ordered along one input: not defined for a model with an aux input.
  if (general_model(cal).has_aux) return out;
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
      out.push_back(make_warning(
          DiagnosticCode::RangeNotCovered,
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
      out.push_back(make_warning(
          DiagnosticCode::CoverageGap,
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

std::vector<Warning> check_extrapolation(const Model& m, const std::vector<double>& readings,
                                         const std::vector<double>& aux,
                                         const std::vector<std::size_t>& lines,
                                         const std::string& what) {
  std::vector<std::size_t> out_reading, out_aux;
  double worst_t = 0.0, worst_s = 0.0;  // in half-widths of the scaled inputs beyond [-1, 1]
  for (std::size_t i = 0; i < readings.size(); ++i) {
    const std::size_t line = i < lines.size() ? lines[i] : 0;
    const double u = m.transforms.input(readings[i]);
    if (!std::isfinite(u) || !m.input.contains(u)) {
      out_reading.push_back(line);
      if (std::isfinite(u)) worst_t = std::max(worst_t, std::fabs(m.input.to_scaled(u)) - 1.0);
    }
    if (m.has_aux && i < aux.size() && !m.aux.contains(aux[i])) {
      out_aux.push_back(line);
      if (std::isfinite(aux[i]))
        worst_s = std::max(worst_s, std::fabs(m.aux.to_scaled(aux[i])) - 1.0);
    }
  }
  if (out_reading.empty() && out_aux.empty()) return {};
  std::vector<std::size_t> all = out_reading;
  all.insert(all.end(), out_aux.begin(), out_aux.end());
  std::sort(all.begin(), all.end());
  all.erase(std::unique(all.begin(), all.end()), all.end());
  // One part per input; the value is the distance beyond the range in the
  // units of that input (the reading's when the reading is outside).
  std::string parts;
  double value = 0.0;
  if (!out_reading.empty()) {
    value = worst_t * m.input.half_width;
    parts += fmt::format(
        "{} {} lie outside the calibrated {}reading range {:g}..{:g} (lines {}), up to {:.3g} "
        "{}reading units beyond it",
        out_reading.size(), what, m.transforms.identity() ? "" : "transformed ", m.input.min,
        m.input.max, line_list(out_reading), value, m.transforms.identity() ? "" : "transformed ");
  }
  if (!out_aux.empty()) {
    const double beyond = worst_s * m.aux.half_width;
    if (out_reading.empty()) value = beyond;
    parts += fmt::format(
        "{}{} {} lie outside the calibrated aux range {:g}..{:g} (lines {}), up to {:.3g} aux "
        "units beyond it",
        parts.empty() ? "" : "; ", out_aux.size(), what, m.aux.min, m.aux.max, line_list(out_aux),
        beyond);
  }
  return {make_warning(DiagnosticCode::Extrapolation,
                       parts + ": there the curve is an extrapolation and the uncertainty is not "
                               "valid.",
                       all, value)};
}

}  // namespace ridgecal
