// ridgecal firmware export for extended ("surface") models: an optional second
// input (aux), linearising transforms (divider, ln, reciprocal-kelvin) and a
// 2-D polynomial evaluated by nested Horner's scheme
//   v = sum_k t^k (sum_l m[k][l] s^l),  m = SurfaceModel::monomial_in_scaled().
// See docs/firmware-export.md ("Extended models").
#pragma once

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "ridgecal/firmware/export.hpp"
#include "ridgecal/surface_model.hpp"

namespace ridgecal::firmware {

/// Affine integer map of one raw input onto its scaled variable in Q frac:
///   q = rshift_round((raw - r0) * mul + add, shift)
struct FixedAxis {
  std::int64_t raw_min = 0, raw_max = 0;
  double scale = 1.0;  ///< raw counts per input unit
  std::int64_t r0 = 0, mul = 0, add = 0;
  int shift = 1, frac = 30;
  IntRange pre, q;  ///< proved bounds of (raw - r0) * mul + add and of q
};

/// Integer-only plan of the 2-D polynomial (no transforms). Table order and
/// arithmetic as in the generated PREFIX_eval_fixed():
///   w_k   = Horner in s_q over row k: a = coef[k][L]; a = rshift_round(a * s_q, sh_in[k][l]) + coef[k][l]
///   acc   = w_K; acc = rshift_round(acc * t_q, sh_out[k]) + w_k  (k = K-1..0)
///   out   = rshift_round(acc, q[0][0]) (or acc when q[0][0] == 0)
/// coef[k][l] and the inner accumulator at (k, l) are in Q q[k][l];
/// sh_in[k][l] = q[k][l+1] + s.frac - q[k][l], sh_out[k] = q[k+1][0] + t.frac - q[k][0].
struct SurfaceFixedPlan {
  double output_scale = 1000.0;
  bool has_aux = false;
  FixedAxis t, s;
  int reading_degree = 0, aux_degree = 0;
  std::vector<std::int32_t> coef;  ///< row-major [k * (L + 1) + l]
  std::vector<int> q;              ///< row-major, as coef
  std::vector<int> sh_in;          ///< row-major [k * L + l], l < L
  std::vector<int> sh_out;         ///< k < K
  // Proved bounds (exact integer interval arithmetic over the raw ranges):
  long double max_abs_product = 0;  ///< largest |a * s_q| or |acc * t_q|
  long double max_abs_acc = 0;      ///< largest |accumulator| (int32 required)
  IntRange out;
  double calibrated_reading_min = 0, calibrated_reading_max = 0;
  double calibrated_aux_min = 0, calibrated_aux_max = 0;
};

/// Chooses the Q formats and proves by interval arithmetic that no
/// intermediate overflows for any raw input pair in the raw ranges.
/// Precondition: the model's transforms are the identity.
bool plan_surface_fixed(const SurfaceModel& model, const ExportOptions& options, SurfaceFixedPlan* plan,
                        std::string* why);
/// Re-checks the plan's proof from its integers (also used by the tests).
bool verify_surface_fixed_bounds(SurfaceFixedPlan* plan, std::string* why);
/// Same integer operations as PREFIX_eval_fixed(raw[, raw_aux]).
std::int32_t eval_surface_fixed(const SurfaceFixedPlan& plan, std::int32_t raw, std::int32_t raw_aux);
/// As PREFIX_eval_fixed_checked(): clamps both inputs, status bits as above.
std::int32_t eval_surface_fixed_checked(const SurfaceFixedPlan& plan, std::int32_t raw, std::int32_t raw_aux,
                                        int* status);

/// Result of a surface export: the common result plus the surface programs.
struct SurfaceExportResult {
  ExportResult common;  ///< status, message, header, deviation, CRC, stats
  double deviation_at_aux = 0;  ///< aux value where the max deviation occurred
  /// Models with ln: the allowance added to the measured deviation for a
  /// target C library whose log/logf differs from the host's by up to
  /// kLogUlps ulps of its result, propagated to the output (reference units).
  double libm_allowance = 0;
  std::optional<FloatProgram> float_program;  ///< eval_program()
  std::optional<DoubleProgram> double_program;
  std::optional<SurfaceFixedPlan> fixed_plan;
  bool ok() const { return common.ok(); }
};

/// ulps of log/logf result assumed for a target C library (glibc, newlib and
/// avr-libc; see docs/firmware-export.md for what was measured).
inline constexpr double kLogUlps = 4.0;

/// Generates the header for an extended model. Never throws for bad input.
/// Fixed mode with a transform (divider, ln, reciprocal-kelvin) is refused as
/// InvalidInput (use float or double).
SurfaceExportResult generate_surface_header(const SurfaceModel& model, const HeaderMeta& meta,
                                            const ExportOptions& options);

/// The valid raw-reading range of the model: the calibrated range of the
/// transformed reading mapped back through the transforms (sorted).
std::pair<double, double> surface_reading_range(const SurfaceModel& model);

}  // namespace ridgecal::firmware
