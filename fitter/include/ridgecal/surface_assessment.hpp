// ridgecal: tolerance decision for extended fits (multi_input_fit.hpp).
//
// What is supported today: a tolerance judged with simple acceptance on the
// errors of the final model (training and test count, the cross-validated
// predictions are informative), exactly as for 1-D fits. Not yet: the GUM
// uncertainty budget and band, guarded acceptance (it needs the band) and the
// model diagnostics, which are written for the 1-D curve; their 2-D
// generalisation is listed in docs/compensation-and-transforms.md.
#pragma once

#include <string>

#include "ridgecal/assessment.hpp"

namespace ridgecal {

/// Empty when `options` can be applied to an extended fit, else a message
/// naming what is not supported yet.
std::string surface_assessment_unsupported(const AssessmentOptions& options);

/// The tolerance decision (no uncertainty budget, no diagnostics).
/// Preconditions: cal.surface is set; surface_assessment_unsupported(options) is empty.
Assessment assess_surface_calibration(const Calibration& cal, const AssessmentOptions& options);

}  // namespace ridgecal
