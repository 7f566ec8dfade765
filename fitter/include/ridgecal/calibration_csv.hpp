// ridgecal: reading a calibration run from CSV.
//
// Format: a header row naming the columns, then one observation per row.
// Lines whose first non-blank character is '#' are comments; blank lines are
// skipped. CRLF line endings and a UTF-8 byte-order mark are accepted. Fields
// may be double-quoted ("a,b"; "" is a literal quote). Numbers use a '.'
// decimal point (or ',' with CsvOptions::decimal_comma); NaN and infinities
// are rejected, and so is a nonzero magnitude outside [kMinMagnitude,
// kMaxMagnitude]. The input is bounded by CsvLimits (see docs/robustness.md).
#pragma once

#include <cstddef>
#include <limits>
#include <string>
#include <vector>

namespace ridgecal {

/// Largest accepted magnitude of a reading or reference. Beyond it squares and
/// spans overflow a double; rescale the column (another unit) instead.
inline constexpr double kMaxMagnitude = 1e300;
/// Smallest accepted nonzero magnitude. Below it values approach the
/// subnormal range, where precision is lost; 0 itself is accepted.
inline constexpr double kMinMagnitude = 1e-300;

/// Bounds on what one input may make ridgecal allocate. The defaults suit a
/// calibration run of up to a million rows (about 1.5 GiB peak for a whole
/// `ridgecal fit`, see docs/robustness.md); raise them with the matching
/// `ridgecal fit` options (--max-rows, --max-bytes, --max-field-bytes).
struct CsvLimits {
  std::size_t max_bytes = std::size_t{256} << 20;  ///< size of the file: 256 MiB
  std::size_t max_rows = 1'000'000;    ///< data rows (comments and blank lines not counted)
  std::size_t max_fields = 1024;       ///< fields in one row
  std::size_t max_field_bytes = 4096;  ///< bytes in one field (after unquoting)

  /// Empty when valid (every limit >= 1), else a message naming the field.
  std::string validate() const;
};

/// Which columns to read. Defaults: `reading`, `reference`, no setpoint and no
/// role column. Column names are matched exactly (case-sensitive), after
/// trimming blanks.
struct CsvOptions {
  std::string reading_column = "reading";
  std::string reference_column = "reference";
  std::string setpoint_column;  ///< empty: rows with equal reference values form a group
  std::string role_column;      ///< empty: no user-named check points; values `fit` / `check`
  std::string
      direction_column;    ///< empty: no sweep direction; values `up` / `down` (hysteresis check)
  char delimiter = ',';    ///< one of ',' ';' '\t'
  std::string aux_column;  ///< empty: no second input; else its column (e.g. sensor temperature)
  std::string aux_setpoint_column;  ///< empty: aux groups by rounded value (see extended_fit.hpp)
  /// Numbers use ',' as the decimal point ("12,5"); requires delimiter ';' or
  /// tab, and then a '.' in a number is rejected (no thousands separators).
  bool decimal_comma = false;
  CsvLimits limits;

  /// Empty when valid, else a message naming the field, the value and the rule.
  std::string validate() const;
};

/// Role of a row named by the user in the role column.
enum class UserRole { Unspecified, Fit, Check };
std::string to_string(UserRole r);
/// Accepts `fit` and `check` (case-insensitive). Throws std::invalid_argument otherwise.
UserRole user_role_from_string(const std::string& s);

/// Sweep direction of a row, from the direction column (hysteresis check).
enum class SweepDirection { Unspecified, Up, Down };
std::string to_string(SweepDirection d);  ///< `unspecified`, `up`, `down`
/// Accepts `up` and `down` (case-insensitive), and `unspecified`. Throws std::invalid_argument
/// otherwise.
SweepDirection sweep_direction_from_string(const std::string& s);

struct Observation {
  double reading = 0.0;    ///< raw sensor reading (reading units)
  double reference = 0.0;  ///< reference value (reference units)
  std::string setpoint;    ///< group key: the setpoint cell, or the reference value as text
  UserRole role = UserRole::Unspecified;
  std::size_t line = 0;  ///< 1-based physical line in the file
  double aux =
      std::numeric_limits<double>::quiet_NaN();  ///< second input, NaN without an aux column
  std::string aux_setpoint;  ///< aux setpoint label, empty without an aux setpoint column
  SweepDirection direction = SweepDirection::Unspecified;  ///< from the direction column, if any
};

struct Dataset {
  std::string file;    ///< as given by the user (for messages)
  std::string sha256;  ///< of the file's bytes
  CsvOptions columns;
  std::vector<Observation> rows;
};

/// Parses CSV text. `file` is used in messages only.
/// Throws InputError (`file:line: what. hint`) on: an empty file or header
/// only, a missing column, a ragged row, a non-numeric, NaN or infinite cell,
/// a magnitude out of range, an empty or non-UTF-8 setpoint cell, a bad role
/// value, a duplicated column name, or input beyond options.limits.
Dataset parse_calibration_csv(const std::string& text, const std::string& file,
                              const CsvOptions& options);

/// Relative spread at or below which a column counts as constant: values that
/// agree to about 9 significant digits are one value written with noise in
/// its last digits, not a measured variation (our judgement: loggers and
/// spreadsheets rarely write more than 9 significant digits).
inline constexpr double kConstantRelativeSpread = 1e-9;

/// Absolute floors of the variation check (require_variation), 0 = none.
struct VariationFloors {
  double reading = 0.0;    ///< e.g. the reading resolution (one digit step), reading units
  double reference = 0.0;  ///< e.g. the reference standard's expanded uncertainty, reference units
};

/// Checks that the readings and the references vary. A column is
/// near-constant when max - min <= max(kConstantRelativeSpread * max|value|,
/// its floor). Fitting (one_point_ok false): either column near-constant is
/// bad input. Checking an instrument against a record (one_point_ok true, e.g.
/// `verify`): only one column near-constant while the other varies is bad
/// input (both near-constant is a legitimate one-point check).
/// Throws InputError (`file:line` of the first data row) naming the column,
/// its range and the threshold.
void require_variation(const Dataset& data, const VariationFloors& floors, bool one_point_ok);

/// Reads and parses a file (see parse_calibration_csv). A file larger than
/// options.limits.max_bytes is refused before it is read.
Dataset read_calibration_csv(const std::string& path, const CsvOptions& options);

}  // namespace ridgecal
