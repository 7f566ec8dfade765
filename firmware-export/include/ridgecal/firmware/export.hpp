// ridgecal firmware export: generate a freestanding C header from a fitted
// calibration model, with an export-time proof of its accuracy. One entry
// point for every model (generate_header on a FirmwareModel): the one-input
// polynomial gets the one-input header, an extended model (transforms, an
// aux input; FirmwareModel::extended) the extended header, whose additions
// docs/firmware-export.md lists under "Extended models".
#pragma once

#include <cstddef>
#include <cstdint>
#include <limits>
#include <optional>
#include <string>
#include <vector>

#include "ridgecal/firmware/firmware_model.hpp"
#include "ridgecal/firmware/fixed_point.hpp"
#include "ridgecal/firmware/float_emulation.hpp"
#include "ridgecal/firmware/numeric_mode.hpp"

namespace ridgecal::firmware {

/// Version of the generated header's contract (PREFIX_FORMAT_VERSION). Bump
/// when names, signatures or semantics of the generated symbols change.
/// 2: the self-check covers every constant of the evaluation (not only the
/// coefficient table), the fixed-point mappings and shifts are named, and the
/// record's verdict, digest and date are macros.
inline constexpr int kHeaderFormatVersion = 2;

/// The record's verdict as the header states it to the compiler
/// (PREFIX_VERDICT), so that a firmware build can refuse a calibration that
/// did not pass with `#if PREFIX_VERDICT != PREFIX_VERDICT_PASS`.
enum class HeaderVerdict {
  NotJudged,       ///< `not-judged`: the record has no tolerance (or no decision)
  Pass,            ///< `pass`
  Fail,            ///< `fail`
  RecordModified,  ///< `record-modified`: the record was edited after it was written
  Undecided,       ///< `undecided`: inside the tolerance, but the model's adequacy is not shown
};
std::string to_string(HeaderVerdict v);
HeaderVerdict header_verdict_from_string(const std::string& s);  ///< throws std::invalid_argument

/// ulps of log/logf result assumed for a target C library (glibc, newlib and
/// avr-libc; see docs/firmware-export.md for what was measured).
inline constexpr double kLogUlps = 4.0;

struct ExportOptions {
  /// Prefix of every generated symbol: functions "prefix_eval", macros
  /// "PREFIX_...". Rules in check_c_prefix() (c_text.hpp).
  std::string prefix = "calib";
  NumericMode mode = NumericMode::Float;
  /// Refuse the export when the header's max deviation from the
  /// double-precision model exceeds this fraction of the tolerance.
  /// Default 0.10; must be in (0, 1].
  double max_deviation_fraction = 0.10;
  /// Points of the uniform proof grid over the valid range (>= 2, <= 10^6).
  int grid_points = 2001;
  /// Fixed mode: raw integer input range. Default (nullopt): the integers
  /// inside the calibrated range, ceil(x_min * input_scale) ..
  /// floor(x_max * input_scale). Must lie in int32.
  std::optional<std::int64_t> raw_min;
  std::optional<std::int64_t> raw_max;
  /// Fixed mode: raw counts per reading unit (reading = raw / input_scale).
  /// Default 1: the reading already is an integer count (e.g. ADC counts).
  double input_scale = 1.0;
  /// Fixed mode: output integer units per reference unit (output =
  /// round(reference * output_scale)). Default 1000: milli-units.
  double output_scale = 1000.0;
  /// Fixed mode: check every integer input when the raw range has at most
  /// this many values (default 10^6), else the grid.
  std::int64_t exhaustive_limit = 1000000;
  /// Extended models with an aux input, fixed mode: raw aux counts
  /// per aux unit (aux = raw_aux / aux_input_scale) and the raw aux range
  /// (default: the integers inside the calibrated aux range).
  double aux_input_scale = 1.0;
  std::optional<std::int64_t> aux_raw_min;
  std::optional<std::int64_t> aux_raw_max;

