// ridgecal Monte Carlo harness: the ONE place where the harness calls the
// library. Everything else in bench/monte_carlo sees only McFit.
//
// When the library gains a single calibrate() pipeline (dataset + options ->
// calibration + assessment), only mc_adapter.cpp needs retargeting.
#pragma once

#include <functional>
#include <string>
#include <vector>

#include "ridgecal/assessment.hpp"
#include "ridgecal/calibration.hpp"
#include "ridgecal/calibration_csv.hpp"
#include "ridgecal/errors.hpp"
#include "ridgecal/extended_fit.hpp"

namespace ridgecal::mc {

/// Everything one library call needs.
struct McOptions {
  FitOptions fit;
  ExtendedOptions comp;      ///< inactive: the 1-D fit
  AssessmentOptions assess;  ///< tolerance optional
};

/// What the harness reads back from one calibration.
struct McFit {
  bool ok = false;    ///< false: the library refused the data (status or InputError)
  std::string error;  ///< why, when !ok
  InputCause cause = InputCause::Other;  ///< of the InputError, when the data were refused
  bool has_verdict = false;              ///< a tolerance was given and a decision made
  bool pass = false;                     ///< the decision's verdict (meaningful with has_verdict)
  bool undecided = false;     ///< verdict UNDECIDED (no point fails, conformity not shown)
  std::string undecided_why;  ///< `uncertainty` (U >= limit at a point), `guard-band` or `adequacy`
  std::vector<std::string> warning_codes;  ///< one entry per warning (codes may repeat)
  int degree = -1;
  double lambda = 0.0;
  double test_rmse = 0.0, validation_rmse = 0.0, training_rmse = 0.0;
  bool inadequacy_included = false;  ///< the model-inadequacy term is in the budget
  bool adequacy_computed = false;    ///< the adequacy check ran (test points present)
  double adequacy_ratio = 0.0;       ///< its ratio R (decision.hpp, AdequacyCheck)
  bool adequacy_far = false;         ///< R above the limit: a PASS would be UNDECIDED
  /// The delivered curve and its expanded uncertainty U(k) at (reading, aux).
  std::function<double(double reading, double aux)> predict;
  std::function<double(double reading, double aux)> expanded;
};

/// Fits and assesses one data set. Never throws for problems of the data.
McFit calibrate_adapter(const Dataset& data, const McOptions& options);

}  // namespace ridgecal::mc
