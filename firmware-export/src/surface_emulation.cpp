// Compiled with -ffp-contract=off (firmware-export/CMakeLists.txt): every
// operation below is one rounded IEEE operation, in the order of the generated
// PREFIX_eval() for extended models (surface_header.cpp).
#include <cmath>

#include "ridgecal/firmware/float_emulation.hpp"
#include "ridgecal/firmware/surface_export.hpp"

namespace ridgecal::firmware {

namespace {

template <typename T>
T log_of(T r) {
  if constexpr (std::is_same_v<T, float>)
    return std::log(r);  // logf
  else
    return std::log(r);
}

template <typename T>
T eval_impl(const SurfaceFloatingProgram<T>& p, T x, T aux) {
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
  if (p.ln) u = log_of(u);
  const T du = u - p.t_center;
  const T t = du * p.t_scale;
  T s = 0;
  if (p.has_aux) {
    const T da = aux - p.s_center;
    s = da * p.s_scale;
  }
  const int L = p.aux_degree;
  T v = 0;
  for (int k = p.reading_degree; k >= 0; --k) {
    const std::size_t row = static_cast<std::size_t>(k) * static_cast<std::size_t>(L + 1);
    T w = p.coef[row + static_cast<std::size_t>(L)];
    for (int l = L - 1; l >= 0; --l) {
      const T prod = w * s;
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
T eval_checked_impl(const SurfaceFloatingProgram<T>& p, T x, T aux, int* status) {
  int st = clamp_status(&x, p.x_lo, p.x_hi);
  if (p.has_aux) st += 4 * clamp_status(&aux, p.a_lo, p.a_hi);
  if (status) *status = st;
  return eval_impl(p, x, aux);
}

}  // namespace

float eval_surface(const SurfaceFloatProgram& p, float x, float aux) { return eval_impl(p, x, aux); }
double eval_surface(const SurfaceDoubleProgram& p, double x, double aux) { return eval_impl(p, x, aux); }
float eval_surface_checked(const SurfaceFloatProgram& p, float x, float aux, int* status) {
  return eval_checked_impl(p, x, aux, status);
}
double eval_surface_checked(const SurfaceDoubleProgram& p, double x, double aux, int* status) {
  return eval_checked_impl(p, x, aux, status);
}

}  // namespace ridgecal::firmware