  /// "" when valid, else a message naming the field, the value and the rule.
  std::string validate() const;
};

/// Text and figures for the header's QA comment. All strings are escaped
/// before they reach the header (escape_c_comment).
struct HeaderMeta {
  static constexpr double kUnset = std::numeric_limits<double>::quiet_NaN();
  std::string sensor_name;
  std::string reading_unit;
  std::string reference_unit;
  int degree = -1;         ///< -1: take it from the model
  double lambda = kUnset;  ///< ridge penalty
  double validation_rmse = kUnset;
  double validation_max_abs_error = kUnset;
  double test_rmse = kUnset;
  double test_max_abs_error = kUnset;
  std::string tolerance_description;  ///< e.g. "+/-0.1 degC (class A)"
  /// Absolute tolerance in reference units used by the refusal rule. When
  /// unset (or not > 0), the validation RMSE is used instead; when that is
  /// missing too, the export is refused as bad input.
  std::optional<double> tolerance_abs;
  /// Where tolerance_abs comes from, shown in the QA block ("tolerance used").
  std::string tolerance_abs_source = "record tolerance";
  /// The record's verdict, verbatim (the generator never judges), or a text
  /// saying that the record has none.
  std::string pass_fail;
  /// The verdict for PREFIX_VERDICT (default: not judged). The generator
  /// writes it; refusing a header for a record that did not pass is the
  /// caller's rule (`ridgecal export`, `batch --headers`).
  HeaderVerdict verdict = HeaderVerdict::NotJudged;
  /// When the record was made (ISO 8601 UTC) for PREFIX_CALIBRATION_DATE; ""
  /// when it does not say. Characters outside [0-9A-Za-z:.+-] become '?'.
  std::string calibration_date;
  std::string record_sha256;                 ///< SHA-256 of the calibration record
  std::string tool_version;                  ///< e.g. "ridgecal 0.1.0"
  std::vector<double> calibration_readings;  ///< checked in the proof too
  /// Extended models with an aux input: the aux unit and the aux value of each
  /// calibration reading (same order as calibration_readings).
  std::string aux_unit;
  std::vector<double> calibration_aux;
};

enum class ExportStatus {
  Ok,            ///< header generated, deviation within the limit
  Refused,       ///< deviation exceeds max_deviation_fraction x tolerance (CLI exit 1)
  InvalidInput,  ///< bad options, model or meta (CLI exit 2)
};
const char* to_string(ExportStatus status);

struct CodeStats {
  std::size_t header_bytes = 0;
  int header_lines = 0;
  int table_entries = 0;
  int table_bytes = 0;  ///< size of the coefficient table on a target
  int multiplies_per_eval = 0;
  int additions_per_eval = 0;  ///< additions/subtractions (fixed: incl. rounding adds)
};

struct ExportResult {
  ExportStatus status = ExportStatus::InvalidInput;
  std::string message;          ///< why refused/invalid; a one-line summary when ok
  std::string header;           ///< the header text (also filled when refused, for inspection)
  double max_deviation = 0;     ///< max |header - double model|, reference units
  double deviation_at = 0;      ///< input (reading units) where it occurred
  double deviation_at_aux = 0;  ///< aux value there (0 without an aux input)
  /// Models with ln: the allowance added to the measured deviation for a
  /// target C library whose log/logf differs from the host's by up to
  /// kLogUlps ulps of its result, propagated to the output (reference units).
  double libm_allowance = 0;
  double deviation_limit = 0;  ///< max_deviation_fraction x tolerance_used
  double tolerance_used = 0;
  std::string tolerance_source;  ///< "record tolerance" or "validation RMSE (fallback)"
  std::size_t points_checked = 0;
  std::size_t readings_checked = 0;
  Basis basis = Basis::ScaledT;  ///< float/double: variable of the Horner scheme (one input)
  std::string formats;           ///< human-readable description of the number formats
  std::uint32_t table_crc32 = 0;
  CodeStats stats;
  // The exact programs written into the header (for emulation and tests).
  std::optional<FloatProgram> float_program;
  std::optional<DoubleProgram> double_program;
  std::optional<FixedPlan> fixed_plan;

  bool ok() const { return status == ExportStatus::Ok; }
};

/// Generates the header of any model; make `model` with firmware_model()
/// (firmware_model.hpp) from a Calibration, a PolyModel or a Model.
/// Never throws for bad input: reports it in the result. Fixed mode with a
/// transform (divider, ln, reciprocal-kelvin) is InvalidInput (use float or
/// double).
ExportResult generate_header(const FirmwareModel& model, const HeaderMeta& meta,
                             const ExportOptions& options);

}  // namespace ridgecal::firmware
