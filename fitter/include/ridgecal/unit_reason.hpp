// ridgecal: one reason per batch unit, for a supervisor's summary.
//
// Every unit of a batch gets exactly one reason code from the small set
// below (docs/batch.md lists them with what to do about each), and, where
// the unit was judged, its worst point: the setpoint where |error| / limit
// is largest, that ratio, and the excess |error| - limit (reference units;
// positive means beyond the tolerance).
//
// The code is chosen in this order: a unit that was not fitted gets the
// hardware or input code of its error; a judged unit that passed gets
// `none`; a unit that failed gets the first of `outlier`, `hysteresis`,
// `drift`, `lack-of-fit` among its warnings (the likely cause), else
// `out-of-tolerance`; an undecided unit gets `inadequate-model` (the
// adequacy check) or `undecided`; a fitted unit with no tolerance gets
// `not-judged`.
#pragma once

#include <limits>
#include <string>

#include "ridgecal/errors.hpp"
#include "ridgecal/record.hpp"

namespace ridgecal {

enum class UnitReason {
  None,             ///< `none`: passed
  NotJudged,        ///< `not-judged`: fitted, no tolerance given
  Stuck,            ///< `stuck`: hardware, readings frozen over several setpoints or constant
  OpenOrShort,      ///< `open-or-short`: hardware, readings 0 over several setpoints
  Saturated,        ///< `saturated`: hardware, the end setpoints clipped at one value
  MissingCells,     ///< `missing-cells`: a reading or reference cell is empty
  BadInput,         ///< `bad-input`: any other problem with the unit's rows
  FitFailed,        ///< `fit-failed`: no curve could be fitted (e.g. too few setpoints)
  Outlier,          ///< `outlier`: measurement, failed with an outlier warning
  Hysteresis,       ///< `hysteresis`: measurement, failed with a hysteresis warning
  Drift,            ///< `drift`: measurement, failed with drift between repeats
  LackOfFit,        ///< `lack-of-fit`: fit, failed with a lack-of-fit warning
  OutOfTolerance,   ///< `out-of-tolerance`: decision, an error beyond the limit
  InadequateModel,  ///< `inadequate-model`: decision withheld, test error far beyond the budget
  Undecided,        ///< `undecided`: decision withheld for another reason
};
std::string to_string(UnitReason r);
UnitReason unit_reason_from_string(const std::string& s);  ///< throws std::invalid_argument

/// The reason of a unit whose rows were refused with this cause.
UnitReason reason_for_input(InputCause cause);

/// A judged unit's worst point (see above); setpoint empty when none.
struct WorstPoint {
  std::string setpoint;
  double ratio = std::numeric_limits<double>::quiet_NaN();   ///< |error| / limit
  double excess = std::numeric_limits<double>::quiet_NaN();  ///< |error| - limit
};

/// The worst point over the points of the sets that count for the verdict;
/// for a record without a decision, the setpoint of the largest |error| with
/// ratio and excess NaN.
WorstPoint worst_point(const CalibrationRecord& rec);

/// The reason of a fitted unit (see above).
UnitReason reason_for_record(const CalibrationRecord& rec);

}  // namespace ridgecal
