#include "ridgecal/batch_reader.hpp"

#include <fcntl.h>
#include <fmt/format.h>
#include <sys/stat.h>
#include <unistd.h>

#include <algorithm>
#include <cerrno>
#include <charconv>
#include <cmath>
#include <cstdint>
#include <cstring>
#include <filesystem>
#include <string_view>

#include "ridgecal/batch_fast_parse.hpp"
#include "ridgecal/errors.hpp"
#include "ridgecal/text_check.hpp"

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

std::string trim(const std::string& s) {
  std::size_t b = 0, e = s.size();
  while (b < e && (s[b] == ' ' || s[b] == '\t')) ++b;
  while (e > b && (s[e - 1] == ' ' || s[e - 1] == '\t')) --e;
  return s.substr(b, e - b);
}

// The fields of a CSV line, quotes as in calibration_csv.cpp, in one pass.
enum class Split { Ok, OpenQuote, TooManyFields, FieldTooLong };

// Splits `line` into `out`, stopping after field `last` (all fields when
// last < 0). Refuses more than `max_fields` fields or a field over
// `max_field_bytes` (0: no limits).
Split split_fields(std::string_view line, char delim, int last, std::size_t max_fields,
                   std::size_t max_field_bytes, std::vector<std::string>& out) {
  out.clear();
  std::string cur;
  bool in_quotes = false, was_quoted = false;
  auto finish = [&] {
    out.push_back(was_quoted ? cur : trim(cur));
    cur.clear();
    was_quoted = false;
  };
  for (std::size_t i = 0; i < line.size(); ++i) {
    const char c = line[i];
    if (max_field_bytes > 0 && cur.size() >= max_field_bytes) return Split::FieldTooLong;
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
      if (max_fields > 0 && out.size() + 1 >= max_fields) return Split::TooManyFields;
      finish();
      if (last >= 0 && out.size() > static_cast<std::size_t>(last)) return Split::Ok;
    } else {
      cur += c;
    }
  }
  if (in_quotes) return Split::OpenQuote;
  finish();
  return Split::Ok;
}

// The unit label of a record: Ok and `out` set, Ok with `found` false when the
// record has too few fields, or OpenQuote.
Split unit_field(std::string_view line, char delim, int idx, std::string& out, bool& found) {
  std::vector<std::string> f;
  const Split r = split_fields(line, delim, idx, 0, 0, f);
  found = r == Split::Ok && f.size() > static_cast<std::size_t>(idx);
  if (found) out = f[static_cast<std::size_t>(idx)];
  return r;
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

std::size_t line_limit_of(const CsvLimits& l) {
  // every field at its longest, quoted, plus its delimiter; saturating
  const std::size_t per = l.max_field_bytes > SIZE_MAX - 3 ? SIZE_MAX : l.max_field_bytes + 3;
  return l.max_fields > SIZE_MAX / per ? SIZE_MAX : l.max_fields * per;
}

}  // namespace

UnitReader::UnitReader(std::vector<std::string> files, BatchInputOptions options)
    : files_(std::move(files)), options_(std::move(options)) {
  line_limit_ = line_limit_of(options_.csv.limits);
  for (const auto& f : files_) {
    struct stat st {};
    if (::stat(f.c_str(), &st) == 0 && S_ISREG(st.st_mode))
      bytes_total_ += static_cast<std::uint64_t>(st.st_size);
  }
}

UnitReader::~UnitReader() {
  if (fd_ >= 0) ::close(fd_);
}

bool UnitReader::fill() {
  if (eof_) return false;
  if (buf_pos_ > 0) {
    buf_.erase(0, buf_pos_);
    buf_pos_ = 0;
  }
  const std::size_t old = buf_.size();
  buf_.resize(old + (1u << 16));
  ssize_t n;
  do {
    n = ::read(fd_, &buf_[old], 1u << 16);
  } while (n < 0 && errno == EINTR);
  if (n < 0) {
    const int err = errno;
    buf_.resize(old);
    throw InputError(files_[file_index_ - 1], lineno_ + 1,
                     std::string("cannot read the file: ") + std::strerror(err),
                     "check the file and the device");
  }
  buf_.resize(old + static_cast<std::size_t>(n));
  if (n == 0) eof_ = true;
  return n > 0;
}

