#include "ridgecal/decision.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cassert>
#include <cctype>
#include <cmath>
#include <limits>
#include <stdexcept>

#include "ridgecal/json_read.hpp"

namespace ridgecal {

std::string to_string(DecisionRule r) {
  return r == DecisionRule::SimpleAcceptance ? "simple" : "guarded";
}
DecisionRule decision_rule_from_string(const std::string& s) {
  if (s == "simple") return DecisionRule::SimpleAcceptance;
  if (s == "guarded") return DecisionRule::GuardedAcceptance;
  throw std::invalid_argument("decision rule must be 'simple' or 'guarded', got '" + s + "'");
}

std::string to_string(Verdict v) {
  switch (v) {
    case Verdict::Pass:
      return "PASS";
    case Verdict::Fail:
      return "FAIL";
    case Verdict::Undecided:
      return "UNDECIDED";
  }
  return "FAIL";
}
Verdict verdict_from_string(const std::string& s) {
  std::string u = s;
  std::transform(u.begin(), u.end(), u.begin(), [](unsigned char c) { return std::toupper(c); });
  if (u == "PASS") return Verdict::Pass;
  if (u == "FAIL") return Verdict::Fail;
  if (u == "UNDECIDED") return Verdict::Undecided;
  throw std::invalid_argument("verdict must be 'PASS', 'FAIL' or 'UNDECIDED', got '" + s + "'");
}

std::string to_string(Conformity c) {
  switch (c) {
    case Conformity::Conforms:
      return "conforms";
    case Conformity::NotShownGuardBand:
      return "not-shown-guard-band";
    case Conformity::NotShownUncertainty:
      return "not-shown-uncertainty";
    case Conformity::DoesNotConform:
      return "does-not-conform";
  }
  return "does-not-conform";
}
Conformity conformity_from_string(const std::string& s) {
  for (Conformity c : {Conformity::Conforms, Conformity::NotShownGuardBand,
                       Conformity::NotShownUncertainty, Conformity::DoesNotConform})
    if (s == to_string(c)) return c;
  throw std::invalid_argument(
      "conformity must be 'conforms', 'not-shown-guard-band', 'not-shown-uncertainty' or "
      "'does-not-conform', got '" +
      s + "'");
}
std::string conformity_statement(Conformity c) {
  switch (c) {
    case Conformity::Conforms:
      return "conforms";
    case Conformity::NotShownGuardBand:
      return "conformity not shown (inside the tolerance, in the guard band)";
    case Conformity::NotShownUncertainty:
      return "conformity not shown (inside the tolerance, U >= limit)";
    case Conformity::DoesNotConform:
      return "does not conform";
  }
  return "does not conform";
}

std::string validate_tur_warning(double tur_warning) {
  if (!std::isfinite(tur_warning) || tur_warning < 1.0 || tur_warning > 100.0)
    return fmt::format(
        "tur_warning is {}; it must be a finite ratio from 1 to 100 (e.g. 4 for 4:1)", tur_warning);
  return {};
}

namespace {
// The one place where a point's outcome is decided (three outcomes, see decision.hpp).
Conformity point_conformity(const PointJudgement& pj, bool guarded) {
  if (!std::isfinite(pj.error) || std::fabs(pj.error) > pj.limit) return Conformity::DoesNotConform;
  if (pj.uncertainty > 0.0 && pj.uncertainty >= pj.limit) return Conformity::NotShownUncertainty;
  if (guarded && std::fabs(pj.error) > pj.acceptance_limit) return Conformity::NotShownGuardBand;
  return Conformity::Conforms;
}
}  // namespace

Decision judge(const std::vector<PointToJudge>& points, const ToleranceSpec& tolerance,
               DecisionRule rule, const std::vector<std::string>& informative_sets,
               double tur_warning) {
  assert(validate_tur_warning(tur_warning).empty());
  Decision d;
  d.rule = rule;
  d.tur_warning = tur_warning;
  d.min_tur = std::numeric_limits<double>::quiet_NaN();
  const bool guarded = rule == DecisionRule::GuardedAcceptance;
  std::size_t no_room = 0;
  for (const PointToJudge& p : points) {
    PointJudgement pj;
    pj.line = p.line;
    pj.set = p.set;
    pj.setpoint = p.setpoint;
    pj.reference = p.reference;
    pj.error = p.error;
    pj.indicated = p.reference + p.error;
    pj.limit = tolerance.limit(p.reference);
    // A non-finite U is no uncertainty the guard can use: the whole limit is guarded.
    pj.uncertainty = std::isfinite(p.uncertainty) ? std::max(p.uncertainty, 0.0) : pj.limit;
    pj.tur =
        pj.uncertainty > 0.0 ? pj.limit / pj.uncertainty : std::numeric_limits<double>::quiet_NaN();
    pj.guard = guarded ? pj.uncertainty : 0.0;
    pj.acceptance_limit = std::max(pj.limit - pj.guard, 0.0);
    pj.conformity = point_conformity(pj, guarded);
    pj.pass = pj.conformity == Conformity::Conforms;
    auto it = std::find_if(d.sets.begin(), d.sets.end(),
                           [&](const SetJudgement& s) { return s.name == p.set; });
    if (it == d.sets.end()) {
      SetJudgement s;
      s.name = p.set;
      s.counts = std::find(informative_sets.begin(), informative_sets.end(), p.set) ==
                 informative_sets.end();
      d.sets.push_back(s);
      it = d.sets.end() - 1;
    }
    ++it->n;
    if (pj.conformity == Conformity::DoesNotConform) {
      ++it->failed;
      it->verdict = Verdict::Fail;
    } else if (!pj.pass) {
      ++it->not_shown;
      if (it->verdict == Verdict::Pass) it->verdict = Verdict::Undecided;
    }
    if (it->counts && pj.uncertainty > 0.0) {
      if (pj.uncertainty >= pj.limit && std::fabs(pj.error) <= pj.limit) ++no_room;
      if (pj.tur < tur_warning) ++d.low_tur_points;
      if (!(d.min_tur <= pj.tur)) d.min_tur = pj.tur;
    }
    it->max_abs_error = std::max(it->max_abs_error, std::fabs(p.error));
    if (pj.limit > 0.0) it->worst_ratio = std::max(it->worst_ratio, std::fabs(p.error) / pj.limit);
    d.points.push_back(pj);
  }
  std::size_t failed = 0, not_shown = 0, counted = 0;
  for (const SetJudgement& s : d.sets)
    if (s.counts) {
      counted += s.n;
      failed += s.failed;
      not_shown += s.not_shown;
      if (s.verdict == Verdict::Fail) d.verdict = Verdict::Fail;
      if (s.verdict == Verdict::Undecided && d.verdict == Verdict::Pass)
        d.verdict = Verdict::Undecided;
    }
  const std::string rule_text =
      guarded ? fmt::format(
                    "Guarded acceptance: a point conforms when |error| <= tolerance {} minus the "
                    "expanded uncertainty U at that point; it does not conform when |error| "
                    "exceeds the tolerance; in between (the guard band) conformity is not shown.",
                    tolerance.describe())
              : fmt::format(
                    "Simple acceptance: a point conforms when |error| <= tolerance {}; the "
                    "measurement uncertainty is reported but not subtracted.",
                    tolerance.describe());
  if (counted == 0)
    d.statement = rule_text + " No points were judged.";
  else
    d.statement = rule_text + fmt::format(" {}: of {} judged points, {} conform, {} do not conform",
                                          to_string(d.verdict), counted,
                                          counted - failed - not_shown, failed);
  if (counted > 0)
    d.statement += not_shown > 0 ? fmt::format(
                                       " and {} lie inside the tolerance with conformity "
                                       "not shown.",
                                       not_shown)
                                 : ".";
  if (no_room > 0)
    d.statement += fmt::format(
        " At {} point(s) inside the tolerance U is as large as the limit (test uncertainty ratio "
        "1:1 or worse), so conformity cannot be shown there and no PASS is given.",
        no_room);
  if (d.low_tur_points > 0)
    d.statement += fmt::format(
        " Test uncertainty ratio (limit / U) below {:g}:1 at {} point(s), lowest {:.2g}:1: the "
        "uncertainty takes a large part of the tolerance.",
        tur_warning, d.low_tur_points, d.min_tur);
  return d;
}

void apply_adequacy_check(Decision& d, AdequacyCheck check, bool override_far) {
  check.overridden = check.far && override_far;
  if (check.far) {
    const std::string what = fmt::format(
        " The test error is far beyond what the uncertainty budget allows: the test RMS error is "
        "{:.3g} times the combined standard uncertainty from the fit's own scatter (limit {:g}; "
        "{:.3g} times with the model-inadequacy term), so the curve family cannot follow the "
        "sensor.",
        check.ratio, check.limit, check.ratio_with_term);
    if (d.verdict == Verdict::Pass && !check.overridden) {
      d.verdict = Verdict::Undecided;
      d.statement += what +
                     " UNDECIDED: no PASS is given for such a model without an explicit "
                     "override (--accept-inadequate-model).";
    } else if (d.verdict == Verdict::Pass) {
      d.statement +=
          what + " PASS only by the user's explicit override (--accept-inadequate-model).";
    } else {
      d.statement += what;
    }
  }
  d.adequacy = check;
}

namespace {
// A figure for the terminal; a non-finite one (a model evaluated far outside
// what double can hold) reads "not finite", never "nan" or "inf".
std::string figure(double v, const char* spec) {
  return std::isfinite(v) ? fmt::format(fmt::runtime(spec), v) : std::string("not finite");
}

// Every point that does not conform or whose conformity is not shown, each
// with its outcome in the decision-rule terms (never "out of tolerance" for a
// point inside the tolerance).
std::string failing_points(const std::vector<PointJudgement>& points, std::size_t max_shown) {
  std::string s;
  std::size_t shown = 0, listed = 0;
  for (const PointJudgement& p : points) {
    if (p.pass) continue;
    ++listed;
    if (shown++ < max_shown)
      s += fmt::format("  {}: line {} ({}), reference {:g}, error {}, limit {}, U {}{}\n",
                       conformity_statement(p.conformity), p.line, p.set, p.reference,
                       figure(p.error, "{:+.4g}"), figure(p.limit, "{:.4g}"),
                       figure(p.uncertainty, "{:.3g}"),
                       p.conformity == Conformity::NotShownGuardBand
                           ? ", acceptance limit " + figure(p.acceptance_limit, "{:.4g}")
                           : std::string());
  }
  if (listed > max_shown)
    s += fmt::format(
        "  ... and {} more points that do not conform or whose conformity is not shown (--full "
        "lists all)\n",
        listed - max_shown);
  return s;
}

std::string set_lines(const std::vector<SetJudgement>& sets) {
  std::string s;
  for (const SetJudgement& set : sets)
    s += fmt::format(
        "  {:<10} {} of {} points conform{}{}, max |error| {}, worst {} of the limit{}\n", set.name,
        set.n - set.failed - set.not_shown, set.n,
        set.failed > 0 ? fmt::format(", {} do not conform", set.failed) : std::string(),
        set.not_shown > 0 ? fmt::format(", {} conformity not shown", set.not_shown) : std::string(),
        figure(set.max_abs_error, "{:.4g}"), figure(100.0 * set.worst_ratio, "{:.0f}%"),
        set.counts ? "" : " (informative)");
  return s;
}

std::string tur_line(const Decision& d) {
  if (d.low_tur_points == 0) return {};
  return fmt::format(
      "  test uncertainty ratio (limit / U) below {:g}:1 at {} point(s), lowest {:.2g}:1\n",
      d.tur_warning, d.low_tur_points, d.min_tur);
}
}  // namespace

std::string Decision::brief() const {
  std::string s = fmt::format("decision: {} ({} acceptance)\n", to_string(verdict),
                              rule == DecisionRule::SimpleAcceptance ? "simple" : "guarded");
  s += set_lines(sets);
  if (adequacy.far)
    s += fmt::format(
        "  adequacy: test RMS error {:.3g} x the budget's u_c without the model-inadequacy term "
        "(limit {:g}){}\n",
        adequacy.ratio, adequacy.limit,
        adequacy.overridden ? "; PASS by explicit override" : "; no PASS without an override");
  return s + tur_line(*this) + failing_points(points, 10);
}

std::string Decision::full() const {
  std::string s = fmt::format("decision: {} ({} acceptance)\n", to_string(verdict),
                              rule == DecisionRule::SimpleAcceptance ? "simple" : "guarded");
  s += "  " + statement + "\n";
  s += set_lines(sets);
  return s + tur_line(*this) + failing_points(points, points.size());
}

nlohmann::json to_json(const Decision& d) {
  using detail::num;
  nlohmann::json sets = nlohmann::json::array(), pts = nlohmann::json::array();
  for (const SetJudgement& s : d.sets)
    sets.push_back({{"name", s.name},
                    {"n", s.n},
                    {"failed", s.failed},
                    {"not_shown", s.not_shown},
                    {"max_abs_error", num(s.max_abs_error)},
                    {"worst_ratio", num(s.worst_ratio)},
                    {"counts", s.counts},
                    {"verdict", to_string(s.verdict)}});
  for (const PointJudgement& p : d.points)
    pts.push_back({{"line", p.line},
                   {"set", p.set},
                   {"reference", num(p.reference)},
                   {"error", num(p.error)},
                   {"limit", num(p.limit)},
                   {"guard", num(p.guard)},
                   {"acceptance_limit", num(p.acceptance_limit)},
                   {"pass", p.pass},
                   {"setpoint", p.setpoint},
                   {"indicated", num(p.indicated)},
                   {"uncertainty", num(p.uncertainty)},
                   {"tur", num(p.tur)},
                   {"conformity", to_string(p.conformity)}});
  const AdequacyCheck& a = d.adequacy;
  nlohmann::json adequacy{{"computed", a.computed},    {"test_points", a.test_points},
                          {"ratio", num(a.ratio)},     {"ratio_with_term", num(a.ratio_with_term)},
                          {"limit", num(a.limit)},     {"far", a.far},
                          {"overridden", a.overridden}};
  return {{"rule", to_string(d.rule)},
          {"verdict", to_string(d.verdict)},
          {"statement", d.statement},
          {"sets", sets},
          {"points", pts},
          {"adequacy", adequacy},
          {"tur",
           {{"warning_below", num(d.tur_warning)},
            {"low_points", d.low_tur_points},
            {"min", num(d.min_tur)}}}};
}

Decision decision_from_json(const nlohmann::json& j, const std::string& file) {
  const detail::JsonReader r{file};
  Decision d;
  d.rule = r.enum_value(j, "rule", "decision", decision_rule_from_string);
  d.verdict = r.enum_value(j, "verdict", "decision", verdict_from_string);
  d.statement = r.text(j, "statement", "decision");
  for (const nlohmann::json& s : r.array(j, "sets", "decision")) {
    SetJudgement sj;
    sj.name = r.text(s, "name", "decision.sets[]");
    sj.n = static_cast<std::size_t>(r.integer(s, "n", "decision.sets[]"));
    sj.failed = static_cast<std::size_t>(r.integer(s, "failed", "decision.sets[]"));
    sj.max_abs_error = r.number(s, "max_abs_error", "decision.sets[]");
    sj.worst_ratio = r.number(s, "worst_ratio", "decision.sets[]");
    sj.counts = r.boolean(s, "counts", "decision.sets[]");
    sj.verdict = r.enum_value(s, "verdict", "decision.sets[]", verdict_from_string);
    // Records before the three outcomes (issue 14) have no not_shown.
    if (s.contains("not_shown"))
      sj.not_shown = static_cast<std::size_t>(r.integer(s, "not_shown", "decision.sets[]"));
    d.sets.push_back(sj);
  }
  for (const nlohmann::json& p : r.array(j, "points", "decision")) {
    PointJudgement pj;
    pj.line = static_cast<std::size_t>(r.integer(p, "line", "decision.points[]"));
    pj.set = r.text(p, "set", "decision.points[]");
    pj.reference = r.number(p, "reference", "decision.points[]");
    pj.error = r.number(p, "error", "decision.points[]");
    pj.limit = r.number(p, "limit", "decision.points[]");
    pj.guard = r.number(p, "guard", "decision.points[]");
    pj.acceptance_limit = r.number(p, "acceptance_limit", "decision.points[]");
    pj.pass = r.boolean(p, "pass", "decision.points[]");
    // The per-point results (issue 14); older records have none: derived from
    // what they hold, U unknown.
    if (p.contains("conformity")) {
      pj.setpoint = r.text(p, "setpoint", "decision.points[]");
      pj.indicated = r.number(p, "indicated", "decision.points[]");
      pj.uncertainty = r.number(p, "uncertainty", "decision.points[]");
      pj.tur = r.number(p, "tur", "decision.points[]");
      pj.conformity = r.enum_value(p, "conformity", "decision.points[]", conformity_from_string);
    } else {
      pj.indicated = pj.reference + pj.error;
      pj.uncertainty = pj.guard;
      pj.tur = pj.guard > 0.0 ? pj.limit / pj.guard : std::numeric_limits<double>::quiet_NaN();
      pj.conformity = pj.pass                           ? Conformity::Conforms
                      : std::fabs(pj.error) <= pj.limit ? Conformity::NotShownGuardBand
                                                        : Conformity::DoesNotConform;
    }
    d.points.push_back(pj);
  }
  // Records written before the adequacy check have none (not computed).
  if (j.contains("adequacy")) {
    const nlohmann::json& a = j["adequacy"];
    AdequacyCheck& c = d.adequacy;
    c.computed = r.boolean(a, "computed", "decision.adequacy");
    c.test_points = static_cast<std::size_t>(r.integer(a, "test_points", "decision.adequacy"));
    c.ratio = r.number(a, "ratio", "decision.adequacy");
    c.ratio_with_term = r.number(a, "ratio_with_term", "decision.adequacy");
    c.limit = r.number(a, "limit", "decision.adequacy");
    c.far = r.boolean(a, "far", "decision.adequacy");
    c.overridden = r.boolean(a, "overridden", "decision.adequacy");
  }
  if (j.contains("tur")) {
    const nlohmann::json& t = j["tur"];
    d.tur_warning = r.number(t, "warning_below", "decision.tur");
    d.low_tur_points = static_cast<std::size_t>(r.integer(t, "low_points", "decision.tur"));
    d.min_tur = r.number(t, "min", "decision.tur");
  } else {
    d.min_tur = std::numeric_limits<double>::quiet_NaN();
  }
  return d;
}

}  // namespace ridgecal
