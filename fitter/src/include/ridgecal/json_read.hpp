// ridgecal internal: the one strict reader of JSON members, used for every
// part of the record (record_read.cpp, record_model.cpp, tolerance, decision,
// uncertainty, warnings) and of the as-found file. Every failure is an
// InputError naming the member.
#pragma once

#include <fmt/format.h>

#include <cmath>
#include <cstddef>
#include <cstdint>
#include <limits>
#include <nlohmann/json.hpp>
#include <string>

#include "ridgecal/errors.hpp"

namespace ridgecal::detail {

struct JsonReader {
  const std::string& file;

  [[noreturn]] void fail(const std::string& where, const std::string& what) const {
    throw InputError(file, 0, fmt::format("record member '{}' {}", where, what),
                     "re-create the record with 'ridgecal fit'");
  }
  const nlohmann::json& member(const nlohmann::json& obj, const std::string& key,
                               const std::string& where) const {
    if (!obj.is_object()) fail(where, "is not an object");
    const auto it = obj.find(key);
    if (it == obj.end()) fail(where + "." + key, "is missing");
    return *it;
  }
  double number(const nlohmann::json& obj, const std::string& key, const std::string& where) const {
    const nlohmann::json& v = member(obj, key, where);
    if (v.is_null()) return std::numeric_limits<double>::quiet_NaN();
    if (!v.is_number()) fail(where + "." + key, "is not a number");
    return v.get<double>();
  }
  double finite(const nlohmann::json& obj, const std::string& key, const std::string& where) const {
    const double v = number(obj, key, where);
    if (!std::isfinite(v)) fail(where + "." + key, "is not a finite number");
    return v;
  }
  long long integer(const nlohmann::json& obj, const std::string& key,
                    const std::string& where) const {
    const nlohmann::json& v = member(obj, key, where);
    if (!v.is_number_integer()) fail(where + "." + key, "is not an integer");
    if (v.is_number_unsigned() &&
        v.get<std::uint64_t>() > static_cast<std::uint64_t>(std::numeric_limits<long long>::max()))
      fail(where + "." + key, "is too large");
    return v.get<long long>();
  }
  // An integer in [lo, hi].
  long long bounded(const nlohmann::json& obj, const std::string& key, const std::string& where,
                    long long lo, long long hi) const {
    const long long v = integer(obj, key, where);
    if (v < lo || v > hi)
      fail(where + "." + key, fmt::format("is {}; it must be between {} and {}", v, lo, hi));
    return v;
  }
  std::size_t count(const nlohmann::json& obj, const std::string& key,
                    const std::string& where) const {
    return static_cast<std::size_t>(
        bounded(obj, key, where, 0, std::numeric_limits<long long>::max()));
  }
  int small(const nlohmann::json& obj, const std::string& key, const std::string& where,
            int lo = -1, int hi = 1'000'000) const {
    return static_cast<int>(bounded(obj, key, where, lo, hi));
  }
  int small_value(const nlohmann::json& v, const std::string& where, int lo, int hi) const {
    if (!v.is_number_integer()) fail(where, "holds a value that is not an integer");
    if (v.is_number_unsigned() ? v.get<std::uint64_t>() > static_cast<std::uint64_t>(hi)
                               : (v.get<long long>() < lo || v.get<long long>() > hi))
      fail(where, fmt::format("holds a value outside {}..{}", lo, hi));
    return static_cast<int>(v.get<long long>());
  }
  double number_value(const nlohmann::json& v, const std::string& where) const {
    if (!v.is_number()) fail(where, "holds a value that is not a number");
    return v.get<double>();
  }
  std::string text(const nlohmann::json& obj, const std::string& key,
                   const std::string& where) const {
    const nlohmann::json& v = member(obj, key, where);
    if (!v.is_string()) fail(where + "." + key, "is not a string");
    return v.get<std::string>();
  }
  std::string text_or(const nlohmann::json& obj, const std::string& key,
                      const std::string& fallback) const {
    const auto it = obj.find(key);
    return (it != obj.end() && it->is_string()) ? it->get<std::string>() : fallback;
  }
  bool boolean(const nlohmann::json& obj, const std::string& key, const std::string& where) const {
    const nlohmann::json& v = member(obj, key, where);
    if (!v.is_boolean()) fail(where + "." + key, "is not true or false");
    return v.get<bool>();
  }
  const nlohmann::json& array(const nlohmann::json& obj, const std::string& key,
                              const std::string& where) const {
    const nlohmann::json& v = member(obj, key, where);
    if (!v.is_array()) fail(where + "." + key, "is not an array");
    return v;
  }
  template <class F>
  auto enum_value(const nlohmann::json& obj, const std::string& key, const std::string& where,
                  F parse) const {
    const std::string s = text(obj, key, where);
    try {
      return parse(s);
    } catch (const std::invalid_argument& e) {
      fail(where + "." + key, std::string("is invalid: ") + e.what());
    }
  }
};

inline nlohmann::json num(double v) {
  return std::isfinite(v) ? nlohmann::json(v) : nlohmann::json(nullptr);
}

}  // namespace ridgecal::detail
