#include "export_proof.hpp"

#include <cmath>
#include <limits>

namespace ridgecal::firmware::detail {

namespace {

template <typename T>
void check_point(const PolyModel& m, const FloatingProgram<T>& p, T x, Deviation* d) {
  const T y = eval_program(p, x);
  const double ref = m.eval(static_cast<double>(x));
  ++d->points;
  if (!std::isfinite(y)) {
    d->finite = false;
    d->max = std::numeric_limits<double>::infinity();
    d->at = static_cast<double>(x);
    return;
  }
  const double e = std::fabs(static_cast<double>(y) - ref);
  if (e > d->max) {
    d->max = e;
    d->at = static_cast<double>(x);
  }
}

template <typename T>
Deviation measure_floating(const PolyModel& m, const FloatingProgram<T>& p, int grid_points,
                           const std::vector<double>& readings) {
  Deviation d;
  const double lo = static_cast<double>(p.x_lo), hi = static_cast<double>(p.x_hi);
  for (int i = 0; i < grid_points; ++i) {
    const double x = i + 1 == grid_points ? hi : lo + (hi - lo) * i / (grid_points - 1);
    T xt = static_cast<T>(x);
    if (xt < p.x_lo) xt = p.x_lo;
    if (xt > p.x_hi) xt = p.x_hi;
    check_point(m, p, xt, &d);
  }
  for (double r : readings) {
    if (!std::isfinite(r)) continue;
    const T xt = static_cast<T>(r);
    if (!(xt >= p.x_lo && xt <= p.x_hi)) continue;
    check_point(m, p, xt, &d);
    ++d.readings;
  }
  return d;
}

}  // namespace

template <typename T>
void inward(double lo, double hi, T* out_lo, T* out_hi) {
  // valid range rounded inward, so a clamped input never leaves [lo, hi]
  T a = static_cast<T>(lo);
  if (static_cast<double>(a) < lo) a = std::nextafter(a, std::numeric_limits<T>::infinity());
  T b = static_cast<T>(hi);
  if (static_cast<double>(b) > hi) b = std::nextafter(b, -std::numeric_limits<T>::infinity());
  *out_lo = a;
  *out_hi = b;
}

template <typename T>
std::optional<FloatingProgram<T>> make_program(const FirmwareModel& m, Basis b) {
  FloatingProgram<T> p;
  p.basis = b;
  const Transforms& tr = m.transforms;
  p.divider = tr.divider.enabled;
  p.sensor_low = tr.divider.position == DividerPosition::SensorLow;
  p.divider_r = static_cast<T>(tr.divider.fixed_resistance);
  p.divider_fs = static_cast<T>(tr.divider.full_scale);
  p.ln = tr.reading == ReadingTransform::Ln;
  p.reciprocal_kelvin = tr.reference == ReferenceTransform::ReciprocalKelvin;
  p.kelvin = static_cast<T>(kKelvinOffset);
  p.has_aux = m.has_aux();
  p.reading_degree = m.reading_degree;
  p.aux_degree = m.aux_degree;
  if (b == Basis::ScaledT) {
    p.center = static_cast<T>(m.inputs[0].center);
    p.inv_half_width = static_cast<T>(1.0L / static_cast<long double>(m.inputs[0].half_width));
    for (double c : m.monomial) p.coef.push_back(static_cast<T>(c));
  } else {  // raw x: t = (x - 0) * 1 = x
    if (m.raw_power.empty() || m.has_aux()) return std::nullopt;
    for (long double c : m.raw_power) p.coef.push_back(static_cast<T>(c));
    p.reading_degree = static_cast<int>(p.coef.size()) - 1;
  }
  if (m.has_aux()) {
    p.aux_center = static_cast<T>(m.inputs[1].center);
    p.aux_inv_half_width = static_cast<T>(1.0L / static_cast<long double>(m.inputs[1].half_width));
  }
  const auto [lo, hi] = raw_reading_range(m);
  inward(lo, hi, &p.x_lo, &p.x_hi);
  if (m.has_aux()) inward(m.inputs[1].min, m.inputs[1].max, &p.a_lo, &p.a_hi);
  bool ok = std::isfinite(p.center) && std::isfinite(p.inv_half_width) &&
            std::isfinite(p.aux_center) && std::isfinite(p.aux_inv_half_width) &&
            std::isfinite(p.x_lo) && std::isfinite(p.x_hi) && p.x_lo <= p.x_hi &&
            std::isfinite(p.a_lo) && std::isfinite(p.a_hi) && p.a_lo <= p.a_hi &&
            std::isfinite(p.divider_r) && std::isfinite(p.divider_fs);
  for (T c : p.coef) ok = ok && std::isfinite(c);
  if (!ok) return std::nullopt;
  return p;
}

template std::optional<FloatProgram> make_program<float>(const FirmwareModel&, Basis);
template std::optional<DoubleProgram> make_program<double>(const FirmwareModel&, Basis);

Deviation measure(const PolyModel& m, const FloatProgram& p, int grid_points,
                  const std::vector<double>& readings) {
  return measure_floating(m, p, grid_points, readings);
}
Deviation measure(const PolyModel& m, const DoubleProgram& p, int grid_points,
                  const std::vector<double>& readings) {
  return measure_floating(m, p, grid_points, readings);
}

Deviation measure(const PolyModel& m, const FixedPlan& p, int grid_points,
                  std::int64_t exhaustive_limit, const std::vector<double>& readings) {
  Deviation d;
  const FixedAxis& s = p.t;
  const auto check = [&](std::int64_t raw) {
    const std::int32_t out = eval_fixed(p, static_cast<std::int32_t>(raw));
    const double x = static_cast<double>(raw) / s.scale;
    const double e = std::fabs(static_cast<double>(out) / p.output_scale - m.eval(x));
    ++d.points;
    if (e > d.max) {
      d.max = e;
      d.at = x;
    }
  };
  const std::int64_t count = s.raw_max - s.raw_min + 1;
  if (count <= exhaustive_limit) {
    for (std::int64_t r = s.raw_min; r <= s.raw_max; ++r) check(r);
  } else {
    for (int i = 0; i < grid_points; ++i) {
      const long double f =
          grid_points == 1 ? 0.0L : static_cast<long double>(i) / (grid_points - 1);
      check(s.raw_min + std::llround(f * static_cast<long double>(s.raw_max - s.raw_min)));
    }
  }
  for (double r : readings) {
    if (!std::isfinite(r)) continue;
    const double raw = std::nearbyint(r * s.scale);
    if (raw < static_cast<double>(s.raw_min) || raw > static_cast<double>(s.raw_max)) continue;
    check(static_cast<std::int64_t>(raw));
    ++d.readings;
  }
  return d;
}

}  // namespace ridgecal::firmware::detail
