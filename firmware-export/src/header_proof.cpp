// The export proof: the programs the header evaluates, emulated on the host
// over a grid of inputs and the calibration points, against the
// double-precision model (FirmwareModel::reference).
#include <algorithm>
#include <cmath>
#include <limits>

#include "header_writer.hpp"

namespace ridgecal::firmware::detail {

bool choose_proof_tolerance(const HeaderMeta& meta, const ExportOptions& opt, ProofTolerance& out,
                            std::string& message) {
  if (meta.tolerance_abs && std::isfinite(*meta.tolerance_abs) && *meta.tolerance_abs > 0) {
    out.tolerance = *meta.tolerance_abs;
    out.source = meta.tolerance_abs_source;
  } else if (std::isfinite(meta.validation_rmse) && meta.validation_rmse > 0) {
    out.tolerance = meta.validation_rmse;
    out.source = "validation RMSE, fallback: no absolute tolerance given";
  } else {
    message =
        "meta: neither an absolute tolerance nor a positive validation RMSE is given; the "
        "refusal rule needs one of them";
    return false;
  }
  out.limit = opt.max_deviation_fraction * out.tolerance;
  return true;
}

ProofGrid proof_grid(const FirmwareModel& m, const ExportOptions& opt) {
  ProofGrid g;
  if (!m.extended) {
    g.reading_points = opt.grid_points;
    g.exhaustive_limit = opt.exhaustive_limit;
    return g;
  }
  g.reading_points = std::min(opt.grid_points, 801);
  g.aux_points = m.has_aux() ? 101 : 1;
  g.exhaustive_limit = g.reading_points;
  g.clamp_readings = true;
  return g;
}

namespace {

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
T clamp_to(T v, T lo, T hi) {
  return std::fmin(std::fmax(v, lo), hi);
}

// Keeps the largest error and where it occurred; a non-finite header result
// counts as an infinite error.
void record(Deviation* d, double e, double x, double a) {
  ++d->points;
  if (!(e <= d->max)) {
    d->max = e;
    d->at = x;
    d->at_aux = a;
  }
}

// Largest change of the output when u changes by kLogUlps ulps of T at u.
template <typename T>
double log_allowance_at(const FirmwareModel& m, double x, double aux) {
  const double u = m.transforms.input(x);
  if (!std::isfinite(u)) return 0;
  const T ut = static_cast<T>(u);
  const double ulp =
      static_cast<double>(std::nextafter(ut, std::numeric_limits<T>::infinity()) - ut);
  const double du = kLogUlps * ulp;
  const auto f = [&](double uu) {
    return m.transforms.output_inverse(m.reference_fitted(uu, aux));
  };
  return std::max(std::fabs(f(u + du) - f(u)), std::fabs(f(u - du) - f(u)));
}

template <typename T>
void check_point(const FirmwareModel& m, const FloatingProgram<T>& p, T x, T a, Deviation* d) {
  const T y = eval_program(p, x, a);
  const double xd = static_cast<double>(x), ad = static_cast<double>(a);
  const double e = std::isfinite(y) ? std::fabs(static_cast<double>(y) - m.reference(xd, ad))
                                    : std::numeric_limits<double>::infinity();
  record(d, e, xd, ad);
  if (p.ln) d->allowance = std::max(d->allowance, log_allowance_at<T>(m, xd, ad));
}

// The raw values of one input the fixed-point proof checks: all of them when
// there are at most `limit`, else n spread evenly.
std::vector<std::int64_t> raw_axis(std::int64_t lo, std::int64_t hi, std::int64_t limit, int n) {
  std::vector<std::int64_t> v;
  if (hi - lo + 1 <= limit) {
    for (std::int64_t r = lo; r <= hi; ++r) v.push_back(r);
  } else {
    for (int i = 0; i < n; ++i)
      v.push_back(lo + std::llround(static_cast<long double>(i) / (n - 1) *
                                    static_cast<long double>(hi - lo)));
  }
  return v;
}

}  // namespace

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

template <typename T>
Deviation measure(const FirmwareModel& m, const FloatingProgram<T>& p, const ProofGrid& grid,
                  const HeaderMeta& meta) {
  Deviation d;
  const int nr = grid.reading_points;
  const int na = p.has_aux ? grid.aux_points : 1;
  const double xl = static_cast<double>(p.x_lo), xh = static_cast<double>(p.x_hi);
  const double al = static_cast<double>(p.a_lo), ah = static_cast<double>(p.a_hi);
  for (int j = 0; j < na; ++j) {
    const double av = na == 1 ? al : (j + 1 == na ? ah : al + (ah - al) * j / (na - 1));
    const T a = clamp_to(static_cast<T>(av), p.a_lo, p.a_hi);
    for (int i = 0; i < nr; ++i) {
      const double xv = i + 1 == nr ? xh : xl + (xh - xl) * i / (nr - 1);
      check_point(m, p, clamp_to(static_cast<T>(xv), p.x_lo, p.x_hi), a, &d);
    }
  }
  // The calibration points: with clamp_readings, those inside the calibrated
  // region, one on its edge clamped to the inward-rounded limit; otherwise
  // those inside the program's range.
  const auto [cx_lo, cx_hi] = raw_reading_range(m);
  for (std::size_t i = 0; i < meta.calibration_readings.size(); ++i) {
    const double r = meta.calibration_readings[i];
    const double av = p.has_aux && i < meta.calibration_aux.size() ? meta.calibration_aux[i] : 0.0;
    if (!std::isfinite(r) || !std::isfinite(av)) continue;
    T x = static_cast<T>(r);
    if (grid.clamp_readings) {
      if (!(r >= std::min(cx_lo, xl) && r <= std::max(cx_hi, xh))) continue;
      if (p.has_aux &&
          !(av >= std::min(m.inputs[1].min, al) && av <= std::max(m.inputs[1].max, ah)))
        continue;
      x = clamp_to(x, p.x_lo, p.x_hi);
    } else if (!(x >= p.x_lo && x <= p.x_hi)) {
      continue;
    }
    const T a = p.has_aux ? clamp_to(static_cast<T>(av), p.a_lo, p.a_hi) : T(0);
    check_point(m, p, x, a, &d);
    ++d.readings;
  }
  return d;
}

Deviation measure(const FirmwareModel& m, const FixedPlan& p, const ProofGrid& grid,
                  const HeaderMeta& meta) {
  Deviation d;
  const auto check = [&](std::int64_t r, std::int64_t ra) {
    const std::int32_t out =
        eval_fixed(p, static_cast<std::int32_t>(r), static_cast<std::int32_t>(ra));
    const double x = static_cast<double>(r) / p.t.scale;
    const double a = p.has_aux ? static_cast<double>(ra) / p.s.scale : 0.0;
    record(&d, std::fabs(static_cast<double>(out) / p.output_scale - m.reference(x, a)), x, a);
  };
  const auto xs = raw_axis(p.t.raw_min, p.t.raw_max, grid.exhaustive_limit, grid.reading_points);
  const auto as = p.has_aux ? raw_axis(p.s.raw_min, p.s.raw_max, grid.aux_points, grid.aux_points)
                            : std::vector<std::int64_t>{0};
  for (std::int64_t a : as)
    for (std::int64_t x : xs) check(x, a);
  for (std::size_t i = 0; i < meta.calibration_readings.size(); ++i) {
    const double r = std::nearbyint(meta.calibration_readings[i] * p.t.scale);
    const double av = p.has_aux && i < meta.calibration_aux.size()
                          ? std::nearbyint(meta.calibration_aux[i] * p.s.scale)
                          : 0.0;
    if (!std::isfinite(r) || !std::isfinite(av)) continue;
    if (r < static_cast<double>(p.t.raw_min) || r > static_cast<double>(p.t.raw_max)) continue;
    if (p.has_aux &&
        (av < static_cast<double>(p.s.raw_min) || av > static_cast<double>(p.s.raw_max)))
      continue;
    check(static_cast<std::int64_t>(r), static_cast<std::int64_t>(av));
    ++d.readings;
  }
  return d;
}

template std::optional<FloatProgram> make_program<float>(const FirmwareModel&, Basis);
template std::optional<DoubleProgram> make_program<double>(const FirmwareModel&, Basis);
template Deviation measure<float>(const FirmwareModel&, const FloatProgram&, const ProofGrid&,
                                  const HeaderMeta&);
template Deviation measure<double>(const FirmwareModel&, const DoubleProgram&, const ProofGrid&,
                                   const HeaderMeta&);

}  // namespace ridgecal::firmware::detail
