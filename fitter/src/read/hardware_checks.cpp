#include "ridgecal/hardware_checks.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cassert>
#include <cmath>
#include <limits>
#include <map>
#include <vector>

namespace ridgecal {

std::string HardwareCheckOptions::validate() const {
  if (min_plateau_setpoints < 2)
    return fmt::format("min_plateau_setpoints is {}; it must be at least 2", min_plateau_setpoints);
  return {};
}

namespace {

struct SetpointSpan {
  std::string label;
  double ref_sum = 0.0;
  std::size_t n = 0;
  double lo = std::numeric_limits<double>::infinity();
  double hi = -std::numeric_limits<double>::infinity();
  std::size_t first_line = std::numeric_limits<std::size_t>::max();
  double reference() const { return ref_sum / static_cast<double>(n); }
};

std::vector<SetpointSpan> setpoint_spans(const Dataset& data) {
  std::map<std::string, SetpointSpan> by_label;
  for (const Observation& o : data.rows) {
    SetpointSpan& s = by_label[o.setpoint];
    s.label = o.setpoint;
    s.ref_sum += o.reference;
    ++s.n;
    s.lo = std::min(s.lo, o.reading);
    s.hi = std::max(s.hi, o.reading);
    s.first_line = std::min(s.first_line, o.line);
  }
  std::vector<SetpointSpan> v;
  v.reserve(by_label.size());
  for (auto& [label, s] : by_label) v.push_back(std::move(s));
  std::stable_sort(v.begin(), v.end(), [](const SetpointSpan& a, const SetpointSpan& b) {
    return a.reference() < b.reference();
  });
  return v;
}

}  // namespace

std::optional<HardwarePlateau> find_plateau(const Dataset& data, double reading_floor,
                                            const HardwareCheckOptions& options) {
  assert(options.validate().empty());
  const std::vector<SetpointSpan> s = setpoint_spans(data);
  if (s.size() < 3) return std::nullopt;  // too few setpoints to tell a plateau from a sensor
  double lo = std::numeric_limits<double>::infinity(), hi = -lo, ref_mag = 0.0;
  for (const SetpointSpan& p : s) {
    lo = std::min(lo, p.lo);
    hi = std::max(hi, p.hi);
    ref_mag = std::max(ref_mag, std::fabs(p.reference()));
  }
  const double q =
      std::max(kConstantRelativeSpread * std::max(std::fabs(lo), std::fabs(hi)), reading_floor);
  // A plateau must cover at least kMinPlateauSpanFraction of the reference
  // span: rows grouped by reference value (no setpoint column) that differ by
  // a few thousandths are repeats at one nominal setpoint, not a plateau.
  const double ref_span = s.back().reference() - s.front().reference();
  const double ref_q = std::max(kConstantRelativeSpread * ref_mag, 0.0);
  std::optional<HardwarePlateau> best;
  for (std::size_t i = 0; i < s.size();) {
    double run_lo = s[i].lo, run_hi = s[i].hi;
    std::size_t j = i + 1;
    while (j < s.size()) {
      const double nlo = std::min(run_lo, s[j].lo), nhi = std::max(run_hi, s[j].hi);
      if (nhi - nlo > q || s[j].reference() - s[j - 1].reference() <= ref_q) break;
      run_lo = nlo, run_hi = nhi;
      ++j;
    }
    const std::size_t len = j - i;
    const bool wide =
        len >= 2 && s[j - 1].reference() - s[i].reference() >= kMinPlateauSpanFraction * ref_span;
    if (wide && len >= options.min_plateau_setpoints && (!best || len > best->setpoints)) {
      HardwarePlateau p;
      p.setpoints = len;
      p.first_setpoint = s[i].label;
      p.last_setpoint = s[j - 1].label;
      p.value = 0.5 * (run_lo + run_hi);
      p.reference_low = s[i].reference();
      p.reference_high = s[j - 1].reference();
      p.line = s[i].first_line;
      for (std::size_t k = i; k < j; ++k) p.line = std::min(p.line, s[k].first_line);
      const bool at_end = i == 0 || j == s.size();
      const bool extreme = run_lo - lo <= q || hi - run_hi <= q;
      p.cause = std::fabs(p.value) <= q ? InputCause::ZeroReadings
                : at_end && extreme     ? InputCause::ClippedReadings
                                        : InputCause::FrozenReadings;
      best = p;
    }
    i = std::max(i + 1, j - 1);  // a plateau's last setpoint may start the next one
  }
  return best;
}

void check_hardware(const Dataset& data, double reading_floor,
                    const HardwareCheckOptions& options) {
  if (!options.enabled) return;
  const std::optional<HardwarePlateau> p = find_plateau(data, reading_floor, options);
  if (!p) return;
  const char* what = p->cause == InputCause::ZeroReadings ? "the sensor looks open or shorted"
                     : p->cause == InputCause::ClippedReadings
                         ? "the sensor output looks saturated (clipped at the end of its range)"
                         : "the sensor output looks stuck";
  throw InputError(
      data.file, p->line,
      fmt::format("every reading of the {} setpoints from '{}' to '{}' (references {} .. {}) is "
                  "{}: {}",
                  p->setpoints, p->first_setpoint, p->last_setpoint, p->reference_low,
                  p->reference_high, p->value, what),
      "check the sensor, its wiring and the reading column; a sensor whose output really "
      "does not change between these setpoints cannot be calibrated there "
      "(--no-hardware-checks fits it anyway)",
      p->cause);
}

}  // namespace ridgecal
