// ridgecal firmware export: exact host emulation of the generated float and
// double evaluation code.
//
// The implementation file is compiled with -ffp-contract=off (see
// CMakeLists.txt): every multiply and add below is one rounded IEEE operation,
// in the same order as the generated C, so the host result is the bit pattern
// a conforming target (built with -ffp-contract=off) produces.
#pragma once

#include <vector>

namespace ridgecal::firmware {

/// Which variable the generated Horner runs in.
enum class Basis {
  ScaledT,  ///< t = (x - center) * inv_half_width, then Horner on monomial_in_t
  RawX,     ///< Horner directly on power_in_x
};

const char* to_string(Basis basis);

/// Everything the generated float/double code computes with, already rounded
/// to the target type (these are the values written into the header).
template <typename T>
struct FloatingProgram {
  Basis basis = Basis::ScaledT;
  T center = 0;          ///< used for ScaledT only
  T inv_half_width = 1;  ///< used for ScaledT only
  std::vector<T> coef;   ///< ascending powers of t (or x)
  T x_lo = 0;            ///< valid input range, rounded inward to T
  T x_hi = 0;
};

using FloatProgram = FloatingProgram<float>;
using DoubleProgram = FloatingProgram<double>;

/// Status codes of the range-checked evaluation (same values as the header's
/// PREFIX_IN_RANGE / _BELOW_RANGE / _ABOVE_RANGE / _NOT_A_NUMBER macros).
enum RangeStatus : int { kInRange = 0, kBelowRange = 1, kAboveRange = 2, kNotANumber = 3 };

/// Same operation sequence as PREFIX_eval() in the generated header.
float eval_program(const FloatProgram& p, float x);
double eval_program(const DoubleProgram& p, double x);
/// Same as PREFIX_eval_checked(): clamps into [x_lo, x_hi] (NaN -> x_lo) and
/// reports which case applied.
float eval_program_checked(const FloatProgram& p, float x, int* status);
double eval_program_checked(const DoubleProgram& p, double x, int* status);

}  // namespace ridgecal::firmware
