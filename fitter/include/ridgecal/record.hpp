// ridgecal: the calibration record, a JSON document of our own.
//
// Layout (format "ridgecal-record", format_version 1):
//   format, format_version, tool_version, created_utc (may be absent),
//   cautions[], sensor{name, reading_unit, reference_unit},
//   input{file, sha256, rows, columns{reading, reference, setpoint, role}},
//   model{kind, degree, lambda, intercept, basis, penalty, scaling{x_min, x_max,
//         center, half_width}, chebyshev_coefficients[], power_coefficients[],
//         condition_number},
//   selection{mode, rule, fold_scheme, folds, degrees[], lambdas[],
//             grid[{degree, lambda, cv_rmse, cv_se, train_rmse}], chosen{...}, notes[]},
//   split{seed, test_fraction, test_named_by_user, setpoints[{id, reading,
//         reference, count, role, fold}]},
//   metrics{training, validation, test: {n, predictors, centered, rmse,
//           max_abs_error, bias, r2, adj_r2, residual_sd}},
//   points[{line, setpoint, reading, reference, predicted, error, role, fold,
//           cv_predicted}],
//   tolerance{...}, decision{...}, uncertainty{...}, warnings[{code, message, ...}]
//   (optional, written when the fit was assessed; see tolerance.hpp,
//   decision.hpp, uncertainty.hpp, diagnostics.hpp),
//   integrity{algorithm: "sha256", sha256}
// Every member, its unit and the version policy: docs/record-format.md.
// Non-finite numbers are written as null. integrity.sha256 is the SHA-256 of
// the record without its "integrity" member, serialised compactly with keys
// sorted (nlohmann::json::dump()).
#pragma once

#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "ridgecal/calibration.hpp"
#include "ridgecal/decision.hpp"
#include "ridgecal/diagnostics.hpp"
#include "ridgecal/lack_of_fit.hpp"
#include "ridgecal/tolerance.hpp"
#include "ridgecal/uncertainty.hpp"

namespace ridgecal {

inline constexpr const char* kRecordFormat = "ridgecal-record";
inline constexpr int kRecordFormatVersion = 1;

/// The tool's version string (from CMake's project version).
const char* tool_version();

/// The standard cautions every record and report carries.
std::vector<std::string> standard_cautions();

struct SensorInfo {
  std::string name;            ///< free text, e.g. "cold-store logger NTC channel 2"
  std::string reading_unit;    ///< e.g. "counts", "mV", "ohm"
  std::string reference_unit;  ///< e.g. "degC", "kg"
};

struct InputInfo {
  std::string file;  ///< file name as given
  std::string sha256;
  std::size_t rows = 0;
  CsvOptions columns;
};

struct CalibrationRecord {
  std::string tool_version;
  std::string created_utc;  ///< ISO 8601, may be empty (reproducible output)
  SensorInfo sensor;
  InputInfo input;
  Calibration calibration;
  std::vector<std::string> cautions = standard_cautions();
  // Assessment (optional members of the record).
  std::optional<ToleranceSpec> tolerance;
  std::optional<Decision> decision;
  std::optional<UncertaintyBudget> uncertainty;
  std::vector<Warning> warnings;  ///< written when not empty or when `uncertainty` is present
  std::optional<LackOfFit> lack_of_fit;  ///< the lack-of-fit test (lack_of_fit.hpp), when assessed
};

/// Serialises to JSON with the integrity member filled in.
nlohmann::json record_to_json(const CalibrationRecord& rec);

/// The SHA-256 the integrity member must hold for this JSON (ignores any
/// "integrity" member present).
std::string record_digest(const nlohmann::json& j);

/// True when j carries an integrity digest equal to record_digest(j).
bool record_integrity_ok(const nlohmann::json& j);

/// Parses a record (the layout of docs/record-format.md). `file` is used in
/// messages. Throws InputError on invalid JSON, a wrong format or version, or
/// missing or mistyped members, the optional assessment members (tolerance,
/// decision, uncertainty, warnings) included: when present they must follow
/// the fitter's layout. Integrity is NOT checked here (see record_seal).
CalibrationRecord record_from_json(const nlohmann::json& j, const std::string& file);

/// The integrity member of a record as read.
struct RecordSeal {
  std::string stored;    ///< integrity.sha256 as found in the record; empty when it has none
  std::string computed;  ///< record_digest() of the content
  /// The stored digest is present and equals the content's.
  bool intact() const { return !stored.empty() && stored == computed; }
};

/// The seal of j (j need not be a valid record).
RecordSeal record_seal(const nlohmann::json& j);

/// Largest record file read_record_json accepts (a record of a million-row
/// run is about 300 MB).
inline constexpr std::size_t kMaxRecordBytes = std::size_t{1} << 30;
/// Deepest nesting of arrays and objects accepted in a record (a real record
/// nests 4 deep); deeper documents are refused before they are parsed, so a
/// hostile file cannot exhaust the stack of the recursive serialiser.
inline constexpr int kMaxRecordDepth = 32;

/// Parses record text (`file` for messages). Throws InputError on invalid
/// JSON (with the line), or nesting deeper than kMaxRecordDepth.
nlohmann::json parse_record_json(const std::string& text, const std::string& file);

/// Reads a record file (at most kMaxRecordBytes) and parses it with
/// parse_record_json; throws InputError on unreadable or invalid JSON.
nlohmann::json read_record_json(const std::string& path);

/// Pretty JSON text (2-space indent, trailing newline) for writing to disk.
std::string record_text(const nlohmann::json& j);

}  // namespace ridgecal
