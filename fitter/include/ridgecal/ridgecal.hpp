// ridgecal: the whole public C++ API of the fitter library (target
// ridgecal::fitter), in one include. Each header below documents its own
// contract (inputs, units, preconditions, failures). Headers outside this
// list (fitter/src/include/) are internal and are not installed.
//
// The C header generator (target ridgecal::firmware_export) has its own
// umbrella: ridgecal/firmware.hpp.
#pragma once

// Input: calibration runs from CSV, production batches.
#include "ridgecal/batch_reader.hpp"
#include "ridgecal/calibration_csv.hpp"
#include "ridgecal/errors.hpp"
#include "ridgecal/hardware_checks.hpp"
#include "ridgecal/unit_reason.hpp"

// Model: transforms, polynomial and extended (reading + aux) models.
#include "ridgecal/model.hpp"
#include "ridgecal/poly_model.hpp"
#include "ridgecal/transforms.hpp"

// Fit: grouped split, selection by cross-validation, the fitted calibration.
#include "ridgecal/calibrate.hpp"
#include "ridgecal/calibration.hpp"
#include "ridgecal/extended_fit.hpp"
#include "ridgecal/grouped_split.hpp"
#include "ridgecal/metrics.hpp"

// Assessment: tolerance, uncertainty, decision, warnings, as-found checks.
#include "ridgecal/as_found.hpp"
#include "ridgecal/assessment.hpp"
#include "ridgecal/decision.hpp"
#include "ridgecal/diagnostics.hpp"
#include "ridgecal/lack_of_fit.hpp"
#include "ridgecal/tolerance.hpp"
#include "ridgecal/uncertainty.hpp"

// Record: the calibration record (JSON) and its integrity-checked loading.
#include "ridgecal/record.hpp"
#include "ridgecal/record_guard.hpp"

// Batch: many units with the same settings, and their summary.
#include "ridgecal/batch_run.hpp"
#include "ridgecal/batch_summary.hpp"