bool UnitReader::read_line(std::string& line, bool& too_long) {
  line.clear();
  too_long = false;
  std::uint64_t length = 0;
  bool any = false;
  for (;;) {
    if (buf_pos_ >= buf_.size() && !fill()) break;
    const char* b = buf_.data() + buf_pos_;
    const std::size_t avail = buf_.size() - buf_pos_;
    const void* nl = std::memchr(b, '\n', avail);
    const std::size_t take =
        nl ? static_cast<std::size_t>(static_cast<const char*>(nl) - b) : avail;
    any = true;
    length += take;
    if (line.size() < line_limit_) line.append(b, std::min(take, line_limit_ - line.size()));
    buf_pos_ += take + (nl ? 1 : 0);
    bytes_read_ += take + (nl ? 1 : 0);
    if (length > line_limit_) {
      too_long = true;
      // A header (or a whole file) without an end of line: refuse at once.
      if (header_.empty() || length > options_.csv.limits.max_bytes)
        throw InputError(files_[file_index_ - 1], lineno_ + 1,
                         fmt::format("the line is longer than {} bytes (--max-fields x "
                                     "(--max-field-bytes + 3))",
                                     line_limit_),
                         "is this a text CSV file? (raise the limits with --max-fields and "
                         "--max-field-bytes if this is intended)");
    }
    if (nl) break;
    buf_.clear();
    buf_pos_ = 0;
  }
  if (!any) return false;
  ++lineno_;
  if (lineno_ == 1 && line.compare(0, 3, "\xEF\xBB\xBF") == 0) line.erase(0, 3);
  if (!line.empty() && line.back() == '\r') line.pop_back();
  return true;
}

