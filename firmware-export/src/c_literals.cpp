#include "ridgecal/firmware/c_literals.hpp"

#include <cstdio>
#include <cstdlib>
#include <stdexcept>

namespace ridgecal::firmware {

namespace {
std::string ensure_floating_form(std::string s) {
  if (s.find_first_of(".eEn") == std::string::npos) s += ".0";
  return s;
}
}  // namespace

std::string c_float_literal(float value) {
  char buf[64];
  for (int digits = 6; digits <= 9; ++digits) {
    std::snprintf(buf, sizeof buf, "%.*g", digits, static_cast<double>(value));
    if (std::strtof(buf, nullptr) == value) break;
  }
  return ensure_floating_form(buf) + "f";
}

std::string c_double_literal(double value) {
  char buf[64];
  for (int digits = 15; digits <= 17; ++digits) {
    std::snprintf(buf, sizeof buf, "%.*g", digits, value);
    if (std::strtod(buf, nullptr) == value) break;
  }
  return ensure_floating_form(buf);
}

std::string c_int32_literal(std::int32_t value) {
  if (value == INT32_MIN) return "(-2147483647L - 1L)";
  return std::to_string(value) + "L";
}

std::string c_int64_literal(std::int64_t value) {
  if (value >= -2147483647LL && value <= 2147483647LL)
    return "(int64_t)" + std::to_string(value) + "L";
  // value = hi * 2^32 + lo with 0 <= lo < 2^32 (floor division); |hi| < 2^31.
  const std::int64_t lo = value & 0xFFFFFFFFLL;
  const std::int64_t hi = (value - lo) / 4294967296LL;
  if (hi < -2147483647LL || hi > 2147483647LL) throw std::out_of_range("c_int64_literal");
  return "((int64_t)" + std::to_string(hi) + "L * (int64_t)65536L * (int64_t)65536L + (int64_t)" +
         std::to_string(lo) + "UL)";
}

float parse_c_float_literal(const std::string& text) {
  std::string s = text;
  if (!s.empty() && (s.back() == 'f' || s.back() == 'F')) s.pop_back();
  return std::strtof(s.c_str(), nullptr);
}

double parse_c_double_literal(const std::string& text) {
  return std::strtod(text.c_str(), nullptr);
}

}  // namespace ridgecal::firmware
