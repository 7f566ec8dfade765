#include "ridgecal/calibration_csv.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <charconv>
#include <cmath>
#include <stdexcept>
#include <string_view>
#include <unordered_set>

#include "ridgecal/atomic_file.hpp"
#include "ridgecal/errors.hpp"
#include "ridgecal/sha256.hpp"
#include "ridgecal/text_check.hpp"

namespace ridgecal {

std::string CsvLimits::validate() const {
  if (max_bytes == 0) return "limits.max_bytes is 0; it must be at least 1";
  if (max_rows == 0) return "limits.max_rows is 0; it must be at least 1";
  if (max_fields < 2)
    return fmt::format("limits.max_fields is {}; it must be at least 2", max_fields);
  if (max_field_bytes == 0) return "limits.max_field_bytes is 0; it must be at least 1";
  return {};
}

std::string CsvOptions::validate() const {
  if (reading_column.empty()) return "reading_column is empty; it must name a column";
  if (reference_column.empty()) return "reference_column is empty; it must name a column";
  if (reading_column == reference_column)
    return fmt::format("reading_column and reference_column are both '{}'; they must differ",
                       reading_column);
  if (delimiter != ',' && delimiter != ';' && delimiter != '\t')
    return fmt::format("delimiter is '{}'; it must be ',', ';' or a tab",
                       shown_text(std::string(1, delimiter)));
  if (!aux_column.empty() && (aux_column == reading_column || aux_column == reference_column))
    return fmt::format("aux_column is '{}'; it must differ from the reading and reference columns",
                       shown_text(aux_column));
  if (!aux_setpoint_column.empty() && aux_column.empty())
    return "aux_setpoint_column is set without aux_column; name the aux column too";
  if (!direction_column.empty() &&
      (direction_column == reading_column || direction_column == reference_column))
    return fmt::format(
        "direction_column is '{}'; it must differ from the reading and reference columns",
        direction_column);
  if (decimal_comma && delimiter == ',')
    return "decimal_comma is set with delimiter ','; a decimal comma needs delimiter ';' or a tab";
  const std::pair<const char*, const std::string*> names[] = {
      {"reading_column", &reading_column},
      {"reference_column", &reference_column},
      {"setpoint_column", &setpoint_column},
      {"role_column", &role_column},
      {"direction_column", &direction_column}};
  for (const auto& [field, value] : names)
    if (const std::string why = name_problem(*value, limits.max_field_bytes); !why.empty())
      return fmt::format("{} '{}' {}", field, shown_text(*value), why);
  return limits.validate();
}

std::string to_string(UserRole r) {
  switch (r) {
    case UserRole::Unspecified:
      return "unspecified";
    case UserRole::Fit:
      return "fit";
    case UserRole::Check:
      return "check";
  }
  return "unspecified";
}

UserRole user_role_from_string(const std::string& s) {
  std::string l = s;
  std::transform(l.begin(), l.end(), l.begin(), [](unsigned char c) { return std::tolower(c); });
  if (l == "fit") return UserRole::Fit;
  if (l == "check") return UserRole::Check;
  if (l == "unspecified") return UserRole::Unspecified;
  throw std::invalid_argument("role must be 'fit' or 'check', got '" + s + "'");
}

std::string to_string(SweepDirection d) {
  switch (d) {
    case SweepDirection::Unspecified:
      return "unspecified";
    case SweepDirection::Up:
      return "up";
    case SweepDirection::Down:
      return "down";
  }
  return "unspecified";
}

SweepDirection sweep_direction_from_string(const std::string& s) {
  std::string l = s;
  std::transform(l.begin(), l.end(), l.begin(), [](unsigned char c) { return std::tolower(c); });
  if (l == "up") return SweepDirection::Up;
  if (l == "down") return SweepDirection::Down;
  if (l == "unspecified") return SweepDirection::Unspecified;
  throw std::invalid_argument("direction must be 'up' or 'down', got '" + s + "'");
}

namespace {

std::string trim(std::string_view s) {
  std::size_t b = 0, e = s.size();
  while (b < e && (s[b] == ' ' || s[b] == '\t')) ++b;
  while (e > b && (s[e - 1] == ' ' || s[e - 1] == '\t')) --e;
  return std::string(s.substr(b, e - b));
}

// Printable form of a cell for messages: bounded length, control chars and
// invalid UTF-8 escaped.
std::string shown(std::string_view s) {
  return shown_text(s, 40);
}

// Splits one record into fields. Quotes may wrap a field; a quote inside a
// quoted field is doubled. Throws on an unterminated quote.
// Fields and their lengths are bounded by `limits` (checked as they grow, so a
// hostile line never makes us allocate more than the limits allow).
std::vector<std::string> split_fields(std::string_view line, char delim, const CsvLimits& limits,
                                      const std::string& file, std::size_t lineno) {
  std::vector<std::string> out;
  std::string cur;
  bool in_quotes = false, was_quoted = false;
  for (std::size_t i = 0; i < line.size(); ++i) {
    const char c = line[i];
    if (cur.size() >= limits.max_field_bytes)
      throw InputError(
          file, lineno,
          fmt::format("field {} is longer than {} bytes", out.size() + 1, limits.max_field_bytes),
          in_quotes ? "is a closing quote missing? (raise the limit with --max-field-bytes)"
                    : "raise the limit with --max-field-bytes if this is intended");
    if (in_quotes) {
      if (c == '"') {
        if (i + 1 < line.size() && line[i + 1] == '"') {
          cur += '"';
          ++i;
        } else {
          in_quotes = false;
        }
      } else {
        cur += c;
      }
    } else if (c == '"' && trim(cur).empty()) {
      in_quotes = true;
      was_quoted = true;
      cur.clear();
    } else if (c == delim) {
      if (out.size() + 1 >= limits.max_fields)
        throw InputError(file, lineno,
                         fmt::format("the row has more than {} fields", limits.max_fields),
                         "raise the limit with --max-fields if this is intended");
      out.push_back(was_quoted ? cur : trim(cur));
      cur.clear();
      was_quoted = false;
    } else {
      cur += c;
    }
  }
  if (in_quotes)
    throw InputError(file, lineno, "unterminated quoted field",
                     "close the quote, or write a literal quote as two quotes (\"\")");
  out.push_back(was_quoted ? cur : trim(cur));
  return out;
}

double parse_number(const std::string& raw, const std::string& column, bool decimal_comma,
                    const std::string& file, std::size_t lineno) {
  std::string cell = raw;
  if (decimal_comma) {
    if (cell.find('.') != std::string::npos)
      throw InputError(
          file, lineno,
          fmt::format("column '{}' holds '{}', which has a '.' although --decimal-comma is given",
                      shown(column), shown(raw)),
          "write numbers as 12,5 without thousands separators, or drop --decimal-comma");
    std::replace(cell.begin(), cell.end(), ',', '.');
  }
  const char* b = cell.data();
  const char* e = cell.data() + cell.size();
  if (b != e && *b == '+') ++b;  // from_chars does not take a leading '+'
  double v = 0.0;
  const auto res = std::from_chars(b, e, v, std::chars_format::general);
  if (cell.empty())
    throw InputError(file, lineno, fmt::format("column '{}' is empty", shown(column)),
                     "every row needs a number in this column; delete the row or fill it in",
                     InputCause::EmptyCell);
  if (res.ec == std::errc::result_out_of_range)
    throw InputError(file, lineno,
                     fmt::format("column '{}' holds '{}', which is out of the range of a double",
                                 shown(column), shown(cell)),
                     "check the value");
  if (res.ec != std::errc() || res.ptr != e) {
    const bool comma = raw.find(',') != std::string::npos && !decimal_comma;
    throw InputError(
        file, lineno,
        fmt::format("column '{}' holds '{}', which is not a number", shown(column), shown(raw)),
        comma
            ? "use '.' as the decimal point, or give --decimal-comma (with --delimiter ';' or tab)"
            : "write a plain decimal number such as 12.5 or 1.25e3");
  }
  if (!std::isfinite(v))
    throw InputError(file, lineno,
                     fmt::format("column '{}' holds '{}', which is not a finite number",
                                 shown(column), shown(cell)),
                     "NaN and infinities cannot be calibrated; remove the row");
  if (v != 0.0 && (std::fabs(v) > kMaxMagnitude || std::fabs(v) < kMinMagnitude))
    throw InputError(
        file, lineno,
        fmt::format("column '{}' holds '{}', whose magnitude is outside the supported range "
                    "[{:g}, {:g}]",
                    shown(column), shown(raw), kMinMagnitude, kMaxMagnitude),
        "express the column in another unit (e.g. mV instead of V) so its values are moderate");
  return v;
}

}  // namespace

Dataset parse_calibration_csv(const std::string& text, const std::string& file,
                              const CsvOptions& options) {
  if (const std::string err = options.validate(); !err.empty())
    throw InputError("", 0, "invalid column options: " + err);
  Dataset ds;
  ds.file = file;
  ds.sha256 = sha256_hex(text);
  ds.columns = options;

  std::string_view rest(text);
  if (rest.substr(0, 3) == "\xEF\xBB\xBF") rest.remove_prefix(3);

  std::vector<std::string> header;
  std::size_t header_line = 0;
  int reading_idx = -1, reference_idx = -1, setpoint_idx = -1, role_idx = -1, aux_idx = -1,
      aux_sp_idx = -1;
  int direction_idx = -1;
  std::size_t lineno = 0;
  while (!rest.empty()) {
    const std::size_t nl = rest.find('\n');
    std::string_view line = rest.substr(0, nl);
    rest = (nl == std::string_view::npos) ? std::string_view() : rest.substr(nl + 1);
    ++lineno;
    if (!line.empty() && line.back() == '\r') line.remove_suffix(1);
    const std::string t = trim(line);
    if (t.empty() || t[0] == '#') continue;
    if (line.find('\0') != std::string_view::npos)
      throw InputError(file, lineno, "the line contains a NUL byte", "is this a text CSV file?");

    std::vector<std::string> fields =
        split_fields(line, options.delimiter, options.limits, file, lineno);
    if (header.empty()) {
      header = std::move(fields);
      header_line = lineno;
      // Linear in the number of columns (a hostile header can have 100,000).
      std::unordered_set<std::string_view> seen;
      seen.reserve(header.size());
      for (const std::string& name : header)
        if (!name.empty() && !seen.insert(name).second)
          throw InputError(file, lineno,
                           fmt::format("column '{}' appears twice in the header", shown(name)),
                           "give every column a distinct name");
      auto find = [&](const std::string& name, const char* what) {
        const auto it = std::find(header.begin(), header.end(), name);
        if (it == header.end()) {
          std::string names;
          for (const auto& h : header) names += (names.empty() ? "" : ", ") + shown(h);
          const bool other_delim =
              header.size() == 1 && (header[0].find(';') != std::string::npos ||
                                     header[0].find('\t') != std::string::npos ||
                                     header[0].find(',') != std::string::npos);
          throw InputError(
              file, lineno,
              fmt::format("the header has no {} column '{}' (columns: {})", what, shown(name),
                          names),
              other_delim ? "the columns may be separated by another delimiter; see --delimiter"
                          : fmt::format("name the column with the matching option"));
        }
        return static_cast<int>(it - header.begin());
      };
      reading_idx = find(options.reading_column, "reading");
      reference_idx = find(options.reference_column, "reference");
      if (!options.setpoint_column.empty())
        setpoint_idx = find(options.setpoint_column, "setpoint");
      if (!options.role_column.empty()) role_idx = find(options.role_column, "role");
      if (!options.aux_column.empty()) aux_idx = find(options.aux_column, "aux");
      if (!options.aux_setpoint_column.empty())
        aux_sp_idx = find(options.aux_setpoint_column, "aux setpoint");
      if (!options.direction_column.empty())
        direction_idx = find(options.direction_column, "direction");
      continue;
    }
    if (fields.size() != header.size())
      throw InputError(
          file, lineno,
          fmt::format("the row has {} fields but the header (line {}) has {}", fields.size(),
                      header_line, header.size()),
          fields.size() > header.size() && options.delimiter == ','
              ? "every row needs one value per column; check for an extra delimiter (numbers with "
                "a "
                "decimal comma need --delimiter ';' and --decimal-comma)"
              : "every row needs one value per column; check for a missing or extra delimiter");
    if (ds.rows.size() >= options.limits.max_rows)
      throw InputError(
          file, lineno, fmt::format("the file has more than {} data rows", options.limits.max_rows),
          "raise the limit with --max-rows (see docs/robustness.md for the memory it needs)");
    Observation ob;
    ob.line = lineno;
    ob.reading = parse_number(fields[static_cast<std::size_t>(reading_idx)], options.reading_column,
                              options.decimal_comma, file, lineno);
    ob.reference = parse_number(fields[static_cast<std::size_t>(reference_idx)],
                                options.reference_column, options.decimal_comma, file, lineno);
    if (setpoint_idx >= 0) {
      ob.setpoint = fields[static_cast<std::size_t>(setpoint_idx)];
      if (ob.setpoint.empty())
        throw InputError(
            file, lineno,
            fmt::format("the setpoint column '{}' is empty", shown(options.setpoint_column)),
            "every row needs a setpoint label");
      if (const std::string why = name_problem(ob.setpoint, options.limits.max_field_bytes);
          !why.empty())
        throw InputError(file, lineno,
                         fmt::format("the setpoint label '{}' {}", shown(ob.setpoint), why),
                         "save the file as UTF-8 and keep labels to printable text");
    } else {
      ob.setpoint = fmt::format("{}", ob.reference);  // shortest round-trip text
    }
    if (aux_idx >= 0)
      ob.aux = parse_number(fields[static_cast<std::size_t>(aux_idx)], options.aux_column,
                            options.decimal_comma, file, lineno);
    if (aux_sp_idx >= 0) {
      ob.aux_setpoint = fields[static_cast<std::size_t>(aux_sp_idx)];
      if (ob.aux_setpoint.empty())
        throw InputError(file, lineno,
                         fmt::format("the aux setpoint column '{}' is empty",
                                     shown(options.aux_setpoint_column)),
                         "every row needs an aux setpoint label");
    }
    if (role_idx >= 0) {
      const std::string& cell = fields[static_cast<std::size_t>(role_idx)];
      try {
        ob.role = user_role_from_string(cell);
        if (ob.role == UserRole::Unspecified) throw std::invalid_argument("");
      } catch (const std::invalid_argument&) {
        throw InputError(
            file, lineno,
            fmt::format("the role column '{}' holds '{}'", shown(options.role_column), shown(cell)),
            "use 'fit' for points to calibrate on and 'check' for held-out check points");
      }
    }
    if (direction_idx >= 0) {
      const std::string& cell = fields[static_cast<std::size_t>(direction_idx)];
      try {
        ob.direction = sweep_direction_from_string(trim(cell));
        if (ob.direction == SweepDirection::Unspecified) throw std::invalid_argument("");
      } catch (const std::invalid_argument&) {
        throw InputError(
            file, lineno,
            fmt::format("the direction column '{}' holds '{}'", shown(options.direction_column),
                        shown(cell)),
            "use 'up' for rows taken on the rising sweep and 'down' for the falling sweep");
      }
    }
    ds.rows.push_back(std::move(ob));
  }
  if (header.empty())
    throw InputError(file, 1, "the file is empty",
                     "a calibration CSV needs a header row and data rows");
  if (ds.rows.empty())
    throw InputError(file, header_line, "the file has a header but no data rows",
                     "add one row per observation below the header");
  return ds;
}

Dataset read_calibration_csv(const std::string& path, const CsvOptions& options) {
  if (const std::string err = options.validate(); !err.empty())
    throw InputError("", 0, "invalid column options: " + err);
  return parse_calibration_csv(
      read_file_bytes_limited(path, options.limits.max_bytes,
                              "raise the limit with --max-bytes if this is intended"),
      path, options);
}

namespace {
struct ColumnSpread {
  double lo = 0.0, hi = 0.0, threshold = 0.0;
  bool constant() const { return !(hi - lo > threshold); }
};
ColumnSpread column_spread(const std::vector<Observation>& rows, double Observation::*member,
                           double floor) {
  ColumnSpread c;
  c.lo = c.hi = rows.front().*member;
  for (const Observation& o : rows) {
    c.lo = std::min(c.lo, o.*member);
    c.hi = std::max(c.hi, o.*member);
  }
  c.threshold =
      std::max(kConstantRelativeSpread * std::max(std::fabs(c.lo), std::fabs(c.hi)), floor);
  return c;
}
}  // namespace

void require_variation(const Dataset& data, const VariationFloors& floors, bool one_point_ok) {
  if (data.rows.empty()) return;
  const ColumnSpread x = column_spread(data.rows, &Observation::reading, floors.reading);
  const ColumnSpread y = column_spread(data.rows, &Observation::reference, floors.reference);
  const std::size_t line = data.rows.front().line;
  const std::size_t n = data.rows.size();
  if (one_point_ok && x.constant() == y.constant()) return;
  if (x.constant() && y.constant())
    throw InputError(data.file, line,
                     fmt::format("neither the readings nor the references vary: all {} rows read "
                                 "{} against reference {}",
                                 n, x.lo, y.lo),
                     "a calibration needs setpoints across the range");
  if (y.constant())
    throw InputError(
        data.file, line,
        fmt::format("the references do not vary: all {} lie within {} .. {} (a spread "
                    "up to {:.3g} counts as constant) while the readings span {} .. {}",
                    n, y.lo, y.hi, y.threshold, x.lo, x.hi),
        "check the reference column and the reference standard (frozen or disconnected?); "
        "see docs/robustness.md");
  if (x.constant())
    throw InputError(
        data.file, line,
        fmt::format("the readings do not vary: all {} lie within {} .. {} (a spread up "
                    "to {:.3g} counts as constant) while the references span {} .. {}",
                    n, x.lo, x.hi, x.threshold, y.lo, y.hi),
        "check the reading column and the sensor (stuck, open or shorted?); see "
        "docs/robustness.md",
        InputCause::ConstantReadings);
}

}  // namespace ridgecal
