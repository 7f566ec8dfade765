#include "ridgecal/transforms.hpp"

#include <fmt/format.h>

#include <cmath>
#include <limits>
#include <stdexcept>

namespace ridgecal {

namespace {
constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
}

std::string to_string(ReadingTransform t) {
  return t == ReadingTransform::Ln ? "ln" : "none";
}
ReadingTransform reading_transform_from_string(const std::string& s) {
  if (s == "none") return ReadingTransform::None;
  if (s == "ln") return ReadingTransform::Ln;
  throw std::invalid_argument("reading transform must be 'none' or 'ln', got '" + s + "'");
}

std::string to_string(ReferenceTransform t) {
  return t == ReferenceTransform::ReciprocalKelvin ? "reciprocal-kelvin" : "none";
}
ReferenceTransform reference_transform_from_string(const std::string& s) {
  if (s == "none") return ReferenceTransform::None;
  if (s == "reciprocal-kelvin") return ReferenceTransform::ReciprocalKelvin;
  throw std::invalid_argument("reference transform must be 'none' or 'reciprocal-kelvin', got '" +
                              s + "'");
}

std::string to_string(DividerPosition p) {
  return p == DividerPosition::SensorLow ? "sensor-low" : "sensor-high";
}
DividerPosition divider_position_from_string(const std::string& s) {
  if (s == "sensor-low") return DividerPosition::SensorLow;
  if (s == "sensor-high") return DividerPosition::SensorHigh;
  throw std::invalid_argument("divider position must be 'sensor-low' or 'sensor-high', got '" + s +
                              "'");
}

std::string Divider::validate() const {
  if (!enabled) return {};
  if (!(std::isfinite(fixed_resistance) && fixed_resistance > 0.0))
    return fmt::format("divider fixed_resistance is {}; it must be a finite number > 0 (ohms)",
                       fixed_resistance);
  if (!(std::isfinite(full_scale) && full_scale > 0.0))
    return fmt::format("divider full_scale is {}; it must be a finite number > 0 (counts)",
                       full_scale);
  return {};
}

double Divider::resistance(double counts) const {
  if (!(counts > 0.0 && counts < full_scale)) return kNaN;
  return position == DividerPosition::SensorLow ? fixed_resistance * counts / (full_scale - counts)
                                                : fixed_resistance * (full_scale - counts) / counts;
}

std::string Transforms::validate() const {
  return divider.validate();
}

double Transforms::input(double x) const {
  double r = divider.enabled ? divider.resistance(x) : x;
  if (reading == ReadingTransform::Ln) r = r > 0.0 ? std::log(r) : kNaN;
  return r;
}

double Transforms::output(double y) const {
  if (reference == ReferenceTransform::None) return y;
  const double k = y + kKelvinOffset;
  return k > 0.0 ? 1.0 / k : kNaN;
}

double Transforms::output_inverse(double v) const {
  if (reference == ReferenceTransform::None) return v;
  return v > 0.0 ? 1.0 / v - kKelvinOffset : kNaN;
}

std::string Transforms::describe() const {
  std::string s = "reading";
  if (divider.enabled)
    s += fmt::format(" -> divider({}, {:g} ohm, full scale {:g}) -> resistance",
                     to_string(divider.position), divider.fixed_resistance, divider.full_scale);
  if (reading == ReadingTransform::Ln) s += " -> ln";
  s += "; reference";
  if (reference == ReferenceTransform::ReciprocalKelvin) s += " -> 1/(reference + 273.15)";
  return s;
}

}  // namespace ridgecal
