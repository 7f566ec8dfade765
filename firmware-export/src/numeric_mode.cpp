#include "ridgecal/firmware/numeric_mode.hpp"

namespace ridgecal::firmware {

std::string to_string(NumericMode mode) {
  switch (mode) {
    case NumericMode::Float:
      return "float";
    case NumericMode::Double:
      return "double";
    case NumericMode::Fixed:
      return "fixed";
  }
  return "unknown";
}

std::optional<NumericMode> numeric_mode_from_string(std::string_view text) {
  if (text == "float") return NumericMode::Float;
  if (text == "double") return NumericMode::Double;
  if (text == "fixed") return NumericMode::Fixed;
  return std::nullopt;
}

}  // namespace ridgecal::firmware
