#include "ridgecal/batch_reader.hpp"

#include <fmt/format.h>
#include <sys/stat.h>

#include <algorithm>
#include <charconv>
#include <cmath>
#include <filesystem>
#include <string_view>

#include "ridgecal/batch_fast_parse.hpp"
#include "ridgecal/errors.hpp"

namespace ridgecal {

namespace fs = std::filesystem;

std::string BatchInputOptions::validate() const {
  if (const std::string e = csv.validate(); !e.empty()) return e;
  if (!unit_column.empty() &&
      (unit_column == csv.reading_column || unit_column == csv.reference_column ||
       unit_column == csv.setpoint_column || unit_column == csv.role_column))
    return fmt::format(
        "unit_column is '{}'; it must differ from the reading, reference, setpoint and role "
        "columns",
        unit_column);
  return {};
}

std::vector<std::string> batch_input_files(const std::string& path) {
  std::error_code ec;
  const fs::file_status st = fs::status(path, ec);
  if (ec || !fs::exists(st))
    throw InputError(path, 0, "no such file or directory", "check the path");
  if (!fs::is_directory(st)) return {path};
  std::vector<std::string> files;
  for (const auto& e : fs::directory_iterator(path, ec)) {
    if (e.path().extension() == ".csv" && e.is_regular_file()) files.push_back(e.path().string());
  }
  if (ec)
    throw InputError(path, 0, "cannot list the directory: " + ec.message(),
                     "check the permissions");
  std::sort(files.begin(), files.end());
  if (files.empty())
    throw InputError(path, 0, "the directory holds no .csv file",
                     "give a CSV file or a directory of CSV files");
  return files;
}

namespace {

std::uint64_t fnv1a(const std::string& s) {
  std::uint64_t h = 0xcbf29ce484222325ULL;
  for (unsigned char c : s) {
    h ^= c;
    h *= 0x100000001b3ULL;
  }
  return h;
}

std::string trim(const std::string& s) {
  std::size_t b = 0, e = s.size();
  while (b < e && (s[b] == ' ' || s[b] == '\t')) ++b;
  while (e > b && (s[e - 1] == ' ' || s[e - 1] == '\t')) --e;
  return s.substr(b, e - b);
}

// Field `want` of a CSV line (quotes as in calibration_csv.cpp); false when
// the line has fewer fields or an unterminated quote (the parser reports it).
bool field_at(const std::string& line, char delim, int want, std::string& out) {
  std::string cur;
  bool in_quotes = false, was_quoted = false;
  int idx = 0;
  for (std::size_t i = 0; i < line.size(); ++i) {
    const char c = line[i];
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
      in_quotes = was_quoted = true;
      cur.clear();
    } else if (c == delim) {
      if (idx == want) {
        out = was_quoted ? cur : trim(cur);
        return true;
      }
      ++idx;
      cur.clear();
      was_quoted = false;
    } else {
      cur += c;
    }
  }
  if (in_quotes || idx != want) return false;
  out = was_quoted ? cur : trim(cur);
  return true;
}

std::vector<std::string> all_fields(const std::string& line, char delim) {
  std::vector<std::string> v;
  std::string f;
  for (int i = 0; field_at(line, delim, i, f); ++i) v.push_back(f);
  return v;
}

bool is_skipped(const std::string& line) {
  for (char c : line) {
    if (c == ' ' || c == '\t') continue;
    return c == '#';
  }
  return true;  // blank
}

std::string stem_of(const std::string& path) {
  return fs::path(path).stem().string();
}

}  // namespace

UnitReader::UnitReader(std::vector<std::string> files, BatchInputOptions options)
    : files_(std::move(files)), options_(std::move(options)) {
  for (const auto& f : files_) {
    struct stat st {};
    if (::stat(f.c_str(), &st) == 0) bytes_total_ += static_cast<std::uint64_t>(st.st_size);
  }
}

UnitReader::~UnitReader() = default;

bool UnitReader::read_line(std::string& line) {
  if (!std::getline(*in_, line)) return false;
  bytes_read_ += line.size() + 1;
  ++lineno_;
  if (lineno_ == 1 && line.compare(0, 3, "\xEF\xBB\xBF") == 0) line.erase(0, 3);
  if (!line.empty() && line.back() == '\r') line.pop_back();
  return true;
}

