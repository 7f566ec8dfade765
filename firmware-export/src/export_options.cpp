#include <cmath>
#include <sstream>
#include <stdexcept>

#include "ridgecal/firmware/c_text.hpp"
#include "ridgecal/firmware/export.hpp"

namespace ridgecal::firmware {

namespace {
std::string num(double v) {
  std::ostringstream os;
  os.precision(17);
  os << v;
  return os.str();
}
}  // namespace

const char* to_string(ExportStatus status) {
  switch (status) {
    case ExportStatus::Ok:
      return "ok";
    case ExportStatus::Refused:
      return "refused";
    case ExportStatus::InvalidInput:
      return "invalid input";
  }
  return "unknown";
}

std::string ExportOptions::validate() const {
  if (std::string m = check_c_prefix(prefix); !m.empty()) return "option prefix: " + m;
  if (!(max_deviation_fraction > 0.0 && max_deviation_fraction <= 1.0))
    return "option max_deviation_fraction = " + num(max_deviation_fraction) +
           ": must be > 0 and <= 1";
  if (grid_points < 2 || grid_points > 1000000)
    return "option grid_points = " + std::to_string(grid_points) +
           ": must be between 2 and 1000000";
  if (!(std::isfinite(input_scale) && input_scale > 0.0))
    return "option input_scale = " + num(input_scale) + ": must be finite and > 0";
  if (!(std::isfinite(output_scale) && output_scale > 0.0 && output_scale <= 1e9))
    return "option output_scale = " + num(output_scale) + ": must be finite, > 0 and <= 1e9";
  const std::int64_t lim = 2147483647LL;
  if (raw_min && (*raw_min < -lim || *raw_min > lim))
    return "option raw_min = " + std::to_string(*raw_min) +
           ": must be in [-2147483647, 2147483647]";
  if (raw_max && (*raw_max < -lim || *raw_max > lim))
    return "option raw_max = " + std::to_string(*raw_max) +
           ": must be in [-2147483647, 2147483647]";
  if (raw_min && raw_max && *raw_min > *raw_max)
    return "option raw_min = " + std::to_string(*raw_min) + ": must be <= raw_max (" +
           std::to_string(*raw_max) + ")";
  if (!(std::isfinite(aux_input_scale) && aux_input_scale > 0.0))
    return "option aux_input_scale = " + num(aux_input_scale) + ": must be finite and > 0";
  if (aux_raw_min && (*aux_raw_min < -lim || *aux_raw_min > lim))
    return "option aux_raw_min = " + std::to_string(*aux_raw_min) +
           ": must be in [-2147483647, 2147483647]";
  if (aux_raw_max && (*aux_raw_max < -lim || *aux_raw_max > lim))
    return "option aux_raw_max = " + std::to_string(*aux_raw_max) +
           ": must be in [-2147483647, 2147483647]";
  if (aux_raw_min && aux_raw_max && *aux_raw_min > *aux_raw_max)
    return "option aux_raw_min = " + std::to_string(*aux_raw_min) + ": must be <= aux_raw_max (" +
           std::to_string(*aux_raw_max) + ")";
  if (exhaustive_limit < 0 || exhaustive_limit > 100000000)
    return "option exhaustive_limit = " + std::to_string(exhaustive_limit) +
           ": must be between 0 and 100000000";
  return {};
}

}  // namespace ridgecal::firmware

namespace ridgecal::firmware {

std::string to_string(HeaderVerdict v) {
  switch (v) {
    case HeaderVerdict::NotJudged:
      return "not-judged";
    case HeaderVerdict::Pass:
      return "pass";
    case HeaderVerdict::Fail:
      return "fail";
    case HeaderVerdict::RecordModified:
      return "record-modified";
    case HeaderVerdict::Undecided:
      return "undecided";
  }
  return "unknown";
}

HeaderVerdict header_verdict_from_string(const std::string& s) {
  for (HeaderVerdict v : {HeaderVerdict::NotJudged, HeaderVerdict::Pass, HeaderVerdict::Fail,
                          HeaderVerdict::RecordModified, HeaderVerdict::Undecided})
    if (to_string(v) == s) return v;
  throw std::invalid_argument("header verdict '" + s +
                              "': must be not-judged, pass, fail, record-modified or undecided");
}

}  // namespace ridgecal::firmware
