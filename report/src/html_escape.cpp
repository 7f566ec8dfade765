#include "ridgecal/report/html_escape.hpp"

#include <cstdint>
#include <cstdio>

namespace ridgecal::report {
namespace {

constexpr const char* kReplacement = "\xEF\xBF\xBD";  // U+FFFD

void append_utf8(std::string& out, std::uint32_t cp) {
  if (cp < 0x80) {
    out += static_cast<char>(cp);
  } else if (cp < 0x800) {
    out += static_cast<char>(0xC0 | (cp >> 6));
    out += static_cast<char>(0x80 | (cp & 0x3F));
  } else if (cp < 0x10000) {
    out += static_cast<char>(0xE0 | (cp >> 12));
    out += static_cast<char>(0x80 | ((cp >> 6) & 0x3F));
    out += static_cast<char>(0x80 | (cp & 0x3F));
  } else {
    out += static_cast<char>(0xF0 | (cp >> 18));
    out += static_cast<char>(0x80 | ((cp >> 12) & 0x3F));
    out += static_cast<char>(0x80 | ((cp >> 6) & 0x3F));
    out += static_cast<char>(0x80 | (cp & 0x3F));
  }
}

/// Decode one code point at text[i]; returns its length in bytes, or 0 when
/// the bytes there are not valid UTF-8.
std::size_t decode(std::string_view text, std::size_t i, std::uint32_t& cp) {
  const auto b = [&](std::size_t k) { return static_cast<unsigned char>(text[k]); };
  const unsigned char c = b(i);
  std::size_t len = 0;
  std::uint32_t min = 0;
  if (c < 0x80) {
    cp = c;
    return 1;
  } else if ((c & 0xE0) == 0xC0) {
    len = 2, cp = c & 0x1F, min = 0x80;
  } else if ((c & 0xF0) == 0xE0) {
    len = 3, cp = c & 0x0F, min = 0x800;
  } else if ((c & 0xF8) == 0xF0) {
    len = 4, cp = c & 0x07, min = 0x10000;
  } else {
    return 0;
  }
  if (i + len > text.size()) return 0;
  for (std::size_t k = 1; k < len; ++k) {
    if ((b(i + k) & 0xC0) != 0x80) return 0;
    cp = (cp << 6) | (b(i + k) & 0x3F);
  }
  if (cp < min || cp > 0x10FFFF || (cp >= 0xD800 && cp <= 0xDFFF)) return 0;
  return len;
}

}  // namespace

bool is_valid_utf8(std::string_view text) {
  std::uint32_t cp = 0;
  for (std::size_t i = 0; i < text.size();) {
    const std::size_t n = decode(text, i, cp);
    if (n == 0) return false;
    i += n;
  }
  return true;
}

std::string html_escape(std::string_view text) {
  std::string out;
  out.reserve(text.size() + text.size() / 8);
  for (std::size_t i = 0; i < text.size();) {
    std::uint32_t cp = 0;
    const std::size_t n = decode(text, i, cp);
    if (n == 0) {  // invalid byte: replace it and resynchronise on the next one
      out += kReplacement;
      ++i;
      continue;
    }
    i += n;
    switch (cp) {
      case '&':
        out += "&amp;";
        continue;
      case '<':
        out += "&lt;";
        continue;
      case '>':
        out += "&gt;";
        continue;
      case '"':
        out += "&quot;";
        continue;
      case '\'':
        out += "&#39;";
        continue;
      default:
        break;
    }
    if (cp == '\n') {
      out += "\u21B5";  // downwards arrow with corner leftwards: a visible line break
    } else if (cp == '\t') {
      out += "\u21E5";  // rightwards arrow to bar: a visible tab
    } else if (cp < 0x20 || cp == 0x7F) {
      // Other controls as their code point in plain ASCII, which every font has.
      char buf[12];
      std::snprintf(buf, sizeof buf, "[U+%04X]", static_cast<unsigned>(cp));
      out += buf;
    } else if ((cp >= 0x80 && cp <= 0x9F) || cp == 0xFFFE || cp == 0xFFFF) {
      out += kReplacement;  // C1 controls and non-characters are not valid XML text
    } else {
      append_utf8(out, cp);
    }
  }
  return out;
}

}  // namespace ridgecal::report