bool UnitReader::open_next_file() {
  if (file_index_ >= files_.size()) return false;
  const std::string& file = files_[file_index_++];
  in_ = std::make_unique<std::ifstream>(file, std::ios::binary);
  if (!*in_)
    throw InputError(file, 0, "cannot open the file", "check the path and the permissions");
  lineno_ = 0;
  has_pending_ = false;
  header_.clear();
  std::string line;
  while (read_line(line)) {
    if (is_skipped(line)) continue;
    header_ = line;
    header_line_ = lineno_;
    break;
  }
  if (header_.empty())
    throw InputError(file, 0, "the file is empty", "a batch CSV needs a header row and data rows");
  const std::vector<std::string> names = all_fields(header_, options_.csv.delimiter);
  auto require = [&](const std::string& name, const char* what) {
    const auto it = std::find(names.begin(), names.end(), name);
    if (it == names.end())
      throw InputError(file, header_line_,
                       fmt::format("the header has no {} column '{}'", what, name),
                       "name the column with the matching option");
    return static_cast<int>(it - names.begin());
  };
  require(options_.csv.reading_column, "reading");
  require(options_.csv.reference_column, "reference");
  if (!options_.csv.setpoint_column.empty()) require(options_.csv.setpoint_column, "setpoint");
  if (!options_.csv.role_column.empty()) require(options_.csv.role_column, "role");
  unit_idx_ = options_.unit_column.empty() ? -1 : require(options_.unit_column, "unit");
  return true;
}

bool UnitReader::next(UnitChunk& out) {
  std::string line;
  for (;;) {
    if (!in_ || (!has_pending_ && in_->eof())) {
      if (!open_next_file()) return false;
    }
    out = UnitChunk{};
    out.index = next_index_;
    out.file = files_[file_index_ - 1];
    out.header_line = header_line_;
    out.text = header_;
    out.text += '\n';
    bool have_unit = false;
    auto take = [&](const std::string& l, std::size_t ln) {
      if (!have_unit) {
        out.first_line = ln;
        have_unit = true;
      }
      out.text += l;
      out.text += '\n';
      if (!is_skipped(l)) ++out.rows;
    };
    if (has_pending_) {
      has_pending_ = false;
      std::string u;
      if (unit_idx_ >= 0) field_at(pending_, options_.csv.delimiter, unit_idx_, u);
      out.unit = u;
      take(pending_, pending_line_);
    }
    while (read_line(line)) {
      if (is_skipped(line)) {
        if (have_unit) take(line, lineno_);
        continue;
      }
      if (unit_idx_ < 0) {
        if (!have_unit) out.unit = stem_of(out.file);
        take(line, lineno_);
        continue;
      }
      std::string u;
      const bool found = field_at(line, options_.csv.delimiter, unit_idx_, u);
      if (!have_unit) {
        out.unit = found ? u : std::string();
        take(line, lineno_);
        continue;
      }
      if (!found || u == out.unit) {  // a ragged row stays with its unit; the parser reports it
        take(line, lineno_);
        continue;
      }
      pending_ = line;
      pending_line_ = lineno_;
      has_pending_ = true;
      break;
    }
    if (!have_unit) {
      in_->setstate(std::ios::eofbit);
      continue;  // file ended without further rows: next file
    }
    if (unit_idx_ < 0 && out.unit.empty()) out.unit = stem_of(out.file);
    ++next_index_;
    if (out.unit.empty()) {
      out.error = fmt::format("{}:{}: the unit column '{}' is empty", out.file, out.first_line,
                              options_.unit_column);
    } else if (seen_before(fnv1a(out.unit))) {
      out.error = fmt::format(
          "{}:{}: unit '{}' appears again after other units; the rows of a unit must be contiguous "
          "(sort the file by the unit column)",
          out.file, out.first_line, out.unit);
    }
    return true;
  }
}

