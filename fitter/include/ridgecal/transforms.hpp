// ridgecal: linearising transforms applied before the polynomial is fitted.
//
// The chain, for one raw reading x (what the instrument reports) and one
// reference value y (what the reference standard says):
//
//   x --divider--> R --reading transform--> u        (the fitted input)
//   y --reference transform--> v                     (the fitted output)
//   model:  v = q(u [, aux]),  reported value  y = inverse(q(u [, aux]))
//
// * Divider (optional): ADC counts of a resistive divider -> resistance of the
//   sensor element. With a fixed resistor Rf, full-scale counts F and the ADC
//   referenced to the divider supply (ratiometric):
//     sensor-low  (sensor to ground, Rf to the supply):  R = Rf * x / (F - x)
//     sensor-high (sensor to the supply, Rf to ground):  R = Rf * (F - x) / x
//   Precondition for a valid value: 0 < x < F.
// * Reading transform: `none` (u = R) or `ln` (u = ln R, R > 0), e.g. for NTC
//   thermistors.
// * Reference transform: `none` (v = y) or `reciprocal-kelvin`
//   (v = 1 / (y + 273.15), y in degC, y > -273.15), the Steinhart-Hart family
//   1/T = a + b ln R + c (ln R)^3.
//
// Metrics are always computed on y, in the reference units, after the inverse
// transform.
#pragma once

#include <string>

namespace ridgecal {

enum class ReadingTransform { None, Ln };
std::string to_string(ReadingTransform t);  ///< `none`, `ln`
ReadingTransform reading_transform_from_string(
    const std::string& s);  ///< throws std::invalid_argument

enum class ReferenceTransform { None, ReciprocalKelvin };
std::string to_string(ReferenceTransform t);  ///< `none`, `reciprocal-kelvin`
ReferenceTransform reference_transform_from_string(
    const std::string& s);  ///< throws std::invalid_argument

enum class DividerPosition { SensorLow, SensorHigh };
std::string to_string(DividerPosition p);  ///< `sensor-low`, `sensor-high`
DividerPosition divider_position_from_string(
    const std::string& s);  ///< throws std::invalid_argument

/// Conversion of ADC counts of a ratiometric divider to the sensor's resistance.
struct Divider {
  bool enabled = false;
  double fixed_resistance = 0.0;  ///< Rf, ohms, > 0
  DividerPosition position = DividerPosition::SensorLow;
  double full_scale = 0.0;  ///< counts at the divider supply (e.g. 4095 or 4096), > 0

  std::string validate() const;  ///< empty when valid (or disabled)
  /// Resistance for `counts`; NaN when counts is outside (0, full_scale).
  double resistance(double counts) const;
};

/// The whole transform chain. Default: identity.
struct Transforms {
  Divider divider;
  ReadingTransform reading = ReadingTransform::None;
  ReferenceTransform reference = ReferenceTransform::None;

  bool identity() const {
    return !divider.enabled && reading == ReadingTransform::None &&
           reference == ReferenceTransform::None;
  }
  std::string validate() const;  ///< empty when valid

  /// Raw reading -> fitted input u. NaN when x is outside the transform's domain.
  double input(double x) const;
  /// Reference value -> fitted output v. NaN when y is outside the domain.
  double output(double y) const;
  /// Fitted output v -> reference value y (inverse of `output`). NaN for v <= 0
  /// with the reciprocal-kelvin transform.
  double output_inverse(double v) const;
  /// One line naming the chain, e.g. "counts -> divider(sensor-low, 10000 ohm, 4095) -> ln".
  std::string describe() const;
};

/// Absolute zero offset used by the reciprocal-kelvin transform (degC -> K).
inline constexpr double kKelvinOffset = 273.15;

}  // namespace ridgecal
