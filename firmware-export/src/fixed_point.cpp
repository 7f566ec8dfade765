#include "ridgecal/firmware/fixed_point.hpp"

#include <algorithm>
#include <cmath>
#include <limits>

#include "exact_int.hpp"
#include "ridgecal/firmware/float_emulation.hpp"

namespace ridgecal::firmware {

namespace {

using detail::floor_div_pow2;
using detail::i128;
using detail::kAccBits;
using detail::kInt32Max;
using detail::kMaxShift;
using detail::kTwo62;
using detail::rshift_precondition;
using detail::rshift_round_exact;

IntRange to_range(i128 lo, i128 hi) {
  return IntRange{static_cast<long double>(lo), static_cast<long double>(hi)};
}

std::string i128_text(i128 v) {
  return std::to_string(static_cast<long double>(v));
}

struct Interval {
  double lo, hi;
};
Interval mul(Interval a, Interval b) {
  const double c[4] = {a.lo * b.lo, a.lo * b.hi, a.hi * b.lo, a.hi * b.hi};
  return {*std::min_element(c, c + 4), *std::max_element(c, c + 4)};
}
double mag(Interval a) { return std::max(std::fabs(a.lo), std::fabs(a.hi)); }

int floor_log2_ratio(double limit_pow2_bits, double value) {
  // largest q with value * 2^q <= 2^limit_pow2_bits
  if (!(value > 0)) return 60;
  return static_cast<int>(std::floor(limit_pow2_bits - std::log2(value)));
}

}  // namespace

std::int64_t rshift_round(std::int64_t v, int s) {
  // Same expression as the generated C: shift only a non-negative value.
  const std::int64_t bias = static_cast<std::int64_t>(1) << 62;
  const std::int64_t half = static_cast<std::int64_t>(1) << (s - 1);
  const std::uint64_t biased = static_cast<std::uint64_t>(v + bias + half);
  return static_cast<std::int64_t>(biased >> s) - (bias >> s);
}

bool verify_fixed_bounds(FixedPlan* plan, std::string* why) {
  FixedPlan& p = *plan;
  const int n = p.degree();
  const auto fail = [&](const std::string& msg) {
    if (why) *why = msg;
    return false;
  };
  // input map
  const i128 d_lo = static_cast<i128>(p.settings.raw_min) - p.r0;
  const i128 d_hi = static_cast<i128>(p.settings.raw_max) - p.r0;
  if (p.t_mul <= 0) return fail("t_mul must be positive");
  const i128 pre_lo = d_lo * p.t_mul + p.t_add;
  const i128 pre_hi = d_hi * p.t_mul + p.t_add;
  p.t_pre = to_range(pre_lo, pre_hi);
  if (!rshift_precondition(pre_lo, pre_hi, p.t_shift))
    return fail("input map (r - r0) * t_mul + t_add leaves the shift's range: [" +
                i128_text(pre_lo) + ", " + i128_text(pre_hi) + "]");
  const i128 t_lo = rshift_round_exact(pre_lo, p.t_shift);
  const i128 t_hi = rshift_round_exact(pre_hi, p.t_shift);
  p.t_q = to_range(t_lo, t_hi);
  if (t_lo < -kInt32Max || t_hi > kInt32Max) return fail("t_q does not fit in int32");

  p.prod.assign(static_cast<std::size_t>(n), IntRange{});
  p.acc.assign(static_cast<std::size_t>(n) + 1, IntRange{});
  i128 a_lo = p.coef[static_cast<std::size_t>(n)], a_hi = a_lo;
  p.acc[static_cast<std::size_t>(n)] = to_range(a_lo, a_hi);
  for (int k = n - 1; k >= 0; --k) {
    const std::size_t ku = static_cast<std::size_t>(k);
    const i128 c[4] = {a_lo * t_lo, a_lo * t_hi, a_hi * t_lo, a_hi * t_hi};
    const i128 m_lo = *std::min_element(c, c + 4);
    const i128 m_hi = *std::max_element(c, c + 4);
    p.prod[ku] = to_range(m_lo, m_hi);
    if (!rshift_precondition(m_lo, m_hi, p.shift[ku]))
      return fail("step " + std::to_string(k) + ": product acc*t_q leaves the shift's range");
    a_lo = rshift_round_exact(m_lo, p.shift[ku]) + p.coef[ku];
    a_hi = rshift_round_exact(m_hi, p.shift[ku]) + p.coef[ku];
    p.acc[ku] = to_range(a_lo, a_hi);
    if (a_lo < -kInt32Max || a_hi > kInt32Max)
      return fail("step " + std::to_string(k) + ": accumulator exceeds int32");
  }
  i128 o_lo = a_lo, o_hi = a_hi;
  if (p.q[0] < 0) return fail("output needs more than 31 bits at this output_scale");
  if (p.q[0] > 0) {
    if (!rshift_precondition(a_lo, a_hi, p.q[0])) return fail("final shift out of range");
    o_lo = rshift_round_exact(a_lo, p.q[0]);
    o_hi = rshift_round_exact(a_hi, p.q[0]);
  }
  p.out = to_range(o_lo, o_hi);
  if (o_lo < -kInt32Max || o_hi > kInt32Max) return fail("output exceeds int32");
  return true;
}

bool plan_fixed(const PolyModel& model, const FixedSettings& s, FixedPlan* out, std::string* why) {
  const auto fail = [&](const std::string& msg) {
    if (why) *why = msg;
    return false;
  };
  if (model.cheb.empty()) return fail("model has no coefficients");
  if (s.raw_min > s.raw_max)
    return fail("no integer raw input in the range (raw_min " + std::to_string(s.raw_min) + " > raw_max " +
                std::to_string(s.raw_max) + "); for non-integer readings set input_scale (raw counts per "
                "reading unit) or raw_min/raw_max");
  if (s.raw_min < -kInt32Max || s.raw_max > kInt32Max) return fail("raw range exceeds int32");
  if (!(s.input_scale > 0) || !std::isfinite(s.input_scale)) return fail("input_scale must be > 0");
  if (!(s.output_scale > 0) || !std::isfinite(s.output_scale))
    return fail("output_scale must be > 0");
  const double hw = model.scaling.half_width();
  const double c = model.scaling.center();
  if (!(hw > 0) || !std::isfinite(hw) || !std::isfinite(c)) return fail("degenerate scaling");

  FixedPlan p;
  p.settings = s;
  p.calibrated_min = model.scaling.x_min;
  p.calibrated_max = model.scaling.x_max;
  const double w = s.input_scale * hw;  // raw counts per unit of t
  const double c_raw = c * s.input_scale;
  if (std::fabs(c_raw) > 2.0e9) return fail("calibrated centre is outside the int32 raw range");
  p.r0 = std::llround(c_raw);
  const double t_min = (static_cast<double>(s.raw_min) - c_raw) / w;
  const double t_max = (static_cast<double>(s.raw_max) - c_raw) / w;
  const double t_mag = std::max({std::fabs(t_min), std::fabs(t_max), 1.0});
  // |t_q| <= 2^30 * t_mag must stay below 2^31: t in Q30 while |t| <= 1
  p.t_frac = 30 - std::max(0, static_cast<int>(std::ceil(std::log2(t_mag) - 1e-12)));
  if (p.t_frac < 8)
    return fail("raw range [" + std::to_string(s.raw_min) + ", " + std::to_string(s.raw_max) +
                "] extends far beyond the calibrated range");
  // input map: largest shift whose multiplier stays below 2^31
  p.t_shift = 0;
  for (int sh = kMaxShift; sh >= 1; --sh) {
    const long double a = std::ldexp(1.0L, sh + p.t_frac) / static_cast<long double>(w);
    if (a < 2147483648.0L) {
      p.t_shift = sh;
      p.t_mul = std::llround(a);
      break;
    }
  }
  if (p.t_shift == 0 || p.t_mul <= 0) return fail("cannot represent 1/half_width in the input map");
  p.t_add = std::llround((static_cast<long double>(p.r0) - static_cast<long double>(c_raw)) *
                         static_cast<long double>(p.t_mul));

  const std::vector<long double> m = [&] {
    const auto md = model.monomial_in_t();
    std::vector<long double> v;
    for (double x : md) v.push_back(static_cast<long double>(x) * s.output_scale);
    return v;
  }();
  const int n = static_cast<int>(m.size()) - 1;
  for (long double v : m)
    if (!std::isfinite(static_cast<double>(v))) return fail("non-finite coefficient");

  // Real-valued bounds of every Horner intermediate over the t range.
  {
    // t range from the raw range (a hair wider to cover the rounding of t_q)
    const Interval T{std::min(t_min, t_max) - 1e-6, std::max(t_min, t_max) + 1e-6};
    std::vector<double> need(static_cast<std::size_t>(n) + 1);
    Interval y{static_cast<double>(m[static_cast<std::size_t>(n)]),
               static_cast<double>(m[static_cast<std::size_t>(n)])};
    need[static_cast<std::size_t>(n)] = mag(y);
    for (int k = n - 1; k >= 0; --k) {
      const Interval prod = mul(y, T);
      const double mk = static_cast<double>(m[static_cast<std::size_t>(k)]);
      y = Interval{prod.lo + mk, prod.hi + mk};
      need[static_cast<std::size_t>(k)] = std::max({mag(y), mag(prod), std::fabs(mk)});
    }
    p.q.assign(static_cast<std::size_t>(n) + 1, 0);
    for (int k = 0; k <= n; ++k)
      p.q[static_cast<std::size_t>(k)] =
          std::min(60, floor_log2_ratio(kAccBits, need[static_cast<std::size_t>(k)] * (1 + 1e-6)));
  }

  for (int attempt = 0; attempt < 400; ++attempt) {
    // shift constraints: 1 <= q[k+1] + F - q[k] <= kMaxShift
    for (int pass = 0; pass < 4; ++pass) {
      for (int k = n - 1; k >= 0; --k) {
        auto& qk = p.q[static_cast<std::size_t>(k)];
        qk = std::min(qk, p.q[static_cast<std::size_t>(k) + 1] + p.t_frac - 1);
      }
      for (int k = 0; k < n; ++k) {
        auto& qn = p.q[static_cast<std::size_t>(k) + 1];
        qn = std::min(qn, p.q[static_cast<std::size_t>(k)] + kMaxShift - p.t_frac);
      }
    }
    if (p.q[0] < 0) return fail("output needs more than 31 bits at this output_scale");
    p.shift.assign(static_cast<std::size_t>(n), 0);
    for (int k = 0; k < n; ++k)
      p.shift[static_cast<std::size_t>(k)] =
          p.q[static_cast<std::size_t>(k) + 1] + p.t_frac - p.q[static_cast<std::size_t>(k)];
    p.coef.assign(static_cast<std::size_t>(n) + 1, 0);
    bool coef_ok = true;
    for (int k = 0; k <= n; ++k) {
      const long double v =
          std::ldexp(m[static_cast<std::size_t>(k)], p.q[static_cast<std::size_t>(k)]);
      const long double r = std::nearbyint(v);
      if (std::fabs(r) > static_cast<long double>(kInt32Max)) {
        --p.q[static_cast<std::size_t>(k)];
        coef_ok = false;
        break;
      }
      p.coef[static_cast<std::size_t>(k)] = static_cast<std::int32_t>(r);
    }
    if (!coef_ok) continue;
    std::string reason;
    if (verify_fixed_bounds(&p, &reason)) {
      *out = p;
      return true;
    }
    // Lower the format of the step that failed (or all, for the output) and retry.
    const auto pos = reason.find("step ");
    if (pos != std::string::npos) {
      const int k = std::stoi(reason.substr(pos + 5));
      --p.q[static_cast<std::size_t>(reason.find("product") != std::string::npos ? k + 1 : k)];
    } else if (reason.find("output") != std::string::npos || reason.find("final") != std::string::npos) {
      --p.q[0];
    } else {
      return fail(reason);
    }
  }
  return fail("no fixed-point format found that provably avoids overflow");
}

std::int32_t eval_fixed(const FixedPlan& p, std::int32_t raw) {
  const std::int64_t d = static_cast<std::int64_t>(raw) - p.r0;
  const std::int64_t t = rshift_round(d * p.t_mul + p.t_add, p.t_shift);
  const int n = p.degree();
  std::int64_t acc = p.coef[static_cast<std::size_t>(n)];
  for (int k = n - 1; k >= 0; --k)
    acc = rshift_round(acc * t, p.shift[static_cast<std::size_t>(k)]) +
          p.coef[static_cast<std::size_t>(k)];
  if (p.q[0] > 0) acc = rshift_round(acc, p.q[0]);
  return static_cast<std::int32_t>(acc);
}

std::int32_t eval_fixed_checked(const FixedPlan& p, std::int32_t raw, int* status) {
  int st = kInRange;
  if (raw < p.settings.raw_min) {
    st = kBelowRange;
    raw = static_cast<std::int32_t>(p.settings.raw_min);
  } else if (raw > p.settings.raw_max) {
    st = kAboveRange;
    raw = static_cast<std::int32_t>(p.settings.raw_max);
  }
  if (status) *status = st;
  return eval_fixed(p, raw);
}

}  // namespace ridgecal::firmware
