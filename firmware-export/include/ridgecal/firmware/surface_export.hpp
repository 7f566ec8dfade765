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

/// Result of a surface export: the common result plus the surface programs.
struct SurfaceExportResult {
  ExportResult common;          ///< status, message, header, deviation, CRC, stats
  double deviation_at_aux = 0;  ///< aux value where the max deviation occurred
  /// Models with ln: the allowance added to the measured deviation for a
  /// target C library whose log/logf differs from the host's by up to
  /// kLogUlps ulps of its result, propagated to the output (reference units).
  double libm_allowance = 0;
  std::optional<FloatProgram> float_program;  ///< eval_program()
  std::optional<DoubleProgram> double_program;
  std::optional<FixedPlan> fixed_plan;  ///< eval_fixed()
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
