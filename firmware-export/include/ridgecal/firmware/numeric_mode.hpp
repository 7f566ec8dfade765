// ridgecal firmware export: the arithmetic a generated header evaluates in.
#pragma once

#include <optional>
#include <string>
#include <string_view>

namespace ridgecal::firmware {

/// Float:  IEEE binary32 Horner, f-suffixed literals, no double anywhere.
/// Double: IEEE binary64 Horner (on avr-gcc, double is 32 bits: see docs).
/// Fixed:  integer-only (int32 coefficients, int64 intermediates) for MCUs
///         without an FPU; raw integer input, scaled integer output.
enum class NumericMode { Float, Double, Fixed };

/// "float", "double" or "fixed".
std::string to_string(NumericMode mode);
/// Inverse of to_string (exact, lower-case spellings only); nullopt otherwise.
std::optional<NumericMode> numeric_mode_from_string(std::string_view text);

}  // namespace ridgecal::firmware
