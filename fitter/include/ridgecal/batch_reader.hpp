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
};

/// Input files of a batch: a regular file is itself; a directory gives its
/// regular *.csv files sorted by name. Throws InputError when the path does
/// not exist or a directory holds no CSV file.
std::vector<std::string> batch_input_files(const std::string& path);

class UnitReader {
 public:
  /// Precondition: options.validate() is empty, files not empty.
  UnitReader(std::vector<std::string> files, BatchInputOptions options);
  ~UnitReader();

  /// The next unit, false at the end of the input. Throws InputError on
  /// problems of a file as a whole: unreadable, no header, a missing column.
  bool next(UnitChunk& out);

  std::uint64_t bytes_read() const { return bytes_read_; }
  std::uint64_t bytes_total() const { return bytes_total_; }  ///< sum of the file sizes

 private:
  bool open_next_file();
  bool read_line(std::string& line);

  std::vector<std::string> files_;
  BatchInputOptions options_;
  std::size_t file_index_ = 0;
  std::unique_ptr<std::ifstream> in_;
  std::string header_;  // header line of the current file
  std::size_t header_line_ = 0;
  std::size_t lineno_ = 0;
  int unit_idx_ = -1;    // field index of the unit column
  std::string pending_;  // a line read ahead (first line of the next unit)
  bool has_pending_ = false;
  std::size_t pending_line_ = 0;
  std::uint64_t next_index_ = 0;
  std::uint64_t bytes_read_ = 0, bytes_total_ = 0;
  // 64-bit hashes of the unit labels met so far, 8 bytes per unit: a sorted
  // run plus a small unsorted tail merged into it when full.
  bool seen_before(std::uint64_t h);
  std::vector<std::uint64_t> seen_sorted_, seen_tail_;
};

/// Parses a chunk; observation lines and error lines refer to the original file.
/// Throws InputError like parse_calibration_csv. `sha256` is the digest of chunk.text.
Dataset parse_unit_chunk(const UnitChunk& chunk, const CsvOptions& options);

/// A file name for a unit label: the label itself when it is made of
/// [A-Za-z0-9._-] only (and is not "." or ".."), otherwise the safe
/// characters with '_' for the others, plus '-' and 8 hex digits of the
/// label's hash, so distinct labels never share a file.
std::string unit_file_stem(const std::string& unit);

}  // namespace ridgecal