bool UnitReader::seen_before(std::uint64_t h) {
  if (std::binary_search(seen_sorted_.begin(), seen_sorted_.end(), h)) return true;
  if (std::find(seen_tail_.begin(), seen_tail_.end(), h) != seen_tail_.end()) return true;
  seen_tail_.push_back(h);
  if (seen_tail_.size() >= 1024) {
    std::sort(seen_tail_.begin(), seen_tail_.end());
    const std::size_t mid = seen_sorted_.size();
    seen_sorted_.insert(seen_sorted_.end(), seen_tail_.begin(), seen_tail_.end());
    std::inplace_merge(seen_sorted_.begin(),
                       seen_sorted_.begin() + static_cast<std::ptrdiff_t>(mid), seen_sorted_.end());
    seen_tail_.clear();
  }
  return false;
}

Dataset parse_unit_chunk(const UnitChunk& chunk, const CsvOptions& options) {
  // chunk.text line 1 is the header (file line header_line); line k >= 2 is
  // file line first_line + k - 2.
  auto map_line = [&](std::size_t k) -> std::size_t {
    if (k == 0) return 0;
    return k == 1 ? chunk.header_line : chunk.first_line + k - 2;
  };
  try {
    Dataset ds = parse_calibration_csv(chunk.text, chunk.file, options);
    for (Observation& ob : ds.rows) ob.line = map_line(ob.line);
    return ds;
  } catch (const InputError& e) {
    std::string msg = e.message();
    const std::string h1 = "header (line 1)";
    if (const auto p = msg.find(h1); p != std::string::npos)
      msg.replace(p, h1.size(), fmt::format("header (line {})", chunk.header_line));
    throw InputError(e.file(), map_line(e.line()), msg, e.hint());
  }
}

namespace {

std::string_view trim_view(std::string_view s) {
  std::size_t b = 0, e = s.size();
  while (b < e && (s[b] == ' ' || s[b] == '\t')) ++b;
  while (e > b && (s[e - 1] == ' ' || s[e - 1] == '\t')) --e;
  return s.substr(b, e - b);
}

// Splits on the delimiter and trims each field (no quotes: checked by the caller).
void split_plain(std::string_view line, char delim, std::vector<std::string_view>& out) {
  out.clear();
  std::size_t start = 0;
  for (;;) {
    const std::size_t p = line.find(delim, start);
    out.push_back(trim_view(
        line.substr(start, p == std::string_view::npos ? std::string_view::npos : p - start)));
    if (p == std::string_view::npos) return;
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
  return r.ec == std::errc() && r.ptr == e && std::isfinite(v);
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
    split_plain(line, options.delimiter, fields);
    if (!have_header) {
      have_header = true;
      ncols = fields.size();
      for (std::size_t i = 0; i < ncols; ++i) {
        for (std::size_t j = 0; j < i; ++j)
          if (fields[i] == fields[j] && !fields[i].empty()) return false;
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
    if (fields.size() != ncols) return false;
    Observation ob;
    ob.line = chunk.first_line + k - 2;
    if (!plain_number(fields[static_cast<std::size_t>(reading_idx)], ob.reading) ||
        !plain_number(fields[static_cast<std::size_t>(reference_idx)], ob.reference))
      return false;
    if (setpoint_idx >= 0) {
      ob.setpoint = std::string(fields[static_cast<std::size_t>(setpoint_idx)]);
      if (ob.setpoint.empty()) return false;
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

std::string unit_file_stem(const std::string& unit) {
  std::string s;
  bool changed = unit.empty() || unit == "." || unit == ".." || unit.size() > 100;
  for (char c : unit.substr(0, 100)) {
    const bool ok = (c >= 'A' && c <= 'Z') || (c >= 'a' && c <= 'z') || (c >= '0' && c <= '9') ||
                    c == '.' || c == '_' || c == '-';
    s += ok ? c : '_';
    changed = changed || !ok;
  }
  if (!s.empty() && s[0] == '.') {
    s[0] = '_';
    changed = true;
  }
  if (changed) s += fmt::format("-{:08x}", static_cast<std::uint32_t>(fnv1a(unit) >> 32));
  return s;
}

}  // namespace ridgecal
