#include "ridgecal/firmware/c_text.hpp"

#include <cstdio>

namespace ridgecal::firmware {

namespace {
bool is_alpha(char c) {
  return (c >= 'A' && c <= 'Z') || (c >= 'a' && c <= 'z');
}
bool is_digit(char c) {
  return c >= '0' && c <= '9';
}
}  // namespace

std::string check_c_prefix(std::string_view prefix) {
  const std::string shown = "'" + escape_c_comment(prefix, 60) + "'";
  if (prefix.empty()) return "prefix '' is empty; it must match [A-Za-z][A-Za-z0-9_]*";
  if (prefix.size() > kMaxPrefixLength)
    return "prefix " + shown + " is " + std::to_string(prefix.size()) +
           " characters long; at most " + std::to_string(kMaxPrefixLength) + " are allowed";
  for (char c : prefix)
    if (!(is_alpha(c) || is_digit(c) || c == '_'))
      return "prefix " + shown + " contains a character outside [A-Za-z0-9_]";
  if (is_digit(prefix.front())) return "prefix " + shown + " starts with a digit";
  if (prefix.front() == '_')
    return "prefix " + shown +
           " starts with '_'; names starting with '__' or '_' + capital are reserved, and macros "
           "use the upper-cased prefix";
  if (prefix.find("__") != std::string_view::npos)
    return "prefix " + shown + " contains '__' (reserved in C++)";
  if (prefix.back() == '_')
    return "prefix " + shown + " ends with '_' (the generator appends '_' itself)";
  // A C or C++ keyword as the prefix is legal inside longer names, but it is
  // almost surely a mistake (and confuses readers and tools): refuse it.
  static const char* const kKeywords[] = {
      "auto",     "bool",    "break",    "case",     "char",     "class", "const",   "continue",
      "default",  "delete",  "do",       "double",   "else",     "enum",  "extern",  "false",
      "float",    "for",     "goto",     "if",       "inline",   "int",   "long",    "namespace",
      "new",      "nullptr", "register", "restrict", "return",   "short", "signed",  "sizeof",
      "static",   "struct",  "switch",   "template", "this",     "true",  "typedef", "union",
      "unsigned", "using",   "virtual",  "void",     "volatile", "while"};
  for (const char* k : kKeywords)
    if (prefix == k)
      return "prefix " + shown + " is a C or C++ keyword; choose a name such as 'sensor1'";
  return {};
}

std::string macro_case(std::string_view prefix) {
  std::string out(prefix);
  for (char& c : out)
    if (c >= 'a' && c <= 'z') c = static_cast<char>(c - 'a' + 'A');
  return out;
}

std::string escape_c_comment(std::string_view text, std::size_t max_chars) {
  std::string out;
  bool truncated = false;
  for (std::size_t i = 0; i < text.size(); ++i) {
    if (out.size() >= max_chars) {
      truncated = true;
      break;
    }
    const unsigned char c = static_cast<unsigned char>(text[i]);
    const char next = i + 1 < text.size() ? text[i + 1] : '\0';
    if (c == '*' && next == '/') {
      out += "*\\/";
      ++i;
    } else if (c == '/' && next == '*') {
      out += "/\\*";
      ++i;
    } else if (c == '?' && next == '?') {
      out += "?\\?";
      ++i;
    } else if (c == '\\') {
      out += "\\x5C";  // never a literal backslash: at a line end it would splice lines
    } else if (c >= 0x20 && c < 0x7f) {
      out += static_cast<char>(c);
    } else {
      char buf[8];
      std::snprintf(buf, sizeof buf, "\\x%02X", static_cast<unsigned>(c));
      out += buf;
    }
  }
  if (truncated) out += "...[truncated]";
  return out;
}

}  // namespace ridgecal::firmware
