// The batch's fast row parser (batch_fast_parse.hpp): plain rows without the
// general parser's per-cell allocations; anything unusual is declined and
// left to parse_unit_chunk, which reports it exactly.
#include "ridgecal/batch_fast_parse.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <charconv>
#include <cmath>
#include <stdexcept>
#include <string_view>
#include <vector>

#include "ridgecal/calibration_csv.hpp"
#include "ridgecal/text_check.hpp"

namespace ridgecal {

namespace {

std::string_view trim_view(std::string_view s) {
  std::size_t b = 0, e = s.size();
  while (b < e && (s[b] == ' ' || s[b] == '\t')) ++b;
  while (e > b && (s[e - 1] == ' ' || s[e - 1] == '\t')) --e;
  return s.substr(b, e - b);
}

// Splits on the delimiter and trims each field (no quotes: checked by the
// caller). False when a field is too long for the general parser, which
// refuses a field once max_field_bytes bytes of it (untrimmed) are followed by
// one more byte.
bool split_plain(std::string_view line, char delim, std::size_t max_field_bytes,
                 std::vector<std::string_view>& out) {
  out.clear();
  std::size_t start = 0;
  for (;;) {
    const std::size_t p = line.find(delim, start);
    const std::string_view raw =
        line.substr(start, p == std::string_view::npos ? std::string_view::npos : p - start);
    if (raw.size() >= max_field_bytes &&
        (p != std::string_view::npos || raw.size() > max_field_bytes))
      return false;
    out.push_back(trim_view(raw));
    if (p == std::string_view::npos) return true;
    start = p + 1;
  }
}

// As calibration_csv.cpp's parse_number accepts: optional '+', the whole cell, finite.
bool plain_number(std::string_view cell, double& v) {
  const char* b = cell.data();
  const char* e = b + cell.size();
  if (b != e && *b == '+') ++b;
  if (cell.empty()) return false;
  const auto r = std::from_chars(b, e, v, std::chars_format::general);
  return r.ec == std::errc() && r.ptr == e && std::isfinite(v) &&
         (v == 0.0 || (std::fabs(v) <= kMaxMagnitude && std::fabs(v) >= kMinMagnitude));
}

}  // namespace

bool parse_unit_chunk_fast(const UnitChunk& chunk, const CsvOptions& options, Dataset& out) {
  // Columns and number formats only the general parser reads.
  if (!options.aux_column.empty() || !options.aux_setpoint_column.empty() ||
      !options.direction_column.empty() || options.decimal_comma)
    return false;
  const std::string_view text(chunk.text);
  if (text.find('"') != std::string_view::npos || text.find('\0') != std::string_view::npos)
    return false;
  // A byte-order mark: the general parser drops it first, which can turn the
  // line after it into a comment (found by fuzz_batch_fast).
  if (text.substr(0, 3) == "\xEF\xBB\xBF") return false;
  out.file = chunk.file;
  out.sha256.clear();
  out.columns = options;
  out.rows.clear();
  std::vector<std::string_view> fields;
  fields.reserve(16);
  std::size_t ncols = 0;
  int reading_idx = -1, reference_idx = -1, setpoint_idx = -1, role_idx = -1;
  bool have_header = false;
  std::size_t k = 0;  // line in chunk.text
  for (std::size_t pos = 0; pos < text.size();) {
    const std::size_t nl = text.find('\n', pos);
    const std::string_view line =
        text.substr(pos, nl == std::string_view::npos ? std::string_view::npos : nl - pos);
    pos = nl == std::string_view::npos ? text.size() : nl + 1;
    ++k;
    const std::string_view t = trim_view(line);
    if (t.empty() || t[0] == '#') continue;
    if (!split_plain(line, options.delimiter, options.limits.max_field_bytes, fields)) return false;
    if (!have_header) {
      have_header = true;
      ncols = fields.size();
      {  // a duplicated name: the general parser reports it (sorted: linear-logarithmic)
        std::vector<std::string_view> sorted(fields.begin(), fields.end());
        std::sort(sorted.begin(), sorted.end());
        for (std::size_t i = 1; i < sorted.size(); ++i)
          if (sorted[i] == sorted[i - 1] && !sorted[i].empty()) return false;
      }
      if (ncols > options.limits.max_fields) return false;
      for (std::size_t i = 0; i < ncols; ++i) {
        if (fields[i] == options.reading_column) reading_idx = static_cast<int>(i);
        if (fields[i] == options.reference_column) reference_idx = static_cast<int>(i);
        if (!options.setpoint_column.empty() && fields[i] == options.setpoint_column)
          setpoint_idx = static_cast<int>(i);
        if (!options.role_column.empty() && fields[i] == options.role_column)
          role_idx = static_cast<int>(i);
      }
      if (reading_idx < 0 || reference_idx < 0 ||
          (!options.setpoint_column.empty() && setpoint_idx < 0) ||
          (!options.role_column.empty() && role_idx < 0))
        return false;
      continue;
    }
    if (fields.size() != ncols || out.rows.size() >= options.limits.max_rows) return false;
    Observation ob;
    ob.line = chunk.first_line + k - 2;
    if (!plain_number(fields[static_cast<std::size_t>(reading_idx)], ob.reading) ||
        !plain_number(fields[static_cast<std::size_t>(reference_idx)], ob.reference))
      return false;
    if (setpoint_idx >= 0) {
      ob.setpoint = std::string(fields[static_cast<std::size_t>(setpoint_idx)]);
      if (ob.setpoint.empty() || !name_problem(ob.setpoint, options.limits.max_field_bytes).empty())
        return false;
    } else {
      ob.setpoint = fmt::format("{}", ob.reference);  // as the parser: shortest round-trip text
    }
    if (role_idx >= 0) {
      try {
        ob.role = user_role_from_string(std::string(fields[static_cast<std::size_t>(role_idx)]));
      } catch (const std::invalid_argument&) {
        return false;
      }
      if (ob.role == UserRole::Unspecified) return false;
    }
    out.rows.push_back(std::move(ob));
  }
  return have_header && !out.rows.empty();
}

}  // namespace ridgecal
