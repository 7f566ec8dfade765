// Compiled with -ffp-contract=off (firmware-export/CMakeLists.txt): every
// operation below is one rounded IEEE operation, in the order of the generated
// PREFIX_eval(). Do not add -ffast-math or anything that allows reassociation.
#include "ridgecal/firmware/float_emulation.hpp"

#include <cmath>

namespace ridgecal::firmware {

const char* to_string(Basis basis) {
  return basis == Basis::ScaledT ? "scaled t" : "raw x";
}

namespace {

template <typename T>
T eval_impl(const FloatingProgram<T>& p, T x, T aux) {
  if (p.coef.empty()) return T(0);
  T u = x;
  if (p.divider) {
    if (p.sensor_low) {
      const T num = p.divider_r * x;
      const T den = p.divider_fs - x;
      u = num / den;
    } else {
      const T diff = p.divider_fs - x;
      const T num = p.divider_r * diff;
      u = num / x;
    }
  }
  if (p.ln) u = std::log(u);  // logf for float
  const T du = u - p.center;  // one rounding (exact for the raw-x basis)
  const T t = du * p.inv_half_width;
  T s = 0;
  if (p.has_aux) {
    const T da = aux - p.aux_center;
    s = da * p.aux_inv_half_width;
  }
  const int L = p.aux_degree;
  T v = 0;
  for (int k = p.reading_degree; k >= 0; --k) {
    const std::size_t row = static_cast<std::size_t>(k) * static_cast<std::size_t>(L + 1);
    T w = p.coef[row + static_cast<std::size_t>(L)];
    for (int l = L - 1; l >= 0; --l) {
      const T prod = w * s;  // rounded product (no fused multiply-add)
      w = prod + p.coef[row + static_cast<std::size_t>(l)];
    }
    if (k == p.reading_degree) {
      v = w;
    } else {
      const T prod = v * t;
      v = prod + w;
    }
  }
  if (p.reciprocal_kelvin) {
    const T inv = T(1) / v;
    v = inv - p.kelvin;
  }
  return v;
}

// Same comparisons, in the same order, as the generated C (no == on floats).
template <typename T>
int clamp_status(T* x, T lo, T hi) {
  if (*x >= lo && *x <= hi) return kInRange;
  if (*x < lo) {
    *x = lo;
    return kBelowRange;
  }
  if (*x > hi) {
    *x = hi;
    return kAboveRange;
  }
  *x = lo;  // NaN
  return kNotANumber;
}

template <typename T>
T eval_checked_impl(const FloatingProgram<T>& p, T x, T aux, int* status) {
  int st = clamp_status(&x, p.x_lo, p.x_hi);
  if (p.has_aux) st += 4 * clamp_status(&aux, p.a_lo, p.a_hi);
  if (status) *status = st;
  return eval_impl(p, x, aux);
}

}  // namespace

float eval_program(const FloatProgram& p, float x, float aux) {
  return eval_impl(p, x, aux);
}
double eval_program(const DoubleProgram& p, double x, double aux) {
  return eval_impl(p, x, aux);
}
float eval_program_checked(const FloatProgram& p, float x, int* status) {
  return eval_checked_impl(p, x, 0.0f, status);
}
double eval_program_checked(const DoubleProgram& p, double x, int* status) {
  return eval_checked_impl(p, x, 0.0, status);
}
float eval_program_checked(const FloatProgram& p, float x, float aux, int* status) {
  return eval_checked_impl(p, x, aux, status);
}
double eval_program_checked(const DoubleProgram& p, double x, double aux, int* status) {
  return eval_checked_impl(p, x, aux, status);
}

}  // namespace ridgecal::firmware
