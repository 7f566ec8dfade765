// Compiled with -ffp-contract=off (firmware-export/CMakeLists.txt). Do not
// add -ffast-math or anything that allows reassociation.
#include "ridgecal/firmware/float_emulation.hpp"

namespace ridgecal::firmware {

const char* to_string(Basis basis) { return basis == Basis::ScaledT ? "scaled t" : "raw x"; }

namespace {

template <typename T>
T eval_impl(const FloatingProgram<T>& p, T x) {
  const std::size_t n = p.coef.size();
  if (n == 0) return T(0);
  T v = x;
  if (p.basis == Basis::ScaledT) {
    const T d = x - p.center;  // one rounding
    v = d * p.inv_half_width;  // one rounding
  }
  T y = p.coef[n - 1];
  for (std::size_t k = n - 1; k-- > 0;) {
    const T prod = y * v;  // rounded product (no fused multiply-add)
    y = prod + p.coef[k];  // rounded sum
  }
  return y;
}

template <typename T>
T eval_checked_impl(const FloatingProgram<T>& p, T x, int* status) {
  // Same comparisons, in the same order, as the generated C (no == on floats).
  int s;
  if (x >= p.x_lo && x <= p.x_hi) {
    s = kInRange;
  } else if (x < p.x_lo) {
    s = kBelowRange;
    x = p.x_lo;
  } else if (x > p.x_hi) {
    s = kAboveRange;
    x = p.x_hi;
  } else {  // NaN
    s = kNotANumber;
    x = p.x_lo;
  }
  if (status) *status = s;
  return eval_impl(p, x);
}

}  // namespace

float eval_program(const FloatProgram& p, float x) { return eval_impl(p, x); }
double eval_program(const DoubleProgram& p, double x) { return eval_impl(p, x); }
float eval_program_checked(const FloatProgram& p, float x, int* status) {
  return eval_checked_impl(p, x, status);
}
double eval_program_checked(const DoubleProgram& p, double x, int* status) {
  return eval_checked_impl(p, x, status);
}

}  // namespace ridgecal::firmware
