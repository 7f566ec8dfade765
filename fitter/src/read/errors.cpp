#include "ridgecal/errors.hpp"

#include <utility>

namespace ridgecal {

namespace {
std::string compose(const std::string& file, std::size_t line, const std::string& message,
                    const std::string& hint) {
  std::string out;
  if (!file.empty()) {
    out += file;
    if (line > 0) out += ":" + std::to_string(line);
    out += ": ";
  }
  out += message;
  if (!out.empty() && out.back() != '.') out += '.';
  if (!hint.empty()) out += " " + hint;
  return out;
}
}  // namespace

InputError::InputError(std::string file, std::size_t line, std::string message, std::string hint,
                       InputCause cause)
    : std::runtime_error(compose(file, line, message, hint)),
      file_(std::move(file)),
      line_(line),
      message_(std::move(message)),
      hint_(std::move(hint)),
      cause_(cause) {}

namespace {
constexpr std::pair<InputCause, const char*> kCauseNames[] = {
    {InputCause::Other, "other"},
    {InputCause::EmptyCell, "empty-cell"},
    {InputCause::ConstantReadings, "constant-readings"},
    {InputCause::FrozenReadings, "frozen-readings"},
    {InputCause::ZeroReadings, "zero-readings"},
    {InputCause::ClippedReadings, "clipped-readings"},
};
}  // namespace

std::string to_string(InputCause c) {
  for (const auto& [cause, name] : kCauseNames)
    if (cause == c) return name;
  return "other";
}

InputCause input_cause_from_string(const std::string& s) {
  for (const auto& [cause, name] : kCauseNames)
    if (s == name) return cause;
  throw std::invalid_argument("unknown input cause '" + s + "'");
}

std::string format_input_error(const InputError& e) {
  return e.what();
}

}  // namespace ridgecal
