// ridgecal: hardware-fault checks on the raw data, run before any fit.
//
// A sensor whose output is stuck, open or shorted, or clipped at the end of
// its range still gives numbers, and a polynomial can be fitted through them.
// These checks look for the signature such faults leave in a calibration run:
// a plateau, i.e. two or more setpoints in a row (sorted by reference) whose
// references span at least kMinPlateauSpanFraction of the run's reference
// span but whose readings are all the same value to within the
// reading's quantum q = max(kConstantRelativeSpread * max|reading|,
// resolution). A working sensor whose gain is resolvable at all changes its
// output between two distinct setpoints by more than q, so the check has no
// threshold to tune; docs/batch.md gives the false-alarm and detection rates
// measured on clean and seeded runs.
//
// A plateau is classified as
//   * `zero-readings` (open or short circuit) when its value is 0 (within q);
//   * `clipped-readings` (saturated) when it holds the first or last setpoint
//     and its value is the extreme reading of the run (within q);
//   * `frozen-readings` (stuck) otherwise.
// A finding is bad input: check_hardware throws an InputError with that cause
// and the line of the plateau's first row.
#pragma once

#include <cstddef>
#include <optional>
#include <string>

#include "ridgecal/calibration_csv.hpp"
#include "ridgecal/errors.hpp"

namespace ridgecal {

/// A plateau must span at least this fraction of the run's reference span
/// (our judgement: setpoints of a calibration are rarely closer than 5 % of
/// the span, while repeats at one nominal setpoint grouped by their slightly
/// different reference values are much closer than that).
inline constexpr double kMinPlateauSpanFraction = 0.05;

struct HardwareCheckOptions {
  bool enabled = true;  ///< false: no check (`--no-hardware-checks`)
  /// A plateau this many setpoints long or longer is a fault; >= 2.
  std::size_t min_plateau_setpoints = 2;

  /// Empty when valid, else a message naming the field, the value and the rule.
  std::string validate() const;
};

/// A plateau found in the data (see above).
struct HardwarePlateau {
  InputCause cause = InputCause::FrozenReadings;     ///< Frozen, Zero or ClippedReadings
  std::string first_setpoint, last_setpoint;         ///< labels, in order of reference
  std::size_t setpoints = 0;                         ///< number of setpoints on the plateau
  double value = 0.0;                                ///< the reading they all share
  double reference_low = 0.0, reference_high = 0.0;  ///< mean references of the ends
  std::size_t line = 0;                              ///< first data line of the plateau
};

/// The longest plateau of at least options.min_plateau_setpoints setpoints
/// (the first along the references on a tie), or none. `quantum` is q above.
std::optional<HardwarePlateau> find_plateau(const Dataset& data, double reading_floor,
                                            const HardwareCheckOptions& options);

/// Throws InputError (cause Frozen/Zero/ClippedReadings, `file:line` of the
/// plateau's first row, hint naming the override) when find_plateau finds one.
/// Does nothing when !options.enabled. Precondition: options.validate() is empty.
void check_hardware(const Dataset& data, double reading_floor, const HardwareCheckOptions& options);

}  // namespace ridgecal
