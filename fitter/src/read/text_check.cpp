#include "ridgecal/text_check.hpp"

#include <fmt/format.h>

namespace ridgecal {

namespace {
// Length of the valid UTF-8 sequence starting at s[i], or 0 if it is invalid.
std::size_t utf8_sequence(std::string_view s, std::size_t i) {
  const auto b = [&](std::size_t k) { return static_cast<unsigned char>(s[k]); };
  const unsigned char c = b(i);
  if (c < 0x80) return 1;
  std::size_t len = 0;
  unsigned char lo = 0x80, hi = 0xBF;  // allowed range of the second byte
  if (c >= 0xC2 && c <= 0xDF) {
    len = 2;
  } else if (c >= 0xE0 && c <= 0xEF) {
    len = 3;
    if (c == 0xE0)
      lo = 0xA0;  // no overlong forms
    else if (c == 0xED)
      hi = 0x9F;  // no UTF-16 surrogates
  } else if (c >= 0xF0 && c <= 0xF4) {
    len = 4;
    if (c == 0xF0)
      lo = 0x90;  // no overlong forms
    else if (c == 0xF4)
      hi = 0x8F;  // nothing above U+10FFFF
  } else {
    return 0;
  }
  if (i + len > s.size()) return 0;
  if (b(i + 1) < lo || b(i + 1) > hi) return 0;
  for (std::size_t k = 2; k < len; ++k)
    if (b(i + k) < 0x80 || b(i + k) > 0xBF) return 0;
  return len;
}
}  // namespace

bool is_valid_utf8(std::string_view s) {
  for (std::size_t i = 0; i < s.size();) {
    const std::size_t n = utf8_sequence(s, i);
    if (n == 0) return false;
    i += n;
  }
  return true;
}

std::string name_problem(std::string_view s, std::size_t max_bytes) {
  if (s.size() > max_bytes)
    return fmt::format("is {} bytes long; at most {} are allowed", s.size(), max_bytes);
  for (std::size_t i = 0; i < s.size();) {
    const std::size_t n = utf8_sequence(s, i);
    if (n == 0)
      return fmt::format("is not valid UTF-8 (byte 0x{:02x} at offset {})",
                         static_cast<unsigned char>(s[i]), i);
    const unsigned char c = static_cast<unsigned char>(s[i]);
    if (n == 1 && (c < 0x20 || c == 0x7F))
      return fmt::format("contains the control character 0x{:02x} at offset {}", c, i);
    i += n;
  }
  return {};
}

std::string shown_text(std::string_view s, std::size_t max_chars) {
  std::string out;
  const std::string_view head = s.substr(0, max_chars);
  for (std::size_t i = 0; i < head.size();) {
    const std::size_t n = utf8_sequence(head, i);
    const unsigned char c = static_cast<unsigned char>(head[i]);
    if (n == 0 || (n == 1 && (c < 0x20 || c == 0x7F))) {
      out += fmt::format("\\x{:02x}", c);
      ++i;
    } else {
      out.append(head.substr(i, n));
      i += n;
    }
  }
  if (s.size() > max_chars) out += "...";
  return out;
}

}  // namespace ridgecal
