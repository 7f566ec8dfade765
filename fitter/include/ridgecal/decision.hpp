// ridgecal: judging errors against a tolerance, and the decision rule.
//
// Rules (see docs/decision-and-uncertainty.md):
//  * simple acceptance (`simple`, the default): a point conforms when
//    |error| <= limit(reference);
//  * guarded acceptance (`guarded`): the acceptance limit is shrunk by the
//    expanded uncertainty U at that point, |error| <= limit - U; where
//    limit - U <= 0 no point can conform.
// A point exactly on the acceptance limit conforms. Each point gets one of
// three outcomes (ILAC-G8 decision-rule terms; Conformity below): it
// conforms; it does not conform (|error| > limit, the rejection zone is the
// tolerance itself under both rules); or it lies inside the tolerance but
// conformity is not shown (under guarded acceptance: inside the guard band
// limit - U < |error| <= limit; under either rule: U >= limit, a test
// uncertainty ratio of 1:1 or worse). A set passes when all of its points
// conform; it fails when any point does not conform; otherwise it is
// UNDECIDED. The verdict is FAIL when a set that counts fails, else UNDECIDED
// when one is undecided, else PASS, unless the adequacy check (AdequacyCheck below) finds the
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

/// UNDECIDED: no counted point fails, but conformity is not shown: some
/// points lie inside the tolerance but not inside the acceptance zone (guard
/// band, or U >= limit), or the adequacy check found the test error far
/// beyond the budget (see AdequacyCheck). No PASS is given; exit 1.
enum class Verdict { Pass, Fail, Undecided };
std::string to_string(Verdict v);                   ///< `PASS`, `FAIL`, `UNDECIDED`
Verdict verdict_from_string(const std::string& s);  ///< the names above (case-insensitive);
                                                    ///< throws std::invalid_argument

/// The outcome at one point, in ILAC-G8 decision-rule terms.
enum class Conformity {
  Conforms,             ///< `conforms`: |error| <= acceptance limit (and U < limit)
  NotShownGuardBand,    ///< `not-shown-guard-band`: inside the tolerance, outside the
                        ///< acceptance limit limit - U (guarded acceptance only)
  NotShownUncertainty,  ///< `not-shown-uncertainty`: inside the tolerance but U >= limit
                        ///< (test uncertainty ratio <= 1), under either rule
  DoesNotConform,       ///< `does-not-conform`: |error| > limit (or the error is not finite)
};
std::string to_string(Conformity c);
Conformity conformity_from_string(const std::string& s);  ///< throws std::invalid_argument
/// The statement for a report or a terminal, e.g. "conformity not shown (guard band)".
std::string conformity_statement(Conformity c);

/// Common practice: a test uncertainty ratio (tolerance / U) of at least 4:1.
/// Below it judge() counts the point as a low-TUR point (a warning, not a verdict).
inline constexpr double kDefaultTurWarning = 4.0;

/// One error to judge.
struct PointToJudge {
  std::size_t line = 0;  ///< line in the data file
  std::string set;       ///< e.g. `training`, `validation`, `test`, `as-found`
  double reference = 0.0;
  double error = 0.0;         ///< calibrated value - reference
  double uncertainty = 0.0;   ///< expanded uncertainty U at this point (0: none known)
  std::string setpoint = {};  ///< the setpoint label of the data row (may be empty)
};

struct PointJudgement {
  std::size_t line = 0;
  std::string set;
  double reference = 0.0;
  double error = 0.0;
  double limit = 0.0;             ///< tolerance at this reference
  double guard = 0.0;             ///< subtracted from the limit (0 under simple acceptance)
  double acceptance_limit = 0.0;  ///< max(limit - guard, 0)
  bool pass = false;              ///< conformity == Conforms
  std::string setpoint = {};      ///< the setpoint label (may be empty)
  double indicated = 0.0;         ///< the calibrated value: reference + error
  double uncertainty = 0.0;       ///< expanded uncertainty U at this point (0: none known)
  /// Test uncertainty ratio limit / U; NaN (JSON null) when U is 0 (not known).
  double tur = 0.0;
  Conformity conformity = Conformity::DoesNotConform;
};

struct SetJudgement {
  std::string name;
  std::size_t n = 0;
  std::size_t failed = 0;  ///< points that do not conform
  double max_abs_error = 0.0;
  double worst_ratio = 0.0;  ///< max |error| / limit (1 = on the tolerance)
  bool counts = true;        ///< counts for the overall verdict
  Verdict verdict = Verdict::Pass;
  /// Points inside the tolerance whose conformity is not shown (last, so that
  /// positional initialisers written before issue 14 keep their meaning).
  std::size_t not_shown = 0;
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
  /// The test uncertainty ratio check: points judged with a known U whose
  /// limit / U is below tur_warning (a warning: the verdict does not change
  /// unless U >= limit, see Conformity).
  double tur_warning = kDefaultTurWarning;
  std::size_t low_tur_points = 0;  ///< counted points with tur < tur_warning
  double min_tur = 0.0;            ///< smallest tur over the counted points; NaN when no U
  bool pass() const { return verdict == Verdict::Pass; }
  /// A few lines for a terminal: verdict, rule, one line per set, and the
  /// first 10 points that do not conform or whose conformity is not shown.
  std::string brief() const;
  /// The statement, one line per set, and every such point (no limit).
  std::string full() const;
};

/// Judges every point; sets appear in order of first appearance. A set named
/// in `informative_sets` is judged and reported but does not count for the
/// verdict. No points gives PASS with a statement saying nothing was judged.
/// `tur_warning`: counted points with limit / U below it are named in the
/// statement (validate_tur_warning). Preconditions: tolerance.validate() and
/// validate_tur_warning(tur_warning) are empty.
Decision judge(const std::vector<PointToJudge>& points, const ToleranceSpec& tolerance,
               DecisionRule rule, const std::vector<std::string>& informative_sets = {},
               double tur_warning = kDefaultTurWarning);

/// Empty when valid, else a message naming the field, the value and the rule:
/// finite and 1 <= value <= 100 (1 turns the warning off: U >= limit is
/// already "not shown").
std::string validate_tur_warning(double tur_warning);

/// Applies the adequacy check to a judged decision: records it, and when it
/// is far turns a PASS into UNDECIDED (or, with `override_far`, keeps the PASS
/// and says so in the statement). A FAIL stays FAIL.
void apply_adequacy_check(Decision& d, AdequacyCheck check, bool override_far);

nlohmann::json to_json(const Decision& d);
Decision decision_from_json(const nlohmann::json& j,
                            const std::string& file);  ///< throws InputError

}  // namespace ridgecal
