// ridgecal: checks on free text that ends up in records, headers and reports.
//
// Every string ridgecal writes into a record (sensor and unit names, column
// names, setpoint labels, file names) must be valid UTF-8, so that the JSON
// round-trips it byte for byte. Generated C and HTML escape what they embed;
// these helpers only decide whether a string is acceptable at all.
#pragma once

#include <cstddef>
#include <string>
#include <string_view>

namespace ridgecal {

/// Longest sensor or unit name accepted into a record.
inline constexpr std::size_t kMaxRecordNameBytes = 1024;

/// True when `s` is well-formed UTF-8 (no overlong forms, no surrogates, no
/// code points above U+10FFFF, no truncated sequences).
bool is_valid_utf8(std::string_view s);

/// Empty when `s` is acceptable as a name in a record: valid UTF-8, no control
/// characters (tab, newline and carriage return included), at most
/// `max_bytes` bytes. Otherwise a short reason, e.g.
/// "is not valid UTF-8 (byte 0xe9 at offset 4)".
std::string name_problem(std::string_view s, std::size_t max_bytes);

/// Printable, bounded form of arbitrary bytes for messages: control
/// characters and bytes of invalid UTF-8 as \xNN, cut after `max_chars` bytes
/// with "...".
std::string shown_text(std::string_view s, std::size_t max_chars = 40);

}  // namespace ridgecal
