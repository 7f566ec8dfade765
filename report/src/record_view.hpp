// ridgecal report (internal): defensive read access to a calibration record.
// The record layout grows over time; every accessor tolerates missing keys,
// wrong types and nulls (nlohmann writes NaN as null) and returns "nothing".
#pragma once

#include <nlohmann/json.hpp>

#include <initializer_list>
#include <optional>
#include <string>
#include <vector>

namespace ridgecal::report::detail {

using Json = nlohmann::json;

/// Walk object keys; nullptr when any step is missing or not an object.
const Json* find(const Json& j, std::initializer_list<const char*> path);
/// First key of `names` present (and not null) in object j.
const Json* find_any(const Json& j, std::initializer_list<const char*> names);

/// A finite number at the path (numbers only, not strings).
std::optional<double> num(const Json* j);
std::optional<double> num(const Json& j, std::initializer_list<const char*> path);
/// A string at the path; numbers and booleans are converted to text.
std::optional<std::string> str(const Json* j);
std::optional<std::string> str(const Json& j, std::initializer_list<const char*> path);
/// Same, with a fallback text.
std::string str_or(const Json& j, std::initializer_list<const char*> path, const std::string& fallback);

/// Array at the path, or an empty array.
const Json& arr(const Json& j, std::initializer_list<const char*> path);

/// Finite doubles from a JSON array (non-numbers become NaN, kept in place).
std::vector<double> num_array(const Json& a);

}  // namespace ridgecal::report::detail
