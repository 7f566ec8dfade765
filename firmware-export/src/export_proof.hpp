// Internal: building the programs the header evaluates and measuring them.
#pragma once

#include <cstddef>
#include <vector>

#include "ridgecal/firmware/export.hpp"

namespace ridgecal::firmware::detail {

struct Deviation {
  double max = 0;            ///< max |emulated - model|, reference units
  double at = 0;             ///< reading where it occurs
  std::size_t points = 0;    ///< inputs checked in total
  std::size_t readings = 0;  ///< of which calibration readings
  bool finite = true;        ///< false if the program produced inf/NaN somewhere
};

/// The float/double program of a model (T = float or double) for a basis, with
/// the inward-rounded range; nullopt if a constant does not fit the type
/// (overflow to inf) or the basis is not offered (raw x: one input only).
template <typename T>
std::optional<FloatingProgram<T>> make_program(const FirmwareModel& m, Basis b);

Deviation measure(const PolyModel& m, const FloatProgram& p, int grid_points,
                  const std::vector<double>& readings);
Deviation measure(const PolyModel& m, const DoubleProgram& p, int grid_points,
                  const std::vector<double>& readings);
Deviation measure(const PolyModel& m, const FixedPlan& p, int grid_points,
                  std::int64_t exhaustive_limit, const std::vector<double>& readings);

}  // namespace ridgecal::firmware::detail
