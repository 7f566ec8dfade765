#include "ridgecal/report/number_format.hpp"

#include <fmt/format.h>

#include <cmath>

namespace ridgecal::report {

std::string format_fixed(double v, int decimals) {
  if (!std::isfinite(v)) return kNotAvailable;
  std::string s = fmt::format("{:.{}f}", v, decimals < 0 ? 0 : decimals);
  // "-0.000" reads as a sign error to a reviewer.
  if (s.find_first_not_of("-0.") == std::string::npos && s[0] == '-') s.erase(0, 1);
  return s;
}

std::string format_fixed(const std::optional<double>& v, int decimals) {
  return v ? format_fixed(*v, decimals) : std::string(kNotAvailable);
}

std::string format_sig(double v, int digits) {
  if (!std::isfinite(v)) return kNotAvailable;
  if (v == 0.0) return "0";
  if (digits < 1) digits = 1;
  const double a = std::fabs(v);
  if (a >= 1e-4 && a < 1e7) {
    std::string s = fmt::format("{:.{}g}", v, digits);
    // {:g} may still switch to exponent form for values such as 1e+06 with few digits.
    if (s.find('e') == std::string::npos) return s;
    const int exp10 = static_cast<int>(std::floor(std::log10(a)));
    const int decimals = std::max(0, digits - 1 - exp10);
    return format_fixed(v, decimals);
  }
  std::string s = fmt::format("{:.{}e}", v, digits - 1);
  // Trim mantissa zeros: 1.200e-05 -> 1.2e-05
  const auto e = s.find('e');
  std::string mant = s.substr(0, e), ex = s.substr(e);
  if (mant.find('.') != std::string::npos) {
    while (!mant.empty() && mant.back() == '0') mant.pop_back();
    if (!mant.empty() && mant.back() == '.') mant.pop_back();
  }
  return mant + ex;
}

std::string format_sig(const std::optional<double>& v, int digits) {
  return v ? format_sig(*v, digits) : std::string(kNotAvailable);
}

std::string format_exact(double v) {
  if (!std::isfinite(v)) return kNotAvailable;
  if (v == 0.0) return "0";
  return fmt::format("{}", v);
}

std::string format_exact(const std::optional<double>& v) {
  return v ? format_exact(*v) : std::string(kNotAvailable);
}

std::string format_lambda(double v) {
  if (!std::isfinite(v)) return kNotAvailable;
  if (v == 0.0) return "0";
  const double a = std::fabs(v);
  if (a >= 1e-2 && a < 1e3) return format_sig(v, 3);
  // m×10ⁿ with a superscript exponent: penalties span many decades.
  int e = static_cast<int>(std::floor(std::log10(a)));
  double m = v / std::pow(10.0, e);
  std::string ms = format_sig(m, 3);
  if (ms == "10" || ms == "-10") {  // 9.996 rounds up to 10
    ++e;
    ms = ms[0] == '-' ? "-1" : "1";
  }
  static const char* const kSup[] = {"\u2070", "\u00B9", "\u00B2", "\u00B3", "\u2074",
                                     "\u2075", "\u2076", "\u2077", "\u2078", "\u2079"};
  std::string out = (ms == "1"    ? std::string()
                     : ms == "-1" ? std::string("-")
                                  : ms + "\u00D7") +
                    "10";
  if (e < 0) out += "\u207B";
  for (char c : std::to_string(e < 0 ? -e : e)) out += kSup[c - '0'];
  return out;
}

std::string format_coord(double v) {
  if (!std::isfinite(v)) v = 0.0;
  std::string s = fmt::format("{:.2f}", v);
  while (s.back() == '0') s.pop_back();
  if (s.back() == '.') s.pop_back();
  if (s == "-0") s = "0";
  return s;
}

}  // namespace ridgecal::report
