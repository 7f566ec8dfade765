#include "ridgecal/errors.hpp"

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

InputError::InputError(std::string file, std::size_t line, std::string message, std::string hint)
    : std::runtime_error(compose(file, line, message, hint)),
      file_(std::move(file)),
      line_(line),
      message_(std::move(message)),
      hint_(std::move(hint)) {}

std::string format_input_error(const InputError& e) {
  return e.what();
}

}  // namespace ridgecal
