// ridgecal: streaming a production-line CSV unit by unit.
//
// A batch file is an ordinary calibration CSV (see calibration_csv.hpp) with
// one more column naming the unit (device) each row belongs to. The file is
// read line by line and handed out one unit at a time, so memory does not
// grow with the number of units.
//
// Requirement: the rows of a unit are contiguous (a file sorted by the unit
// column satisfies it; the order of units is free). A unit whose label shows
// up again after other units is reported as a failed chunk ("appears again"),
// it is never silently merged or fitted twice. (Labels are remembered as
// 64-bit hashes, 8 bytes per unit; two distinct labels colliding is
// improbable, about n^2 / 2^65 for n units.) Comment and blank lines go with
// the unit they follow.
//
// A directory of CSV files is read as its *.csv files in name order. Without
// a unit column every file is one unit, named after the file (without .csv).
//
// Limits (the CsvLimits of `fit`, csv.limits): a line may hold at most
// max_fields * (max_field_bytes + 3) bytes (every field at its longest,
// quoted, plus the delimiter); a header over the limit, with more than
// max_fields fields or a field over max_field_bytes makes the file unusable
// (InputError), so `batch /dev/zero` is refused after reading one line's
// worth. A unit with more than max_rows data rows or more than max_bytes bytes
// of rows, or with a data line over the line limit, fails with that error
// (its rows beyond the limit are read past, not kept). The unit label must be
// a name `fit` accepts (name_problem in text_check.hpp: valid UTF-8, no
// control characters, at most kMaxRecordNameBytes bytes); a label that is
// not fails its unit at the label's line. A quoted unit label that spans
// lines (a newline inside the quotes) is read as one record, whose label then
// holds a newline: its unit fails at the line where the label starts.
#pragma once

#include <cstdint>
#include <fstream>
#include <memory>
#include <string>
#include <vector>

#include "ridgecal/calibration_csv.hpp"

namespace ridgecal {

struct BatchInputOptions {
  std::string unit_column;  ///< column naming the unit; empty: one unit per file
  CsvOptions csv;           ///< the other columns, as for a single fit

  /// Empty when valid, else a message naming the field, the value and the rule.
  std::string validate() const;
};

/// The rows of one unit, as CSV text ready for parse_calibration_csv.
struct UnitChunk {
  std::uint64_t index = 0;      ///< 0-based position among the units of the whole input
  std::string unit;             ///< the unit label
  std::string file;             ///< file the rows come from
  std::size_t header_line = 0;  ///< line of the header in `file`
  std::size_t first_line = 0;   ///< line in `file` of the first row of the unit
  std::size_t rows = 0;         ///< data rows (not counting comments and blanks)
  std::string text;             ///< header line, then the unit's lines, '\n'-terminated
  std::string error;  ///< not empty: the chunk must not be fitted (e.g. the unit reappears)
  /// File stem of the unit's outputs (records/<stem>.json), given by the
  /// batch (UnitFileNames); empty: unit_file_stem(unit).
  std::string stem;
};

/// Input files of a batch: a regular file is itself; a directory gives its
/// regular *.csv files sorted by name. Throws InputError when the path does
/// not exist or a directory holds no CSV file.
std::vector<std::string> batch_input_files(const std::string& path);

/// The 64-bit FNV-1a hash of a unit label (batch_unit_names.cpp).
std::uint64_t unit_label_hash(const std::string& s);

/// A set of 64-bit hashes, 8 bytes per member: a sorted run plus a small
/// unsorted tail merged into it when full.
class HashSet64 {
 public:
  /// Adds `h`; false when it was already there.
  bool insert(std::uint64_t h);

 private:
  std::vector<std::uint64_t> sorted_, tail_;
};

class UnitReader {
 public:
  /// Precondition: options.validate() is empty, files not empty.
  UnitReader(std::vector<std::string> files, BatchInputOptions options);
  ~UnitReader();
  UnitReader(const UnitReader&) = delete;
  UnitReader& operator=(const UnitReader&) = delete;

  /// The next unit, false at the end of the input. Throws InputError on
  /// problems of a file as a whole: unreadable, no header, a missing column.
  bool next(UnitChunk& out);

  std::uint64_t bytes_read() const { return bytes_read_; }
  std::uint64_t bytes_total() const { return bytes_total_; }  ///< sum of the file sizes

 private:
  bool open_next_file();
  // One physical line without its '\n' (and '\r'), at most line_limit_ bytes
  // kept; `too_long` when the line was longer (the rest is read past, up to
  // csv.limits.max_bytes, beyond which the file is refused).
  bool read_line(std::string& line, bool& too_long);
  bool fill();

  std::vector<std::string> files_;
  BatchInputOptions options_;
  std::size_t file_index_ = 0;
  int fd_ = -1;      // the current file
  bool eof_ = true;  // no more bytes in the current file
  std::string buf_;  // bytes read from fd_ and not consumed yet, from buf_pos_
  std::size_t buf_pos_ = 0;
  std::size_t line_limit_ = 0;
  std::string header_;  // header line of the current file
  std::size_t header_line_ = 0;
  std::size_t lineno_ = 0;
  int unit_idx_ = -1;    // field index of the unit column
  std::string pending_;  // a line read ahead (first line of the next unit)
  bool has_pending_ = false;
  std::size_t pending_line_ = 0;
  std::uint64_t next_index_ = 0;
  std::uint64_t bytes_read_ = 0, bytes_total_ = 0;
  bool pending_too_long_ = false;
  // 64-bit hashes of the unit labels met so far, 8 bytes per unit.
  HashSet64 seen_;
};

/// Parses a chunk; observation lines and error lines refer to the original file.
/// Throws InputError like parse_calibration_csv. `sha256` is the digest of chunk.text.
Dataset parse_unit_chunk(const UnitChunk& chunk, const CsvOptions& options);

/// A file name for a unit label (the naming rule, docs/batch.md): the label
/// itself when it is "plain": 1 to 100 characters of [A-Za-z0-9._-], not
/// starting with '.', not ending in '-' and 8 lowercase hex digits (the form
/// of the names below), and not a name reserved on Windows (CON, PRN, AUX,
/// NUL, COM0-9, LPT0-9, in any case, alone or before a '.'). Otherwise the
/// first 100 characters with '_' for each other byte, a leading '.' made '_',
/// a '_' in front when the result is reserved, then '-' and 8 hex digits of
/// the label's 64-bit FNV-1a hash. Plain names and hashed names never coincide,
/// and no name is reserved on Windows. Two labels can still map to names that
/// differ only in case, or (improbably) to one hashed name: UnitFileNames
/// resolves that within a batch. (batch_unit_names.cpp, as UnitFileNames.)
std::string unit_file_stem(const std::string& unit);

/// The file names of one batch's units, handed out in input order, so that
/// no two units of the batch share a file, even on a file system that ignores
/// case. assign() gives unit_file_stem(unit) unless a name equal to it ignoring
/// ASCII case was given before; then the stem with '-' and the 8 hex digits of
/// the label's hash appended (a plain label that differs from an earlier one
/// only in case); if that is taken too, "" (the unit must fail: no name).
/// Memory: 8 bytes per unit (hashes of the lower-cased names; a hash
/// collision can only make a unit fail, never two units share a file).
class UnitFileNames {
 public:
  std::string assign(const std::string& unit);

 private:
  HashSet64 used_;
};

}  // namespace ridgecal
