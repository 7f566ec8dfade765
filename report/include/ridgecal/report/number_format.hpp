// ridgecal report: number formatting that never prints NaN or inf.
#pragma once

#include <optional>
#include <string>

namespace ridgecal::report {

/// Text shown for a value that is missing, NaN or infinite.
inline constexpr const char* kNotAvailable = "n/a";

/// Fixed notation with `decimals` digits after the point; "n/a" when not finite.
std::string format_fixed(double v, int decimals);
std::string format_fixed(const std::optional<double>& v, int decimals);

/// `digits` significant digits, plain notation for moderate magnitudes and
/// "1.23e-05"-style scientific notation otherwise; "n/a" when not finite.
/// Negative zero prints as "0".
std::string format_sig(double v, int digits = 4);
std::string format_sig(const std::optional<double>& v, int digits = 4);

/// Full round-trip precision (for coefficients): shortest representation that
/// reads back to the same double; "n/a" when not finite.
std::string format_exact(double v);
std::string format_exact(const std::optional<double>& v);

/// Ridge penalty lambda: "0" for zero; 3 significant digits, written as
/// 4.18×10⁻⁵ (or 10⁻⁶ for an exact power) outside [0.01, 1000).
std::string format_lambda(double v);

/// SVG coordinate: two decimals, trailing zeros stripped; non-finite maps to 0.
std::string format_coord(double v);

}  // namespace ridgecal::report
