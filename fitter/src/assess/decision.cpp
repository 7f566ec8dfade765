#include "ridgecal/decision.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cctype>
#include <cmath>
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

Decision judge(const std::vector<PointToJudge>& points, const ToleranceSpec& tolerance,
               DecisionRule rule, const std::vector<std::string>& informative_sets) {
  Decision d;
  d.rule = rule;
  const bool guarded = rule == DecisionRule::GuardedAcceptance;
  std::size_t no_room = 0;
  for (const PointToJudge& p : points) {
    PointJudgement pj;
    pj.line = p.line;
    pj.set = p.set;
    pj.reference = p.reference;
    pj.error = p.error;
    pj.limit = tolerance.limit(p.reference);
    pj.guard = guarded ? (std::isfinite(p.uncertainty) ? p.uncertainty : pj.limit) : 0.0;
    pj.acceptance_limit = std::max(pj.limit - pj.guard, 0.0);
    if (guarded && pj.acceptance_limit <= 0.0) ++no_room;
    pj.pass = std::isfinite(p.error) && std::fabs(p.error) <= pj.acceptance_limit &&
              !(guarded && pj.acceptance_limit <= 0.0);
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
    if (!pj.pass) {
      ++it->failed;
      it->verdict = Verdict::Fail;
    }
    it->max_abs_error = std::max(it->max_abs_error, std::fabs(p.error));
    if (pj.limit > 0.0) it->worst_ratio = std::max(it->worst_ratio, std::fabs(p.error) / pj.limit);
    d.points.push_back(pj);
  }
  std::size_t failed = 0, counted = 0;
  for (const SetJudgement& s : d.sets)
    if (s.counts) {
      counted += s.n;
      failed += s.failed;
      if (s.verdict == Verdict::Fail) d.verdict = Verdict::Fail;
    }
  const std::string rule_text =
      guarded
          ? fmt::format(
                "Guarded acceptance: a point conforms when |error| <= tolerance {} minus the "
                "expanded "
                "uncertainty U at that point.",
                tolerance.describe())
          : fmt::format(
                "Simple acceptance: a point conforms when |error| <= tolerance {}; the measurement "
                "uncertainty is reported but not subtracted.",
                tolerance.describe());
  if (counted == 0)
    d.statement = rule_text + " No points were judged.";
  else
    d.statement = rule_text + fmt::format(" {}: {} of {} judged points conform.",
                                          to_string(d.verdict), counted - failed, counted);
  if (no_room > 0)
    d.statement += fmt::format(
        " At {} point(s) U is as large as the tolerance, so no error can be accepted there.",
        no_room);
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

std::string failing_points(const std::vector<PointJudgement>& points, std::size_t max_shown) {
  std::string s;
  std::size_t shown = 0, failed = 0;
  for (const PointJudgement& p : points) {
    if (p.pass) continue;
    ++failed;
    if (shown++ < max_shown)
      s += fmt::format(
          "  out of tolerance: line {} ({}), reference {:g}, error {}, acceptance limit {}\n",
          p.line, p.set, p.reference, figure(p.error, "{:+.4g}"),
          figure(p.acceptance_limit, "{:.4g}"));
  }
  if (failed > max_shown)
    s += fmt::format("  ... and {} more points out of tolerance\n", failed - max_shown);
  return s;
}

std::string set_lines(const std::vector<SetJudgement>& sets) {
  std::string s;
  for (const SetJudgement& set : sets)
    s += fmt::format(
        "  {:<10} {} of {} points within tolerance, max |error| {}, worst {} of the limit{}\n",
        set.name, set.n - set.failed, set.n, figure(set.max_abs_error, "{:.4g}"),
        figure(100.0 * set.worst_ratio, "{:.0f}%"), set.counts ? "" : " (informative)");
  return s;
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
  return s + failing_points(points, 10);
}

std::string Decision::full() const {
  std::string s = fmt::format("decision: {} ({} acceptance)\n", to_string(verdict),
                              rule == DecisionRule::SimpleAcceptance ? "simple" : "guarded");
  s += "  " + statement + "\n";
  s += set_lines(sets);
  return s + failing_points(points, points.size());
}

nlohmann::json to_json(const Decision& d) {
  using detail::num;
  nlohmann::json sets = nlohmann::json::array(), pts = nlohmann::json::array();
  for (const SetJudgement& s : d.sets)
    sets.push_back({{"name", s.name},
                    {"n", s.n},
                    {"failed", s.failed},
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
                   {"pass", p.pass}});
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
          {"adequacy", adequacy}};
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
  return d;
}

}  // namespace ridgecal
