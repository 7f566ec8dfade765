// ridgecal CLI: the tolerance, decision and uncertainty options shared by
// `fit` and `verify` (documented in docs/decision-and-uncertainty.md).
#pragma once

#include <boost/program_options.hpp>
#include <optional>
#include <string>

#include "ridgecal/assessment.hpp"

namespace ridgecal::cli {

/// What the options said. Unset optionals: not given on the command line.
struct JudgementCli {
  std::optional<ToleranceSpec> tolerance;
  std::optional<DecisionRule> rule;
  UncertaintyOptions uncertainty;
  DiagnosticOptions diagnostics;
  bool accept_inadequate_model = false;     ///< --accept-inadequate-model
  double tur_warning = kDefaultTurWarning;  ///< --tur-warning (validated)
};

/// --tol-offset, --tol-proportional, --tol-percent-span, --tol-class, --span, --decision,
/// --tur-warning.
void add_tolerance_options(boost::program_options::options_description& d);
/// --ref-uncertainty, --ref-k, --resolution, --inadequacy-alpha, --accept-inadequate-model.
void add_uncertainty_options(boost::program_options::options_description& d);

/// Reads the options added above (those not added are left at their defaults).
/// Throws UsageError naming the option, the value and the rule.
JudgementCli parse_judgement_options(const boost::program_options::variables_map& vm);

/// "LO..HI" -> (LO, HI) with LO < HI; throws UsageError naming `option`.
std::pair<double, double> parse_range_option(const std::string& option, const std::string& text);

}  // namespace ridgecal::cli
