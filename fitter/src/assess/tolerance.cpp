#include "ridgecal/tolerance.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cctype>
#include <cmath>
#include <stdexcept>

#include "ridgecal/errors.hpp"
#include "ridgecal/json_read.hpp"

namespace ridgecal {

std::string to_string(TolerancePreset p) {
  switch (p) {
    case TolerancePreset::Iec60751AA:
      return "iec60751-AA";
    case TolerancePreset::Iec60751A:
      return "iec60751-A";
    case TolerancePreset::Iec60751B:
      return "iec60751-B";
    case TolerancePreset::Iec60751C:
      return "iec60751-C";
  }
  return "iec60751-B";
}

TolerancePreset tolerance_preset_from_string(const std::string& s) {
  std::string l = s;
  std::transform(l.begin(), l.end(), l.begin(), [](unsigned char c) { return std::tolower(c); });
  if (l == "iec60751-aa") return TolerancePreset::Iec60751AA;
  if (l == "iec60751-a") return TolerancePreset::Iec60751A;
  if (l == "iec60751-b") return TolerancePreset::Iec60751B;
  if (l == "iec60751-c") return TolerancePreset::Iec60751C;
  throw std::invalid_argument(
      "tolerance class must be iec60751-AA, iec60751-A, iec60751-B or iec60751-C, got '" + s + "'");
}

ToleranceSpec preset_tolerance(TolerancePreset p) {
  // IEC 60751 class formulas, degC (as transcribed in tests/data/thermometry/iec60751_pt100.json).
  ToleranceSpec t;
  switch (p) {
    case TolerancePreset::Iec60751AA:
      t.offset = 0.1;
      t.proportional = 0.0017;
      break;
    case TolerancePreset::Iec60751A:
      t.offset = 0.15;
      t.proportional = 0.002;
      break;
    case TolerancePreset::Iec60751B:
      t.offset = 0.3;
      t.proportional = 0.005;
      break;
    case TolerancePreset::Iec60751C:
      t.offset = 0.6;
      t.proportional = 0.01;
      break;
  }
  t.source = to_string(p);
  return t;
}

double ToleranceSpec::limit(double reference) const {
  return offset + proportional * std::fabs(reference) + percent_of_span / 100.0 * span();
}

std::string ToleranceSpec::validate() const {
  auto bad = [](double v) { return !(std::isfinite(v) && v >= 0.0); };
  if (bad(offset)) return fmt::format("offset is {}; it must be a finite number >= 0", offset);
  if (bad(proportional))
    return fmt::format("proportional is {}; it must be a finite number >= 0", proportional);
  if (bad(percent_of_span))
    return fmt::format("percent_of_span is {}; it must be a finite number >= 0", percent_of_span);
  if (!(offset > 0.0 || proportional > 0.0 || percent_of_span > 0.0))
    return "offset, proportional and percent_of_span are all 0; a tolerance needs at least one "
           "term > 0";
  if (percent_of_span > 0.0 &&
      !(std::isfinite(span_low) && std::isfinite(span_high) && span_high > span_low))
    return fmt::format(
        "span is {}..{}; with percent_of_span the span must be finite with span_high > span_low",
        span_low, span_high);
  return {};
}

std::string ToleranceSpec::describe() const {
  std::string s;
  auto add = [&s](const std::string& term) { s += (s.empty() ? "" : " + ") + term; };
  if (offset > 0.0) add(fmt::format("{:g}", offset));
  if (proportional > 0.0) add(fmt::format("{:g}*|reference|", proportional));
  if (percent_of_span > 0.0)
    add(fmt::format("{:g}% of span {:g}..{:g} (= {:g})", percent_of_span, span_low, span_high,
                    percent_of_span / 100.0 * span()));
  return "+-(" + s + ")";
}

nlohmann::json to_json(const ToleranceSpec& t) {
  nlohmann::json j{
      {"formula",
       "limit = offset + proportional*|reference| + percent_of_span/100*(span_high-span_low)"},
      {"offset", t.offset},
      {"proportional", t.proportional},
      {"percent_of_span", t.percent_of_span},
      {"source", t.source},
      {"text", t.describe()}};
  if (t.proportional == 0.0) j["limit"] = t.limit(0.0);  // constant over the range (for plots)
  if (t.percent_of_span > 0.0) {
    j["span_low"] = t.span_low;
    j["span_high"] = t.span_high;
  }
  return j;
}

ToleranceSpec tolerance_from_json(const nlohmann::json& j, const std::string& file) {
  const detail::JsonReader r{file};
  ToleranceSpec t;
  t.offset = r.finite(j, "offset", "tolerance");
  t.proportional = r.finite(j, "proportional", "tolerance");
  t.percent_of_span = r.finite(j, "percent_of_span", "tolerance");
  t.source = r.text_or(j, "source", "user");
  if (t.percent_of_span > 0.0) {
    t.span_low = r.finite(j, "span_low", "tolerance");
    t.span_high = r.finite(j, "span_high", "tolerance");
  }
  if (const std::string e = t.validate(); !e.empty()) r.fail("tolerance", "is invalid: " + e);
  return t;
}

}  // namespace ridgecal
