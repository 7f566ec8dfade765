// Integer-only evaluation of the polynomial in one or two inputs (no
// transforms): Q-format choice and the overflow proof by exact integer
// interval arithmetic.
#include "ridgecal/firmware/fixed_point.hpp"

#include <algorithm>
#include <cmath>

#include "exact_int.hpp"
#include "ridgecal/firmware/export.hpp"
#include "ridgecal/firmware/float_emulation.hpp"

namespace ridgecal::firmware {

namespace {

using detail::i128;
using detail::kAccBits;
using detail::kInt32Max;
using detail::kMaxShift;
using detail::rshift_precondition;
using detail::rshift_round_exact;
struct IR {
  i128 lo, hi;
};
IR imul(IR a, IR b) {
  const i128 c[4] = {a.lo * b.lo, a.lo * b.hi, a.hi * b.lo, a.hi * b.hi};
  return {*std::min_element(c, c + 4), *std::max_element(c, c + 4)};
}
long double mag(IR a) {
  return std::max(std::fabs(static_cast<long double>(a.lo)),
                  std::fabs(static_cast<long double>(a.hi)));
}
IntRange to_range(IR r) {
  return {static_cast<long double>(r.lo), static_cast<long double>(r.hi)};
}
bool fits32(IR r) {
  return r.lo >= -kInt32Max && r.hi <= kInt32Max;
}

struct DI {
  double lo, hi;
};
DI dmul(DI a, DI b) {
  const double c[4] = {a.lo * b.lo, a.lo * b.hi, a.hi * b.lo, a.hi * b.hi};
  return {*std::min_element(c, c + 4), *std::max_element(c, c + 4)};
}
double dmag(DI a) {
  return std::max(std::fabs(a.lo), std::fabs(a.hi));
}

int q_for(double need) {
  if (!(need > 0)) return 60;
  return std::min(60, static_cast<int>(std::floor(kAccBits - std::log2(need * (1 + 1e-6)))));
}

// Input map of one axis; returns "" or the reason (one_input: the wording of
// the one-input header, which names the raw range).
std::string plan_axis(FixedAxis* a, double center, double half_width, DI* range_scaled,
                      bool one_input) {
  const double w = a->scale * half_width;  // raw counts per unit of the scaled variable
  const double c_raw = center * a->scale;
  if (!(w > 0) || !std::isfinite(w) || !std::isfinite(c_raw)) return "degenerate scaling";
  if (std::fabs(c_raw) > 2.0e9) return "calibrated centre is outside the int32 raw range";
  a->r0 = std::llround(c_raw);
  const double v_min = (static_cast<double>(a->raw_min) - c_raw) / w;
  const double v_max = (static_cast<double>(a->raw_max) - c_raw) / w;
  const double v_mag = std::max({std::fabs(v_min), std::fabs(v_max), 1.0});
  a->frac = 30 - std::max(0, static_cast<int>(std::ceil(std::log2(v_mag) - 1e-12)));
  if (a->frac < 8)
    return one_input ? "raw range [" + std::to_string(a->raw_min) + ", " +
                           std::to_string(a->raw_max) + "] extends far beyond the calibrated range"
                     : std::string("raw range extends far beyond the calibrated range");
  a->shift = 0;
  for (int sh = kMaxShift; sh >= 1; --sh) {
    const long double m = std::ldexp(1.0L, sh + a->frac) / static_cast<long double>(w);
    if (m < 2147483648.0L) {
      a->shift = sh;
      a->mul = std::llround(m);
      break;
    }
  }
  if (a->shift == 0 || a->mul <= 0) return "cannot represent 1/half_width in the input map";
  a->add = std::llround((static_cast<long double>(a->r0) - static_cast<long double>(c_raw)) *
                        static_cast<long double>(a->mul));
  *range_scaled = DI{std::min(v_min, v_max) - 1e-6, std::max(v_min, v_max) + 1e-6};
  return {};
}

std::string verify_axis(FixedAxis* a, IR* q) {
  const i128 d_lo = static_cast<i128>(a->raw_min) - a->r0,
             d_hi = static_cast<i128>(a->raw_max) - a->r0;
  const IR pre{d_lo * a->mul + a->add, d_hi * a->mul + a->add};
  a->pre = to_range(pre);
  if (!rshift_precondition(pre.lo, pre.hi, a->shift)) return "input map leaves the shift's range";
  *q = IR{rshift_round_exact(pre.lo, a->shift), rshift_round_exact(pre.hi, a->shift)};
  a->q = to_range(*q);
  if (!fits32(*q)) return "scaled input does not fit in int32";
  return {};
}

std::size_t idx(int k, int l, int L) {
  return static_cast<std::size_t>(k) * static_cast<std::size_t>(L + 1) +
         static_cast<std::size_t>(l);
}

std::int64_t axis_value(const FixedAxis& a, std::int32_t raw) {
  return rshift_round((static_cast<std::int64_t>(raw) - a.r0) * a.mul + a.add, a.shift);
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
  const auto fail = [&](const std::string& m) {
    if (why) *why = m;
    return false;
  };
  const int K = p.reading_degree, L = p.aux_degree;
  IR tq{0, 0}, sq{0, 0};
  if (std::string e = verify_axis(&p.t, &tq); !e.empty()) return fail("reading: " + e);
  if (p.has_aux) {
    if (std::string e = verify_axis(&p.s, &sq); !e.empty()) return fail("aux: " + e);
  } else if (L != 0) {
    return fail("aux degree without an aux input");
  }
  p.max_abs_product = 0;
  p.max_abs_acc = 0;
  std::vector<IR> w(static_cast<std::size_t>(K) + 1);
  for (int k = 0; k <= K; ++k) {
    IR a{p.coef[idx(k, L, L)], p.coef[idx(k, L, L)]};
    for (int l = L - 1; l >= 0; --l) {
      const IR prod = imul(a, sq);
      p.max_abs_product = std::max(p.max_abs_product, mag(prod));
      const int sh = p.sh_in[static_cast<std::size_t>(k * L + l)];
      if (!rshift_precondition(prod.lo, prod.hi, sh))
        return fail("row " + std::to_string(k) + " step " + std::to_string(l) +
                    ": product leaves the shift's range");
      const std::int32_t c = p.coef[idx(k, l, L)];
      a = IR{rshift_round_exact(prod.lo, sh) + c, rshift_round_exact(prod.hi, sh) + c};
      p.max_abs_acc = std::max(p.max_abs_acc, mag(a));
      if (!fits32(a))
        return fail("row " + std::to_string(k) + " step " + std::to_string(l) + ": exceeds int32");
    }
    w[static_cast<std::size_t>(k)] = a;
  }
  IR acc = w[static_cast<std::size_t>(K)];
  p.prod.assign(static_cast<std::size_t>(K), IntRange{});
  p.acc.assign(static_cast<std::size_t>(K) + 1, IntRange{});
  p.acc[static_cast<std::size_t>(K)] = to_range(acc);
  for (int k = K - 1; k >= 0; --k) {
    const IR prod = imul(acc, tq);
    p.prod[static_cast<std::size_t>(k)] = to_range(prod);
    p.max_abs_product = std::max(p.max_abs_product, mag(prod));
    const int sh = p.sh_out[static_cast<std::size_t>(k)];
    if (!rshift_precondition(prod.lo, prod.hi, sh))
      return fail("outer step " + std::to_string(k) + ": product leaves the shift's range");
    const IR wk = w[static_cast<std::size_t>(k)];
    acc = IR{rshift_round_exact(prod.lo, sh) + wk.lo, rshift_round_exact(prod.hi, sh) + wk.hi};
    p.acc[static_cast<std::size_t>(k)] = to_range(acc);
    p.max_abs_acc = std::max(p.max_abs_acc, mag(acc));
    if (!fits32(acc)) return fail("outer step " + std::to_string(k) + ": exceeds int32");
  }
  const int q0 = p.q[0];
  if (q0 < 0) return fail("output needs more than 31 bits at this output_scale");
  IR out = acc;
  if (q0 > 0) {
    if (!rshift_precondition(acc.lo, acc.hi, q0)) return fail("final shift out of range");
    out = IR{rshift_round_exact(acc.lo, q0), rshift_round_exact(acc.hi, q0)};
  }
  p.out = to_range(out);
  if (!fits32(out)) return fail("output exceeds int32");
  return true;
}

bool plan_fixed(const FirmwareModel& model, const ExportOptions& o, FixedPlan* out,
                std::string* why) {
  const auto fail = [&](const std::string& m) {
    if (why) *why = m;
    return false;
  };
  if (!model.transforms.identity())
    return fail(
        "the model has transforms (" + model.transforms.describe() +
        "); fixed point supports the plain 2-D polynomial only: use --numeric float or double");
  if (model.monomial.empty() || model.inputs.empty()) return fail("model has no coefficients");
  // The one-input header names the raw range in its messages and prefixes no axis.
  const bool one_input = !model.extended;
  const std::string reading_prefix = one_input ? "" : "reading: ";
  FixedPlan p;
  p.output_scale = o.output_scale;
  p.has_aux = model.has_aux();
  p.reading_degree = model.reading_degree;
  p.aux_degree = p.has_aux ? model.aux_degree : 0;
  const int K = p.reading_degree, L = p.aux_degree;
  const AxisScaling& in = model.inputs[0];
  const auto clamp32 = [](double v) {
    return static_cast<std::int64_t>(std::fmax(-2147483647.0, std::fmin(2147483647.0, v)));
  };
  p.t.scale = o.input_scale;
  p.t.raw_min = o.raw_min ? *o.raw_min : clamp32(std::ceil(in.min * o.input_scale - 1e-9));
  p.t.raw_max = o.raw_max ? *o.raw_max : clamp32(std::floor(in.max * o.input_scale + 1e-9));
  p.calibrated_reading_min = in.min;
  p.calibrated_reading_max = in.max;
  if (p.t.raw_min > p.t.raw_max)
    return fail(
        one_input
            ? "no integer raw input in the range (raw_min " + std::to_string(p.t.raw_min) +
                  " > raw_max " + std::to_string(p.t.raw_max) +
                  "); for non-integer readings set input_scale (raw counts per reading unit) or "
                  "raw_min/raw_max"
            : "no integer raw reading in the calibrated range; set --input-scale (raw counts per "
              "reading unit)");
  DI T{0, 0}, S{0, 0};
  if (std::string e = plan_axis(&p.t, in.center, in.half_width, &T, one_input); !e.empty())
    return fail(reading_prefix + e);
  if (p.has_aux) {
    const AxisScaling& ax = model.inputs[1];
    p.s.scale = o.aux_input_scale;
    p.s.raw_min =
        o.aux_raw_min ? *o.aux_raw_min : clamp32(std::ceil(ax.min * o.aux_input_scale - 1e-9));
    p.s.raw_max =
        o.aux_raw_max ? *o.aux_raw_max : clamp32(std::floor(ax.max * o.aux_input_scale + 1e-9));
    p.calibrated_aux_min = ax.min;
    p.calibrated_aux_max = ax.max;
    if (p.s.raw_min > p.s.raw_max)
      return fail(
          "no integer raw aux value in the calibrated range; set --aux-scale (raw counts per aux "
          "unit)");
    if (std::string e = plan_axis(&p.s, ax.center, ax.half_width, &S, false); !e.empty())
      return fail("aux: " + e);
  }
  // Real-valued bounds of every intermediate -> initial Q formats.
  std::vector<long double> mv;  // scaled by output_scale, row-major
  for (std::size_t i = 0; i < model.monomial.size(); ++i) {
    const long double v = static_cast<long double>(model.monomial[i]) * o.output_scale;
    if (!std::isfinite(static_cast<double>(v))) return fail("non-finite coefficient");
    mv.push_back(v);
  }
  std::vector<double> need(mv.size(), 0.0);
  std::vector<DI> w(static_cast<std::size_t>(K) + 1);
  for (int k = 0; k <= K; ++k) {
    const double top = static_cast<double>(mv[idx(k, L, L)]);
    DI y{top, top};
    need[idx(k, L, L)] = dmag(y);
    for (int l = L - 1; l >= 0; --l) {
      const DI prod = dmul(y, S);
      const double c = static_cast<double>(mv[idx(k, l, L)]);
      y = DI{prod.lo + c, prod.hi + c};
      need[idx(k, l, L)] = std::max({dmag(y), dmag(prod), std::fabs(c)});
    }
    w[static_cast<std::size_t>(k)] = y;
  }
  DI acc = w[static_cast<std::size_t>(K)];
  for (int k = K - 1; k >= 0; --k) {
    const DI prod = dmul(acc, T);
    const DI wk = w[static_cast<std::size_t>(k)];
    acc = DI{prod.lo + wk.lo, prod.hi + wk.hi};
    need[idx(k, 0, L)] = std::max({need[idx(k, 0, L)], dmag(acc), dmag(prod)});
  }
  p.q.assign(mv.size(), 0);
  for (std::size_t i = 0; i < mv.size(); ++i) p.q[i] = q_for(need[i]);

  for (int attempt = 0; attempt < 200; ++attempt) {
    // shift constraints 1 <= shift <= kMaxShift, by lowering formats only
    for (int pass = 0; pass < 2 * (K + L + 2); ++pass) {
      for (int k = 0; k <= K; ++k)
        for (int l = L - 1; l >= 0; --l) {
          int& ql = p.q[idx(k, l, L)];
          int& qn = p.q[idx(k, l + 1, L)];
          ql = std::min(ql, qn + p.s.frac - 1);
          qn = std::min(qn, ql + kMaxShift - p.s.frac);
        }
      for (int k = K - 1; k >= 0; --k) {
        int& qk = p.q[idx(k, 0, L)];
        int& qn = p.q[idx(k + 1, 0, L)];
        qk = std::min(qk, qn + p.t.frac - 1);
        qn = std::min(qn, qk + kMaxShift - p.t.frac);
      }
    }
    if (p.q[0] < 0) return fail("output needs more than 31 bits at this output_scale");
    p.sh_in.assign(static_cast<std::size_t>((K + 1) * L), 0);
    for (int k = 0; k <= K; ++k)
      for (int l = 0; l < L; ++l)
        p.sh_in[static_cast<std::size_t>(k * L + l)] =
            p.q[idx(k, l + 1, L)] + p.s.frac - p.q[idx(k, l, L)];
    p.sh_out.assign(static_cast<std::size_t>(K), 0);
    for (int k = 0; k < K; ++k)
      p.sh_out[static_cast<std::size_t>(k)] = p.q[idx(k + 1, 0, L)] + p.t.frac - p.q[idx(k, 0, L)];
    p.coef.assign(mv.size(), 0);
    bool coef_ok = true;
    for (std::size_t i = 0; i < mv.size(); ++i) {
      const long double r = std::nearbyint(std::ldexp(mv[i], p.q[i]));
      if (std::fabs(r) > static_cast<long double>(kInt32Max)) {
        --p.q[i];
        coef_ok = false;
        break;
      }
      p.coef[i] = static_cast<std::int32_t>(r);
    }
    if (!coef_ok) continue;
    std::string reason;
    if (verify_fixed_bounds(&p, &reason)) {
      *out = p;
      return true;
    }
    if (reason.find("input map") != std::string::npos ||
        reason.find("scaled input") != std::string::npos)
      return fail(reason);
    for (int& q : p.q) --q;  // coarser everywhere (shifts are unchanged) and retry
  }
  return fail("no fixed-point format found that provably avoids overflow");
}

std::int32_t eval_fixed(const FixedPlan& p, std::int32_t raw, std::int32_t raw_aux) {
  const std::int64_t t = axis_value(p.t, raw);
  const std::int64_t s = p.has_aux ? axis_value(p.s, raw_aux) : 0;
  const int K = p.reading_degree, L = p.aux_degree;
  std::int64_t acc = 0;
  for (int k = K; k >= 0; --k) {
    std::int64_t a = p.coef[idx(k, L, L)];
    for (int l = L - 1; l >= 0; --l)
      a = rshift_round(a * s, p.sh_in[static_cast<std::size_t>(k * L + l)]) + p.coef[idx(k, l, L)];
    acc = k == K ? a : rshift_round(acc * t, p.sh_out[static_cast<std::size_t>(k)]) + a;
  }
  if (p.q[0] > 0) acc = rshift_round(acc, p.q[0]);
  return static_cast<std::int32_t>(acc);
}

std::int32_t eval_fixed_checked(const FixedPlan& p, std::int32_t raw, int* status) {
  return eval_fixed_checked(p, raw, 0, status);
}

std::int32_t eval_fixed_checked(const FixedPlan& p, std::int32_t raw, std::int32_t raw_aux,
                                int* status) {
  int st = kInRange;
  if (raw < p.t.raw_min) {
    st = kBelowRange;
    raw = static_cast<std::int32_t>(p.t.raw_min);
  } else if (raw > p.t.raw_max) {
    st = kAboveRange;
    raw = static_cast<std::int32_t>(p.t.raw_max);
  }
  if (p.has_aux) {
    if (raw_aux < p.s.raw_min) {
      st += kAuxBelowRange;
      raw_aux = static_cast<std::int32_t>(p.s.raw_min);
    } else if (raw_aux > p.s.raw_max) {
      st += kAuxAboveRange;
      raw_aux = static_cast<std::int32_t>(p.s.raw_max);
    }
  }
  if (status) *status = st;
  return eval_fixed(p, raw, raw_aux);
}

}  // namespace ridgecal::firmware
