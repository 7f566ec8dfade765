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
/// to the target type (these are the values written into the header). One
/// program for every model: an optional divider and ln on the reading, the
/// scaled inputs t = (u - center) * inv_half_width and (with an aux input)
/// s = (aux - aux_center) * aux_inv_half_width, the polynomial by nested
/// Horner's scheme v = sum_k t^k (sum_l coef[k][l] s^l), and an optional
/// reciprocal-kelvin output. A one-input model is the case aux_degree = 0,
/// has_aux = false, no transforms; its raw-x basis is center 0,
/// inv_half_width 1 (x - 0 and x * 1 are exact, so the result is unchanged).
template <typename T>
struct FloatingProgram {
  Basis basis = Basis::ScaledT;  ///< one-input header: which variable the Horner runs in
  bool divider = false;
  bool sensor_low = true;  ///< divider position
  T divider_r = 0;         ///< fixed resistor
  T divider_fs = 0;        ///< full scale counts
  bool ln = false;
  bool reciprocal_kelvin = false;
  T kelvin = 0;  ///< 273.15 rounded to T
  bool has_aux = false;
  T center = 0;  ///< t = (u - center) * inv_half_width
  T inv_half_width = 1;
  T aux_center = 0;  ///< s = (aux - aux_center) * aux_inv_half_width
  T aux_inv_half_width = 1;
  /// coef[k * (aux_degree + 1) + l]: coefficient of t^k s^l (row-major, the
  /// header's table order; one input: ascending powers of t or x)
  std::vector<T> coef;
  int reading_degree = 0;
  int aux_degree = 0;
  T x_lo = 0;  ///< valid raw reading range, rounded inward to T
  T x_hi = 0;
  T a_lo = 0, a_hi = 0;  ///< valid aux range (has_aux only)
};

using FloatProgram = FloatingProgram<float>;
using DoubleProgram = FloatingProgram<double>;

/// Status codes of the range-checked evaluation (same values as the header's
/// PREFIX_IN_RANGE / _BELOW_RANGE / _ABOVE_RANGE / _NOT_A_NUMBER macros).
enum RangeStatus : int { kInRange = 0, kBelowRange = 1, kAboveRange = 2, kNotANumber = 3 };
/// Status bits of the aux input: the low two bits are the reading's status,
/// the next two the aux input's (PREFIX_AUX_BELOW_RANGE = 4, _ABOVE_RANGE = 8,
/// _NOT_A_NUMBER = 12).
enum AuxRangeStatus : int { kAuxBelowRange = 4, kAuxAboveRange = 8, kAuxNotANumber = 12 };

/// Same operation sequence as PREFIX_eval() in the generated header. With
/// ln, the host's log/logf is used, which can differ by a few ulps from the
/// target's C library (see the bound in the header); otherwise bit-identical.
float eval_program(const FloatProgram& p, float x, float aux = 0.0f);
double eval_program(const DoubleProgram& p, double x, double aux = 0.0);
/// Same as PREFIX_eval_checked(): clamps into [x_lo, x_hi] (NaN -> x_lo) and
/// reports which case applied; with an aux input, the aux status bits
/// (kAuxBelowRange ..) are added.
float eval_program_checked(const FloatProgram& p, float x, int* status);
double eval_program_checked(const DoubleProgram& p, double x, int* status);
float eval_program_checked(const FloatProgram& p, float x, float aux, int* status);
double eval_program_checked(const DoubleProgram& p, double x, double aux, int* status);

}  // namespace ridgecal::firmware
