// Test helper: a small, strict check that markup is well nested.
#pragma once

#include <cctype>
#include <string>
#include <vector>

namespace ridgecal::report::test {

/// Checks that every element is closed in order (or self-closed with "/>"),
/// that attribute values are quoted, and that no raw '<' or '&' appears in
/// text outside a tag or a character reference. Returns "" when fine, else a
/// description of the first problem and its byte offset.
inline std::string check_markup(const std::string& s) {
  std::vector<std::string> stack;
  std::size_t i = 0;
  auto err = [&](const std::string& what) { return what + " at byte " + std::to_string(i); };
  while (i < s.size()) {
    const char c = s[i];
    if (c == '&') {
      const std::size_t semi = s.find(';', i);
      if (semi == std::string::npos || semi - i > 10) return err("bare '&'");
      const std::string ref = s.substr(i + 1, semi - i - 1);
      const bool named =
          ref == "amp" || ref == "lt" || ref == "gt" || ref == "quot" || ref == "apos";
      bool numeric = ref.size() > 1 && ref[0] == '#';
      for (std::size_t k = 1; numeric && k < ref.size(); ++k)
        numeric = std::isdigit(static_cast<unsigned char>(ref[k])) != 0;
      if (!named && !numeric) return err("unknown reference &" + ref + ";");
      i = semi + 1;
      continue;
    }
    if (c != '<') {
      ++i;
      continue;
    }
    if (s.compare(i, 9, "<!DOCTYPE") == 0) {
      i = s.find('>', i) + 1;
      continue;
    }
    if (s.compare(i, 4, "<!--") == 0) {
      const std::size_t e = s.find("-->", i);
      if (e == std::string::npos) return err("unclosed comment");
      i = e + 3;
      continue;
    }
    const bool closing = i + 1 < s.size() && s[i + 1] == '/';
    std::size_t j = i + (closing ? 2 : 1);
    std::string name;
    while (j < s.size() &&
           (std::isalnum(static_cast<unsigned char>(s[j])) || s[j] == '-' || s[j] == ':'))
      name += s[j++];
    if (name.empty()) return err("'<' that starts no tag");
    // Scan attributes to the end of the tag, honouring quotes.
    bool self_closing = false;
    while (j < s.size() && s[j] != '>') {
      if (s[j] == '"' || s[j] == '\'') {
        const std::size_t e = s.find(s[j], j + 1);
        if (e == std::string::npos) return err("unterminated attribute value");
        const std::string value = s.substr(j + 1, e - j - 1);
        if (value.find('<') != std::string::npos) return err("'<' inside an attribute value");
        j = e + 1;
        continue;
      }
      if (s[j] == '=' && j + 1 < s.size() && s[j + 1] != '"' && s[j + 1] != '\'')
        return err("unquoted attribute value");
      if (s[j] == '<') return err("'<' inside a tag");
      if (s[j] == '/' && j + 1 < s.size() && s[j + 1] == '>') self_closing = true;
      ++j;
    }
    if (j >= s.size()) return err("unterminated tag <" + name);
    if (closing) {
      if (stack.empty() || stack.back() != name)
        return err("</" + name + "> closes <" +
                   (stack.empty() ? std::string("nothing") : stack.back()) + ">");
      stack.pop_back();
    } else if (!self_closing) {
      stack.push_back(name);
      if (name == "style") {  // raw text up to </style>
        const std::size_t e = s.find("</style>", j);
        if (e == std::string::npos) return err("unclosed <style>");
        j = e - 1;
      }
    }
    i = j + 1;
  }
  if (!stack.empty()) return "unclosed <" + stack.back() + "> at end";
  return {};
}

}  // namespace ridgecal::report::test
