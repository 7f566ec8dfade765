// ridgecal firmware export: safe text for generated C (identifiers, comments).
#pragma once

#include <cstddef>
#include <string>
#include <string_view>

namespace ridgecal::firmware {

/// Longest accepted symbol prefix.
inline constexpr std::size_t kMaxPrefixLength = 40;

/// Checks a prefix for generated C symbols. Returns "" when valid, otherwise a
/// message naming the value and the rule. Rule: [A-Za-z_][A-Za-z0-9_]*, at most
/// kMaxPrefixLength characters, no leading underscore (macros are the
/// upper-cased prefix, and "_X"/"__" names are reserved in C and C++), no "__"
/// anywhere and no trailing "_" (the generator appends "_", and C++ reserves
/// names containing "__").
std::string check_c_prefix(std::string_view prefix);

/// Upper-case form used for macros ("temp1" -> "TEMP1").
std::string macro_case(std::string_view prefix);

/// Makes arbitrary user text safe inside a C block comment: printable ASCII is
/// kept, except that "*/" and "/*" are broken up ("*\/", "/\*"); every other
/// byte (control characters, newlines, tabs, non-ASCII/UTF-8 bytes) and the
/// backslash become "\xHH". Trigraph starts "??" become "?\?". The result is truncated to
/// max_chars characters (then "...[truncated]" is appended).
std::string escape_c_comment(std::string_view text, std::size_t max_chars = 200);

}  // namespace ridgecal::firmware
