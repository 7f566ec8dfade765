// ridgecal firmware export: integer-only evaluation for MCUs without an FPU.
//
// Input: a raw integer reading r in [raw_min, raw_max] (e.g. ADC counts),
// the reading in reading units is x = r / input_scale; with a second input
// likewise a raw aux integer. Output: round(p(x[, aux]) * output_scale) as
// int32 (e.g. output_scale 1000 gives milli-units of the reference unit).
//
// Arithmetic (identical in the generated C and in eval_fixed below):
//   t_q = rshift_round((r - r0) * mul + add, shift)               t in Q t.frac
//   s_q likewise from the raw aux value (second input only)
//   w_k = Horner in s_q over row k: a = coef[k][L];
//         a = rshift_round(a * s_q, sh_in[k][l]) + coef[k][l]    Q q[k][l]
//   acc = w_K; acc = rshift_round(acc * t_q, sh_out[k]) + w_k     k = K-1..0
//   out = rshift_round(acc, q[0][0])   (or acc when q[0][0] == 0)
// One input is the case L = 0: acc_k = rshift_round(acc_{k+1} * t_q, sh_out[k]) + coef[k].
// rshift_round(v, s) = floor((v + 2^(s-1)) / 2^s) (round half up), computed
// as ((uint64)(v + 2^62 + 2^(s-1)) >> s) - 2^(62-s): only a non-negative value
// is ever shifted, so no implementation-defined right shift of a negative
// number is involved. Valid for 1 <= s <= 61 and -2^62 <= v + 2^(s-1) < 2^62;
// plan_fixed() proves that for every step.
#pragma once

#include <cstdint>
#include <string>
#include <vector>

#include "ridgecal/firmware/firmware_model.hpp"

namespace ridgecal::firmware {

struct ExportOptions;

/// A closed integer interval [lo, hi] (values proved to hold every possible
/// intermediate of one step).
struct IntRange {
  long double lo = 0;  // integers; long double holds them exactly up to 2^64
  long double hi = 0;
};

/// Affine integer map of one raw input onto its scaled variable in Q frac:
///   q = rshift_round((raw - r0) * mul + add, shift)
struct FixedAxis {
  std::int64_t raw_min = 0, raw_max = 0;
  double scale = 1.0;  ///< raw counts per input unit
  std::int64_t r0 = 0, mul = 0, add = 0;
  int shift = 1, frac = 30;
  IntRange pre, q;  ///< proved bounds of (raw - r0) * mul + add and of q
};

/// Integer-only plan of the polynomial (no transforms), one or two inputs.
/// coef[k][l] and the inner accumulator at (k, l) are in Q q[k][l];
/// sh_in[k][l] = q[k][l+1] + s.frac - q[k][l], sh_out[k] = q[k+1][0] + t.frac - q[k][0].
struct FixedPlan {
  double output_scale = 1000.0;
  bool has_aux = false;
  FixedAxis t, s;  ///< the reading and (has_aux) the aux input
  int reading_degree = 0, aux_degree = 0;
  std::vector<std::int32_t> coef;  ///< row-major [k * (L + 1) + l]
  std::vector<int> q;              ///< row-major, as coef
  std::vector<int> sh_in;          ///< row-major [k * L + l], l < L
  std::vector<int> sh_out;         ///< k < K
  // Proved bounds (exact integer interval arithmetic over the raw ranges):
  std::vector<IntRange> prod;       ///< outer step k < K: acc * t_q
  std::vector<IntRange> acc;        ///< outer accumulator after step k (k = K: w_K)
  long double max_abs_product = 0;  ///< largest |a * s_q| or |acc * t_q|
  long double max_abs_acc = 0;      ///< largest |accumulator| (int32 required)
  IntRange out;
  double calibrated_reading_min = 0, calibrated_reading_max = 0;
  double calibrated_aux_min = 0, calibrated_aux_max = 0;
  int degree() const { return reading_degree; }
};

/// floor((v + 2^(s-1)) / 2^s) exactly as the generated C computes it.
std::int64_t rshift_round(std::int64_t v, int s);

/// Chooses the Q formats and proves by interval arithmetic that no
/// intermediate overflows for any raw input (pair) in the raw ranges (from
/// options, default: the integers inside the calibrated ranges). On failure
/// returns false and writes the reason to *why. Precondition: the model's
/// transforms are the identity.
bool plan_fixed(const FirmwareModel& model, const ExportOptions& options, FixedPlan* plan,
                std::string* why);
/// Re-checks the plan's proof from its integers (used by plan_fixed and the tests).
bool verify_fixed_bounds(FixedPlan* plan, std::string* why);
/// Same integer operations as PREFIX_eval_fixed(raw[, raw_aux]).
/// Precondition: the inputs in their raw ranges.
std::int32_t eval_fixed(const FixedPlan& plan, std::int32_t raw, std::int32_t raw_aux = 0);
/// As PREFIX_eval_fixed_checked(): clamps the inputs into their raw ranges and
/// reports the status (kInRange .. from float_emulation.hpp, plus the aux bits).
std::int32_t eval_fixed_checked(const FixedPlan& plan, std::int32_t raw, int* status);
std::int32_t eval_fixed_checked(const FixedPlan& plan, std::int32_t raw, std::int32_t raw_aux,
                                int* status);

}  // namespace ridgecal::firmware
