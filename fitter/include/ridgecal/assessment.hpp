// ridgecal: from a fitted calibration to a decision QA can sign off:
// tolerance, uncertainty budget, PASS/FAIL and warnings, in one step.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "ridgecal/calibration.hpp"
#include "ridgecal/calibration_csv.hpp"
#include "ridgecal/decision.hpp"
#include "ridgecal/diagnostics.hpp"
#include "ridgecal/lack_of_fit.hpp"
#include "ridgecal/tolerance.hpp"
#include "ridgecal/uncertainty.hpp"

namespace ridgecal {

struct AssessmentOptions {
  /// None: no decision (nothing is judged, the exit code stays 0). With
  /// percent_of_span and no span set (span_high <= span_low), the span is
  /// taken from diagnostics.span_low/high, else from the calibrated reference range.
  std::optional<ToleranceSpec> tolerance;
  DecisionRule rule = DecisionRule::SimpleAcceptance;  ///< default: simple acceptance
  UncertaintyOptions uncertainty;
  DiagnosticOptions diagnostics;
  /// The adequacy check (decision.hpp, AdequacyCheck): a test RMS error more
  /// than this many times the combined standard uncertainty without the
  /// model-inadequacy term is "far", and a PASS becomes UNDECIDED. 0 turns the
  /// check off; else 1..100. Default 3 (false-alarm rate on clean Monte Carlo
  /// runs in docs/decision-and-uncertainty.md).
  double adequacy_limit = 3.0;
  /// Keep a PASS although the adequacy check is far (the user's explicit,
  /// recorded override; CLI --accept-inadequate-model). Default false.
  bool accept_inadequate_model = false;
  /// Warn where the test uncertainty ratio limit / U is below this (decision.hpp;
  /// default kDefaultTurWarning = 4, i.e. 4:1, common practice); 1..100.
  double tur_warning = kDefaultTurWarning;

  /// Empty when valid, else a message naming the field, the value and the rule.
  std::string validate() const;
};

struct Assessment {
  std::optional<ToleranceSpec> tolerance;  ///< as applied (span resolved)
  std::optional<Decision> decision;        ///< present when a tolerance was given
  UncertaintyBudget uncertainty;
  std::vector<Warning> warnings;
  std::optional<LackOfFit>
      lack_of_fit;  ///< the lack-of-fit test (lack_of_fit.hpp); set by assess_calibration
};

/// The span a %-of-span tolerance uses when none is given: the declared span,
/// else the smallest..largest training setpoint reference. Throws InputError
/// (`file`, no line) when that span is zero: a percent of a zero span is no
/// tolerance, and the caller asked for one.
void resolve_span(ToleranceSpec& tol, const Calibration& cal, const DiagnosticOptions& diag,
                  const std::string& file = {});

/// The adequacy check of a fitted calibration against its budget (`unc` built
/// from the same calibration): R over the test points; not computed without
/// test points or with limit 0.
AdequacyCheck check_adequacy(const Calibration& cal, const UncertaintyEvaluator& unc, double limit);

/// Judges the points of the final model: `training` and `test` (counting for
/// the verdict) and `validation` (the cross-validated predictions, judged for
/// information only), with the uncertainty budget (uncertainty.hpp; extended
/// fits: surface_uncertainty.hpp, U at each point's own reading and aux value
/// as the guard) and the warnings of diagnose_fit. Every model, one input or
/// extended. `data` must be the data set the calibration was fitted on (rows
/// match cal.points by index): its direction column drives the hysteresis
/// check. Preconditions: options.validate() is empty.
Assessment assess_calibration(const Dataset& data, const Calibration& cal,
                              const AssessmentOptions& options);
/// The same without the data: no hysteresis check.
Assessment assess_calibration(const Calibration& cal, const AssessmentOptions& options);

}  // namespace ridgecal
