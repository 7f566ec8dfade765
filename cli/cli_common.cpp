#include "cli_common.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <charconv>
#include <cmath>
#include <cstdlib>
#include <ctime>

#include "ridgecal/calibration.hpp"

namespace ridgecal::cli {

namespace {
std::vector<std::string> split(const std::string& s, char sep) {
  std::vector<std::string> out;
  std::string cur;
  for (char c : s) {
    if (c == sep) {
      out.push_back(cur);
      cur.clear();
    } else if (c != ' ') {
      cur += c;
    }
  }
  out.push_back(cur);
  return out;
}

bool to_int(const std::string& s, int& v) {
  const auto r = std::from_chars(s.data(), s.data() + s.size(), v);
  return r.ec == std::errc() && r.ptr == s.data() + s.size() && !s.empty();
}
}  // namespace

std::vector<int> parse_degree_list(const std::string& text) {
  std::vector<int> out;
  for (const std::string& item : split(text, ',')) {
    std::size_t dots = item.find("..");
    std::size_t len = 2;
    if (dots == std::string::npos && item.find('-', 1) != std::string::npos) {
      dots = item.find('-', 1);
      len = 1;
    }
    int a = 0, b = 0;
    if (dots == std::string::npos) {
      if (!to_int(item, a))
        throw UsageError(
            fmt::format("--degrees: '{}' is not a degree (write e.g. 1..7 or 1,2,3)", item));
      b = a;
    } else if (!to_int(item.substr(0, dots), a) || !to_int(item.substr(dots + len), b) || b < a) {
      throw UsageError(fmt::format("--degrees: '{}' is not a range (write e.g. 1..7)", item));
    }
    for (int d = a; d <= b && d - a < 100; ++d) out.push_back(d);
  }
  std::sort(out.begin(), out.end());
  out.erase(std::unique(out.begin(), out.end()), out.end());
  return out;
}

double parse_number_option(const std::string& option, const std::string& text) {
  double v = 0;
  const char* b = text.data();
  const char* e = b + text.size();
  if (b != e && *b == '+') ++b;
  const auto r = std::from_chars(b, e, v);
  if (text.empty() || r.ec != std::errc() || r.ptr != e || !std::isfinite(v))
    throw UsageError(fmt::format("{}: '{}' is not a finite number", option, text));
  return v;
}

std::vector<double> parse_lambda_list(const std::string& text) {
  if (text == "default") return default_lambda_grid();
  std::vector<double> out;
  for (const std::string& item : split(text, ',')) {
    const auto parts = split(item, ':');
    if (parts.size() == 1) {
      out.push_back(parse_number_option("--lambdas", item));
    } else if (parts.size() == 3) {
      const double a = parse_number_option("--lambdas", parts[0]);
      const double b = parse_number_option("--lambdas", parts[1]);
      int n = 0;
      if (!to_int(parts[2], n) || n < 2 || n > 1000 || !(a > 0) || !(b > a))
        throw UsageError(
            fmt::format("--lambdas: '{}' must be A:B:N with 0 < A < B and 2 <= N <= 1000", item));
      for (int i = 0; i < n; ++i)
        out.push_back(
            std::pow(10.0, std::log10(a) + (std::log10(b) - std::log10(a)) * i / (n - 1)));
    } else {
      throw UsageError(fmt::format("--lambdas: '{}' is neither a number nor A:B:N", item));
    }
  }
  for (double l : out)
    if (l < 0)
      throw UsageError(fmt::format("--lambdas: {} is negative; penalties must be >= 0", l));
  return out;
}

char parse_delimiter(const std::string& text) {
  if (text == "," || text == "comma") return ',';
  if (text == ";" || text == "semicolon") return ';';
  if (text == "tab" || text == "\t" || text == "\\t") return '\t';
  throw UsageError(fmt::format("--delimiter: '{}' is not one of ',', ';', 'tab'", text));
}

std::string creation_time(const std::string& injected) {
  if (injected == "none") return {};
  if (!injected.empty()) return injected;
  std::time_t t = std::time(nullptr);
  if (const char* sde = std::getenv("SOURCE_DATE_EPOCH")) {
    long long v = 0;
    const auto r = std::from_chars(sde, sde + std::char_traits<char>::length(sde), v);
    if (r.ec == std::errc()) t = static_cast<std::time_t>(v);
  }
  std::tm tm{};
  gmtime_r(&t, &tm);
  char buf[32];
  std::strftime(buf, sizeof buf, "%Y-%m-%dT%H:%M:%SZ", &tm);
  return buf;
}

namespace {
// Boost reads "-1" into an unsigned option as its wrap-around (e.g. --seed -1
// as 18446744073709551615, --max-bytes -1 as no limit): refuse a negative
// value of every unsigned option, naming it.
template <class T>
bool is_typed(const boost::program_options::option_description& d) {
  return dynamic_cast<const boost::program_options::typed_value<T>*>(d.semantic().get()) != nullptr;
}

void refuse_negative_unsigned(const boost::program_options::parsed_options& parsed) {
  for (const auto& opt : parsed.options) {
    if (opt.position_key >= 0 || opt.string_key.empty()) continue;
    const auto* d = parsed.description->find_nothrow(opt.string_key, false);
    if (d == nullptr || !(is_typed<unsigned long>(*d) || is_typed<unsigned long long>(*d) ||
                          is_typed<unsigned int>(*d) || is_typed<unsigned short>(*d)))
      continue;
    for (const std::string& v : opt.value) {
      const auto b = v.find_first_not_of(" \t");
      if (b != std::string::npos && v[b] == '-')
        throw UsageError(
            fmt::format("--{}: '{}' is negative; give a whole number >= 0", opt.string_key, v));
    }
  }
}
}  // namespace

boost::program_options::variables_map parse_arguments(
    const std::vector<std::string>& args,
    const boost::program_options::options_description& options, const std::string& positional) {
  namespace po = boost::program_options;
  po::options_description all;
  all.add(options).add_options()(positional.c_str(), po::value<std::vector<std::string>>(), "");
  po::positional_options_description pos;
  pos.add(positional.c_str(), -1);
  po::variables_map vm;
  try {
    const po::parsed_options parsed =
        po::command_line_parser(args).options(all).positional(pos).run();
    refuse_negative_unsigned(parsed);
    po::store(parsed, vm);
    po::notify(vm);
  } catch (const po::error& e) {
    throw UsageError(e.what());
  }
  return vm;
}

}  // namespace ridgecal::cli
