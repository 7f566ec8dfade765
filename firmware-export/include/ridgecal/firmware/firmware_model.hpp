// ridgecal firmware export: the firmware-side description of a fitted model,
// produced from the fitter's model by one adapter (firmware_model()). Every
// generator stage (emulation, fixed-point plan, export proof, header text)
// reads this, so a change of the fitter's model type only changes the adapter.
// It also carries the fitter's double-precision evaluation, which the export
// proof compares the header's arithmetic with.
#pragma once

#include <array>
#include <cstddef>
#include <functional>
#include <string>
#include <utility>
#include <vector>

#include "ridgecal/calibration.hpp"
#include "ridgecal/model.hpp"
#include "ridgecal/poly_model.hpp"
#include "ridgecal/transforms.hpp"

namespace ridgecal::firmware {

/// The model as the firmware evaluates it:
///   u   = reading through the transforms (divider, ln; identity by default)
///   t   = (u - inputs[0].center) / inputs[0].half_width
///   s   = (aux - inputs[1].center) / inputs[1].half_width   (second input only)
///   v   = sum over the terms (k, l) of monomial[k * (aux_degree + 1) + l] t^k s^l
///   out = v through the reference transform (reciprocal kelvin; identity by default)
/// One input without transforms is the N = 1 case (aux_degree 0).
struct FirmwareModel {
  /// Header dialect: true for a record with an extended ("surface") model,
  /// whose header names the transforms and the second input; false for the
  /// one-input header of a plain polynomial record. The arithmetic is the same.
  bool extended = false;
  Transforms transforms;
  /// [0]: the (transformed) reading, [1]: the aux input when present. The
  /// calibrated range and the scaling of each.
  std::vector<AxisScaling> inputs;
  int reading_degree = 0;
  int aux_degree = 0;
  /// Dense table of monomial coefficients in the scaled inputs, row-major.
  std::vector<double> monomial;
  /// One-input header only: the coefficients in powers of the raw reading
  /// (its alternative raw-x Horner basis); empty when that basis is not offered.
  std::vector<long double> raw_power;

  /// Why the model cannot be exported ("" when it can): no coefficients, a
  /// non-finite one, a degree above 30, an empty range, invalid transforms.
  /// Worded by the adapter, which knows the fitter's model.
  std::string problem;
  /// The QA block of the extended header: the fitted model's own number of
  /// terms and its basis ("chebyshev", "power").
  std::size_t fitted_terms = 0;
  std::string fitted_basis;
  /// The double-precision model the export proof compares the header with:
  /// the fitter's own evaluation at (reading, aux), and the fitted
  /// polynomial v at (transformed reading u, aux) before the inverse
  /// reference transform (for the log() allowance).
  std::function<double(double reading, double aux)> reference;
  std::function<double(double u, double aux)> reference_fitted;

  bool has_aux() const { return inputs.size() > 1; }
  std::size_t term_count() const { return monomial.size(); }
  /// Multi-index (power of t, power of s) of table entry i.
  std::array<int, 2> term(std::size_t i) const {
    const std::size_t w = static_cast<std::size_t>(aux_degree) + 1;
    return {static_cast<int>(i / w), static_cast<int>(i % w)};
  }
};

/// The one adapter from the fitter's models (a plain polynomial is the
/// one-input case, an extended model keeps its transforms and aux input).
FirmwareModel firmware_model(const PolyModel& model);
FirmwareModel firmware_model(const Model& model);
/// A calibration's model: general_model(cal), in the header dialect that
/// is_extended(cal) picks (the one-input header for the N = 1 case).
FirmwareModel firmware_model(const Calibration& cal);

/// The valid raw-reading range: the calibrated range of the transformed
/// reading mapped back through the transforms (sorted).
std::pair<double, double> raw_reading_range(const FirmwareModel& model);

}  // namespace ridgecal::firmware
