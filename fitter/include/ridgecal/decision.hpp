// ridgecal: judging errors against a tolerance, and the decision rule.
//
// Rules (see docs/decision-and-uncertainty.md):
//  * simple acceptance (`simple`, the default): a point conforms when
//    |error| <= limit(reference);
//  * guarded acceptance (`guarded`): the acceptance limit is shrunk by the
//    expanded uncertainty U at that point, |error| <= limit - U; where
//    limit - U <= 0 no point can conform.
// A point exactly on the acceptance limit conforms. A set passes when all of
// its points conform; the verdict is PASS when every set that counts for the
// decision passes, unless the adequacy check (AdequacyCheck below) finds the
// test error far beyond what the budget allows: the verdict is then
// UNDECIDED (not accepted, exit 1) with the reason in the statement, unless the
// user overrides it explicitly (recorded).
#pragma once

#include <cstddef>
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "ridgecal/tolerance.hpp"

namespace ridgecal {

enum class DecisionRule { SimpleAcceptance, GuardedAcceptance };
std::string to_string(DecisionRule r);                         ///< `simple`, `guarded`
DecisionRule decision_rule_from_string(const std::string& s);  ///< throws std::invalid_argument

/// UNDECIDED: every counted point conforms, but the adequacy check found the
/// test error far beyond the budget, so no PASS is given (see AdequacyCheck).
enum class Verdict { Pass, Fail, Undecided };
std::string to_string(Verdict v);                   ///< `PASS`, `FAIL`, `UNDECIDED`
Verdict verdict_from_string(const std::string& s);  ///< the names above (case-insensitive);
                                                    ///< throws std::invalid_argument

/// One error to judge.
struct PointToJudge {
  std::size_t line = 0;  ///< line in the data file
  std::string set;       ///< e.g. `training`, `validation`, `test`, `as-found`
  double reference = 0.0;
  double error = 0.0;        ///< calibrated value - reference
  double uncertainty = 0.0;  ///< expanded uncertainty U at this point (used by the guarded rule)
};

struct PointJudgement {
  std::size_t line = 0;
  std::string set;
  double reference = 0.0;
  double error = 0.0;
  double limit = 0.0;             ///< tolerance at this reference
  double guard = 0.0;             ///< subtracted from the limit (0 under simple acceptance)
  double acceptance_limit = 0.0;  ///< max(limit - guard, 0)
  bool pass = false;
};

struct SetJudgement {
  std::string name;
  std::size_t n = 0;
  std::size_t failed = 0;
  double max_abs_error = 0.0;
  double worst_ratio = 0.0;  ///< max |error| / limit (1 = on the tolerance)
  bool counts = true;        ///< counts for the overall verdict
  Verdict verdict = Verdict::Pass;
};

/// Is the test error far beyond what the uncertainty budget allows? The
/// ratio R = sqrt(mean e_i^2 / mean u0(x_i)^2) over the test points, e_i the
/// error and u0 the combined standard uncertainty without the
/// model-inadequacy term (what the fit's own scatter and the stated inputs
/// allow). R > limit is "far" (limit from a false-alarm rate measured by
/// Monte Carlo, docs/decision-and-uncertainty.md).
struct AdequacyCheck {
  bool computed = false;  ///< false: no test points, or the check is off (limit 0)
  std::size_t test_points = 0;
  double ratio = 0.0;            ///< R
  double ratio_with_term = 0.0;  ///< the same against the full combined uncertainty
  double limit = 0.0;            ///< R above this is far
  bool far = false;              ///< computed and ratio > limit
  bool overridden = false;       ///< far, and the user accepted the model explicitly
};

struct Decision {
  DecisionRule rule = DecisionRule::SimpleAcceptance;
  Verdict verdict = Verdict::Pass;
  std::string statement;  ///< the rule and the outcome in one or two sentences
  std::vector<SetJudgement> sets;
  std::vector<PointJudgement> points;

  AdequacyCheck adequacy;
  bool pass() const { return verdict == Verdict::Pass; }
  /// A few lines for a terminal: verdict, rule, one line per set, and the
  /// first 10 points that do not conform.
  std::string brief() const;
  /// brief() plus the statement and every point that does not conform.
  std::string full() const;
};

/// Judges every point; sets appear in order of first appearance. A set named
/// in `informative_sets` is judged and reported but does not count for the
/// verdict. No points gives PASS with a statement saying nothing was judged.
/// Precondition: tolerance.validate() is empty.
Decision judge(const std::vector<PointToJudge>& points, const ToleranceSpec& tolerance,
               DecisionRule rule, const std::vector<std::string>& informative_sets = {});

/// Applies the adequacy check to a judged decision: records it, and when it
/// is far turns a PASS into UNDECIDED (or, with `override_far`, keeps the PASS
/// and says so in the statement). A FAIL stays FAIL.
void apply_adequacy_check(Decision& d, AdequacyCheck check, bool override_far);

nlohmann::json to_json(const Decision& d);
Decision decision_from_json(const nlohmann::json& j,
                            const std::string& file);  ///< throws InputError

}  // namespace ridgecal
