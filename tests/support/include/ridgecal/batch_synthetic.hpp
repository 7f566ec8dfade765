// ridgecal: deterministic synthetic production-line units, for the batch
// tests and the benchmarks.
//
// Each unit is a made-up temperature sensor read by an ADC: a logistic curve
// of the bath temperature with a per-unit gain and offset, a small per-unit
// cubic wobble, reading noise of a few counts and reference noise of a few
// millikelvin. Every number comes from splitmix64 (SplitRng), so the data are
// identical on every platform and for every caller.
#pragma once

#include <cstdint>
#include <string>

#include "ridgecal/calibration_csv.hpp"

namespace ridgecal {

struct SyntheticUnitOptions {
  int setpoints = 12;              ///< distinct bath temperatures per unit, >= 2
  int repeats = 4;                 ///< readings per setpoint, >= 1
  std::uint64_t seed = 42;         ///< data seed (the unit index is mixed in)
  double reading_noise = 15.0;     ///< SD of the reading noise, counts, >= 0
  double reference_noise = 0.003;  ///< SD of the reference noise, degC, >= 0

  /// Empty when valid, else a message naming the field, the value and the rule.
  std::string validate() const;
};

/// The unit label for index i: "U" followed by the zero-padded index ("U000017").
std::string synthetic_unit_id(std::uint64_t index);

/// One unit as a Dataset (setpoint column "setpoint"; lines numbered from 2 as
/// if the unit were alone in a CSV file with a header).
/// Precondition: options.validate() is empty.
Dataset synthetic_unit(std::uint64_t index, const SyntheticUnitOptions& options);

/// Appends the unit's rows as CSV lines `unit,setpoint,reading,reference`
/// (no header) to `out`.
void append_synthetic_unit_csv(std::string& out, std::uint64_t index,
                               const SyntheticUnitOptions& options);

/// The header matching append_synthetic_unit_csv: "unit,setpoint,reading,reference\n".
const char* synthetic_csv_header();

}  // namespace ridgecal
