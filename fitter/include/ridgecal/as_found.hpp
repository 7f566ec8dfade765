// ridgecal: the as-found check. An existing calibration record is applied to
// fresh readings taken before any adjustment; the errors are judged against
// the record's tolerance (or a new one). With a new fit (as-left) this gives
// the as-found / as-left pair of a calibration certificate.
//
// As-found file (format "ridgecal-as-found", format_version 1):
//   format, format_version, tool_version, created_utc (may be absent),
//   record{file, sha256 (its integrity digest), integrity_ok, modified_allowed,
//          degree, x_min, x_max},
//   input{file, sha256, rows},
//   as_found{metrics{n, rmse, max_abs_error, bias, ...},
//            points[{line, setpoint, reading, reference, predicted, error, in_range}]},
//   tolerance{...}, tolerance_source, decision{...}   (when a tolerance applies),
//   uncertainty{...}   (the record's, when present),
//   warnings[{code, message, ...}],
//   integrity{algorithm: "sha256", sha256}  (as for records)
#pragma once

#include <nlohmann/json.hpp>
#include <optional>
#include <string>
#include <vector>

#include "ridgecal/calibration_csv.hpp"
#include "ridgecal/decision.hpp"
#include "ridgecal/diagnostics.hpp"
#include "ridgecal/metrics.hpp"
#include "ridgecal/record.hpp"
#include "ridgecal/tolerance.hpp"

namespace ridgecal {

inline constexpr const char* kAsFoundFormat = "ridgecal-as-found";
inline constexpr int kAsFoundFormatVersion = 1;

/// A record read for verification.
struct CheckedRecord {
  CalibrationRecord record;
  std::string file;
  std::string digest;         ///< the digest stored in the record's integrity member
  bool integrity_ok = false;  ///< stored digest equals the recomputed one
  bool modified_allowed = false;
};

/// Reads a record and checks its integrity digest. A mismatch (or a missing
/// digest) throws InputError saying the record was modified and how to
/// re-create it, unless `allow_modified` (then integrity_ok is false and the
/// caller must say so in its output).
CheckedRecord read_checked_record(const std::string& path, bool allow_modified);

struct AsFoundOptions {
  std::optional<ToleranceSpec> tolerance;  ///< none (default): the record's tolerance, if any
  std::optional<DecisionRule> rule;  ///< none (default): the record's rule, else simple acceptance
  /// Warn where limit / U is below this (decision.hpp; default 4, i.e. 4:1); 1..100.
  double tur_warning = kDefaultTurWarning;
  /// Empty when valid, else a message naming the field, the value and the rule.
  std::string validate() const;
};

struct AsFoundPoint {
  std::size_t line = 0;
  std::string setpoint;
  double reading = 0.0;
  double reference = 0.0;
  double predicted = 0.0;  ///< the record's curve at this reading
  double error = 0.0;      ///< predicted - reference
  bool in_range = true;    ///< reading inside the record's calibrated range
};

struct AsFoundResult {
  std::string record_file, record_digest;
  bool integrity_ok = true, modified_allowed = false;
  int degree = 0;
  Scaling range;
  std::string data_file, data_sha256;
  std::size_t rows = 0;
  std::optional<ToleranceSpec> tolerance;
  std::string tolerance_source;  ///< `record`, `command line` or empty
  std::optional<Decision> decision;
  std::optional<UncertaintyBudget> uncertainty;  ///< the record's
  Metrics metrics;
  std::vector<AsFoundPoint> points;
  std::vector<Warning> warnings;

  std::string brief(const std::string& unit) const;  ///< a few lines for a terminal
  std::string full(const std::string& unit) const;   ///< brief() plus every point's error
};

/// Applies the record to the data and judges it. Throws InputError when the
/// guarded rule is asked for and the record holds no uncertainty.
/// Precondition: options.validate() is empty.
AsFoundResult evaluate_as_found(const CheckedRecord& rec, const Dataset& data,
                                const AsFoundOptions& options);

/// The as-found file's JSON, integrity member included. `created_utc` may be empty.
nlohmann::json as_found_to_json(const AsFoundResult& r, const std::string& created_utc);

}  // namespace ridgecal
