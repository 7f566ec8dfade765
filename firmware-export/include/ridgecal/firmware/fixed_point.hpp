// ridgecal firmware export: integer-only evaluation for MCUs without an FPU.
//
// Input: a raw integer reading r in [raw_min, raw_max] (e.g. ADC counts);
// the reading in reading units is x = r / input_scale.
// Output: round(p(x) * output_scale) as int32 (e.g. output_scale 1000 gives
// milli-units of the reference unit).
//
// Arithmetic (identical in the generated C and in eval_fixed below):
//   t_q   = rshift_round((r - r0) * t_mul + t_add, t_shift)     t in Q t_frac
//   acc_n = coef[n]                                             Q q[n]
//   acc_k = rshift_round(acc_{k+1} * t_q, shift[k]) + coef[k]   Q q[k], k = n-1..0
//   out   = rshift_round(acc_0, q[0])   (or acc_0 when q[0] == 0)
// with rshift_round(v, s) = floor((v + 2^(s-1)) / 2^s) (round half up),
// computed as ((uint64)(v + 2^62 + 2^(s-1)) >> s) - 2^(62-s): only a
// non-negative value is ever shifted, so no implementation-defined right shift
// of a negative number is involved. Valid for 1 <= s <= 61 and
// -2^62 <= v + 2^(s-1) < 2^62; plan_fixed() proves that for every step.
#pragma once

#include <cstdint>
#include <string>
#include <vector>

#include "ridgecal/poly_model.hpp"

namespace ridgecal::firmware {

struct FixedSettings {
  std::int64_t raw_min = 0;    ///< smallest raw input (int32 range)
  std::int64_t raw_max = 0;    ///< largest raw input (int32 range)
  double input_scale = 1.0;    ///< raw counts per reading unit
  double output_scale = 1000.0;  ///< output integer units per reference unit
};

/// A closed integer interval [lo, hi] (values proved to hold every possible
/// intermediate of one step).
struct IntRange {
  long double lo = 0;  // integers; long double holds them exactly up to 2^64
  long double hi = 0;
};

struct FixedPlan {
  FixedSettings settings;
  double calibrated_min = 0;  ///< the model's calibrated range (reading units)
  double calibrated_max = 0;
  std::int64_t r0 = 0;        ///< integer near the centre of the calibrated range (raw counts)
  std::int64_t t_mul = 0;     ///< t_q = rshift_round((r - r0) * t_mul + t_add, t_shift)
  std::int64_t t_add = 0;
  int t_shift = 1;
  int t_frac = 30;            ///< t_q is t in Q t_frac
  std::vector<std::int32_t> coef;  ///< coef[k] = round(m_k * output_scale * 2^q[k])
  std::vector<int> q;              ///< fraction bits of acc_k (and coef[k])
  std::vector<int> shift;          ///< shift[k] = q[k+1] + t_frac - q[k], k < n
  // The proof (exact integer interval bounds over [raw_min, raw_max]):
  IntRange t_pre;             ///< (r - r0) * t_mul + t_add
  IntRange t_q;               ///< t_q
  std::vector<IntRange> prod;  ///< acc_{k+1} * t_q, k < n
  std::vector<IntRange> acc;   ///< acc_k
  IntRange out;               ///< the int32 output
  int degree() const { return static_cast<int>(coef.size()) - 1; }
};

/// floor((v + 2^(s-1)) / 2^s) exactly as the generated C computes it.
std::int64_t rshift_round(std::int64_t v, int s);

/// Chooses Q formats and proves by interval arithmetic that no intermediate
/// leaves its range for any raw input in [raw_min, raw_max]. On failure
/// returns false and writes the reason to *why.
bool plan_fixed(const PolyModel& model, const FixedSettings& settings, FixedPlan* plan,
                std::string* why);

/// Re-checks the proof stored in plan (used by plan_fixed and the tests):
/// recomputes every interval from the plan's integers and checks the limits.
bool verify_fixed_bounds(FixedPlan* plan, std::string* why);

/// Same integer operations as PREFIX_eval_fixed() in the generated header.
/// Precondition: raw in [raw_min, raw_max].
std::int32_t eval_fixed(const FixedPlan& plan, std::int32_t raw);
/// Same as PREFIX_eval_fixed_checked(): clamps raw into range, reports status
/// (kInRange / kBelowRange / kAboveRange from float_emulation.hpp).
std::int32_t eval_fixed_checked(const FixedPlan& plan, std::int32_t raw, int* status);

}  // namespace ridgecal::firmware