bool UnitReader::open_next_file() {
  if (file_index_ >= files_.size()) return false;
  const std::string& file = files_[file_index_++];
  if (fd_ >= 0) ::close(fd_);
  fd_ = ::open(file.c_str(), O_RDONLY | O_CLOEXEC);
  if (fd_ < 0)
    throw InputError(file, 0, std::string("cannot open the file: ") + std::strerror(errno),
                     "check the path and the permissions");
  eof_ = false;
  buf_.clear();
  buf_pos_ = 0;
  lineno_ = 0;
  has_pending_ = false;
  header_.clear();
  std::string line;
  bool too_long = false;
  while (read_line(line, too_long)) {
    if (is_skipped(line)) continue;
    header_ = line;
    header_line_ = lineno_;
    break;
  }
  if (header_.empty())
    throw InputError(file, 0, "the file is empty", "a batch CSV needs a header row and data rows");
  const CsvLimits& lim = options_.csv.limits;
  std::vector<std::string> names;
  switch (split_fields(header_, options_.csv.delimiter, -1, lim.max_fields, lim.max_field_bytes,
                       names)) {
    case Split::TooManyFields:
      throw InputError(file, header_line_,
                       fmt::format("the header has more than {} fields", lim.max_fields),
                       "raise the limit with --max-fields if this is intended");
    case Split::FieldTooLong:
      throw InputError(file, header_line_,
                       fmt::format("a column name is longer than {} bytes", lim.max_field_bytes),
                       "raise the limit with --max-field-bytes if this is intended");
    case Split::OpenQuote:
      throw InputError(file, header_line_, "unterminated quoted field in the header",
                       "close the quote, or write a literal quote as two quotes (\"\")");
    case Split::Ok:
      break;
  }
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
  const CsvLimits& lim = options_.csv.limits;
  std::string line;
  bool too_long = false;
  for (;;) {
    if (fd_ < 0 || (!has_pending_ && eof_ && buf_pos_ >= buf_.size())) {
      if (!open_next_file()) return false;
    }
    out = UnitChunk{};
    out.index = next_index_;
    out.file = files_[file_index_ - 1];
    out.header_line = header_line_;
    out.text = header_;
    out.text += '\n';
    bool have_unit = false;
    std::string limit_error;  // the first limit the unit broke
    auto take = [&](const std::string& l, std::size_t ln, bool l_too_long) {
      if (!have_unit) {
        out.first_line = ln;
        have_unit = true;
      }
      const bool data = !is_skipped(l);
      if (limit_error.empty()) {
        if (l_too_long)
          limit_error = fmt::format(
              "{}:{}: the line is longer than {} bytes (--max-fields x (--max-field-bytes + 3))",
              out.file, ln, line_limit_);
        else if (data && out.rows >= lim.max_rows)
          limit_error =
              fmt::format("{}:{}: the unit has more than {} data rows", out.file, ln, lim.max_rows);
        else if (out.text.size() + l.size() + 1 > lim.max_bytes)
          limit_error = fmt::format("{}:{}: the unit's rows are longer than {} bytes", out.file, ln,
                                    lim.max_bytes);
      }
      if (limit_error.empty()) {
        out.text += l;
        out.text += '\n';
      }
      if (data) ++out.rows;
    };
    // Reads the physical lines that complete a record whose unit label is
    // in an open quote (a newline inside the quotes), within the line limit.
    auto complete_record = [&](std::string& rec, bool& rec_too_long) {
      std::string more;
      bool more_too_long = false;
      std::string u;
      bool found = false;
      while (unit_field(rec, options_.csv.delimiter, unit_idx_, u, found) == Split::OpenQuote &&
             !rec_too_long && read_line(more, more_too_long)) {
        if (rec.size() + 1 + more.size() > line_limit_ || more_too_long) {
          rec_too_long = true;
          break;
        }
        rec += '\n';
        rec += more;
      }
    };
    if (has_pending_) {
      has_pending_ = false;
      std::string u;
      bool found = false;
      if (unit_idx_ >= 0) unit_field(pending_, options_.csv.delimiter, unit_idx_, u, found);
      out.unit = u;
      take(pending_, pending_line_, pending_too_long_);
    }
    while (read_line(line, too_long)) {
      const std::size_t ln = lineno_;
      if (is_skipped(line)) {
        if (have_unit) take(line, ln, too_long);
        continue;
      }
      if (unit_idx_ < 0) {
        if (!have_unit) out.unit = stem_of(out.file);
        take(line, ln, too_long);
        continue;
      }
      complete_record(line, too_long);
      std::string u;
      bool found = false;
      unit_field(line, options_.csv.delimiter, unit_idx_, u, found);
      if (!have_unit) {
        out.unit = found ? u : std::string();
        take(line, ln, too_long);
        continue;
      }
      if (!found || u == out.unit) {  // a ragged row stays with its unit; the parser reports it
        take(line, ln, too_long);
        continue;
      }
      pending_ = line;
      pending_line_ = ln;
      pending_too_long_ = too_long;
      has_pending_ = true;
      break;
    }
    if (!have_unit) {
      eof_ = true;
      buf_.clear();
      buf_pos_ = 0;
      continue;  // file ended without further rows: next file
    }
    if (unit_idx_ < 0 && out.unit.empty()) out.unit = stem_of(out.file);
    ++next_index_;
    if (out.unit.empty()) {
      out.error = fmt::format("{}:{}: the unit column '{}' is empty", out.file, out.first_line,
                              options_.unit_column);
    } else if (const std::string why = name_problem(out.unit, kMaxRecordNameBytes); !why.empty()) {
      out.error = fmt::format("{}:{}: the unit label '{}' {}", out.file, out.first_line,
                              shown_text(out.unit), why);
    } else if (!seen_.insert(unit_label_hash(out.unit))) {
      out.error = fmt::format(
          "{}:{}: unit '{}' appears again after other units; the rows of a unit must be contiguous "
          "(sort the file by the unit column)",
          out.file, out.first_line, out.unit);
    } else if (!limit_error.empty()) {
      out.error = limit_error;
    }
    return true;
  }
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
    throw InputError(e.file(), map_line(e.line()), msg, e.hint(), e.cause());
  }
}

}  // namespace ridgecal
