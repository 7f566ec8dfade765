#include "ridgecal/calibrate.hpp"

#include <cassert>
#include <utility>

#include "ridgecal/assessment.hpp"

namespace ridgecal {

std::string CalibrateOptions::validate() const {
  if (std::string e = fit.validate(); !e.empty()) return e;
  if (comp.active())
    if (std::string e = comp.validate(fit); !e.empty()) return e;
  if (std::string e = assess.validate(); !e.empty()) return e;
  if (std::string e = hardware.validate(); !e.empty()) return "hardware: " + e;
  return {};
}

std::optional<Verdict> CalibrateResult::verdict() const {
  if (!status.ok || !record.decision) return std::nullopt;
  return record.decision->verdict;
}

bool CalibrateResult::out_of_tolerance() const {
  return verdict() == Verdict::Fail;
}

bool CalibrateResult::undecided() const {
  return verdict() == Verdict::Undecided;
}

CalibrateResult calibrate(const Dataset& data, const CalibrateOptions& options) {
  assert(options.validate().empty());
  assert(options.comp.aux == !data.columns.aux_column.empty());
  CalibrateResult result;
  // A constant or near-constant reference or reading is bad input (InputError).
  const VariationFloors floors = variation_floors(options.assess.uncertainty);
  require_variation(data, floors, false);
  // A stuck, open, shorted or saturated sensor is bad input, found before any fit.
  check_hardware(data, floors.reading, options.hardware);
  // The one branch between the one-input and the extended model.
  const bool extended = options.comp.active();
  FitOutcome fit =
      extended ? fit_extended(data, options.fit, options.comp) : fit_calibration(data, options.fit);
  if (!fit.status.ok) {
    result.status = std::move(fit.status);
    return result;
  }
  CalibrationRecord& rec = result.record;
  rec.tool_version = tool_version();
  rec.created_utc = options.created_utc;
  rec.sensor = options.sensor;
  rec.input = InputInfo{data.file, data.sha256, data.rows.size(), data.columns};
  rec.calibration = std::move(fit.calibration);
  assert(is_extended(rec.calibration) == extended);
  if (options.skip_unjudged_assessment && !options.assess.tolerance) return result;
  // The verdict is computed here and only here (assessment), and kept in the record.
  Assessment a = assess_calibration(data, rec.calibration, options.assess);
  rec.tolerance = std::move(a.tolerance);
  rec.decision = std::move(a.decision);
  rec.uncertainty = std::move(a.uncertainty);
  rec.warnings = std::move(a.warnings);
  rec.lack_of_fit = std::move(a.lack_of_fit);
  return result;
}

}  // namespace ridgecal
