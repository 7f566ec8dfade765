// ridgecal: the permissible error of a calibrated value (the tolerance).
//
// One formula covers the usual ways of writing a tolerance:
//   limit(reference) = offset + proportional * |reference|
//                      + (percent_of_span / 100) * (span_high - span_low)
// in reference units. "a + b*|t|" class formulas set offset and
// proportional; "% of reading" sets proportional alone (0.5 % -> 0.005);
// "% of span" sets percent_of_span. The terms add when several are given.
#pragma once

#include <nlohmann/json.hpp>
#include <string>

namespace ridgecal {

/// Named tolerance formulas. Only the IEC 60751 platinum resistance
/// thermometer classes are built in (temperature in degC):
/// AA +-(0.1 + 0.0017|t|), A +-(0.15 + 0.002|t|), B +-(0.3 + 0.005|t|),
/// C +-(0.6 + 0.01|t|). The classes' validity temperature ranges are not checked.
enum class TolerancePreset { Iec60751AA, Iec60751A, Iec60751B, Iec60751C };
std::string to_string(
    TolerancePreset p);  ///< `iec60751-AA`, `iec60751-A`, `iec60751-B`, `iec60751-C`
/// Accepts the names of to_string (case-insensitive). Throws std::invalid_argument otherwise.
TolerancePreset tolerance_preset_from_string(const std::string& s);

struct ToleranceSpec {
  double offset = 0.0;  ///< a: reference units, >= 0 (default 0)
  double proportional =
      0.0;  ///< b: fraction of |reference|, >= 0 (0.002 = 0.2 % of reading; default 0)
  double percent_of_span = 0.0;  ///< percent of (span_high - span_low), >= 0 (default 0)
  double span_low = 0.0;         ///< span in reference units; used only with percent_of_span
  double span_high = 0.0;        ///< (default 0..0: set it, e.g. from the calibrated range)
  std::string source = "user";   ///< where the formula came from: `user` or a preset name

  double span() const { return span_high - span_low; }
  /// The permissible |error| at this reference value (reference units).
  double limit(double reference) const;
  /// Empty when valid, else a message naming the field, the value and the rule:
  /// every term finite and >= 0, at least one term > 0, span_high > span_low
  /// when percent_of_span > 0.
  std::string validate() const;
  /// Human-readable formula, e.g. "+-(0.15 + 0.002*|reference|)".
  std::string describe() const;
};

/// The formula of a preset (source set to the preset name).
ToleranceSpec preset_tolerance(TolerancePreset p);

nlohmann::json to_json(const ToleranceSpec& t);
/// Throws InputError (file, "record member 'tolerance...' ...") on a missing or mistyped member.
ToleranceSpec tolerance_from_json(const nlohmann::json& j, const std::string& file);

}  // namespace ridgecal
