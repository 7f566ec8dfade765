// ridgecal firmware export: C literals that round-trip exactly.
#pragma once

#include <cstdint>
#include <string>

namespace ridgecal::firmware {

/// Shortest of %.6g..%.9g that reads back (strtof) to exactly `value`, always
/// with a '.' or exponent and an 'f' suffix ("1.0f", "-2.5e-07f").
/// Precondition: value is finite.
std::string c_float_literal(float value);
/// Same for double with %.15g..%.17g and no suffix.
std::string c_double_literal(double value);
/// int32 value as C89-clean text: "123L", "-5L"; INT32_MIN as "(-2147483647L - 1L)".
std::string c_int32_literal(std::int32_t value);
/// int64 value usable in C89 and C99 with -pedantic: "(int64_t)123L" when it
/// fits in 32 bits, else built from two 32-bit halves without LL suffixes.
std::string c_int64_literal(std::int64_t value);

/// Parses a C float/double literal as the compiler would (strtof/strtod after
/// dropping an 'f' suffix). For the round-trip tests.
float parse_c_float_literal(const std::string& text);
double parse_c_double_literal(const std::string& text);

}  // namespace ridgecal::firmware
