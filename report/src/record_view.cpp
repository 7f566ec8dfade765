#include "record_view.hpp"

#include <cmath>
#include <limits>

#include "ridgecal/report/number_format.hpp"

namespace ridgecal::report::detail {

const Json* find(const Json& j, std::initializer_list<const char*> path) {
  const Json* cur = &j;
  for (const char* key : path) {
    if (!cur->is_object()) return nullptr;
    auto it = cur->find(key);
    if (it == cur->end()) return nullptr;
    cur = &*it;
  }
  return cur->is_null() ? nullptr : cur;
}

const Json* find_any(const Json& j, std::initializer_list<const char*> names) {
  if (!j.is_object()) return nullptr;
  for (const char* key : names) {
    auto it = j.find(key);
    if (it != j.end() && !it->is_null()) return &*it;
  }
  return nullptr;
}

std::optional<double> num(const Json* j) {
  if (!j || !j->is_number()) return std::nullopt;
  const double v = j->get<double>();
  if (!std::isfinite(v)) return std::nullopt;
  return v;
}

std::optional<double> num(const Json& j, std::initializer_list<const char*> path) {
  return num(find(j, path));
}

std::optional<std::string> str(const Json* j) {
  if (!j) return std::nullopt;
  if (j->is_string()) return j->get<std::string>();
  if (j->is_boolean()) return std::string(j->get<bool>() ? "yes" : "no");
  if (j->is_number_integer()) return std::to_string(j->get<long long>());
  if (j->is_number_unsigned()) return std::to_string(j->get<unsigned long long>());
  if (j->is_number()) return format_sig(j->get<double>(), 6);
  return std::nullopt;
}

std::optional<std::string> str(const Json& j, std::initializer_list<const char*> path) {
  return str(find(j, path));
}

std::string str_or(const Json& j, std::initializer_list<const char*> path, const std::string& fallback) {
  auto s = str(j, path);
  return s ? *s : fallback;
}

const Json& arr(const Json& j, std::initializer_list<const char*> path) {
  static const Json kEmpty = Json::array();
  const Json* a = find(j, path);
  return (a && a->is_array()) ? *a : kEmpty;
}

std::vector<double> num_array(const Json& a) {
  std::vector<double> out;
  if (!a.is_array()) return out;
  for (const Json& v : a) {
    auto d = num(&v);
    out.push_back(d ? *d : std::numeric_limits<double>::quiet_NaN());
  }
  return out;
}

}  // namespace ridgecal::report::detail
