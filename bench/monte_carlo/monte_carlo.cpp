// ridgecal_monte_carlo: Monte Carlo check of the fitted curve, its uncertainty
// and its warnings against invented scenarios with a known truth (see
// docs/monte-carlo.md). Prints markdown tables on stdout.
//
//   ridgecal_monte_carlo [--runs N] [--fresh M] [--line-units N] [--seed S] [--check]
//                        [--least-squares]
//
// --check (the smoke test): also verifies that the harness works and that its
// numbers are sane; exit 1 when not.
#include <algorithm>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <iostream>
#include <map>
#include <sstream>
#include <string>
#include <vector>

#include "mc_adapter.hpp"
#include "mc_line.hpp"
#include "mc_scenarios.hpp"

namespace ridgecal::mc {
namespace {

struct Settings {
  int runs = 200;
  int fresh = 40;
  int line_units = 2000;
  std::uint64_t seed = 20261202;
  bool check = false;
  /// Every scenario fitted with lambda = 0 only (CV over the degrees): a
  /// stand-in for a penalty that does not bias the curve (issue 13 item 1),
  /// to tell the warnings' own false alarms from the bias they rightly see.
  bool least_squares = false;
  /// The model-inadequacy term and the adequacy check turned off
  /// (inadequacy_alpha = 0, adequacy_limit = 0): the method before them.
  bool no_inadequacy = false;
};

std::string pct(double x) {
  char b[32];
  std::snprintf(b, sizeof b, "%.1f %%", 100.0 * x);
  return b;
}
std::string num(double x, const char* f = "%+.2f") {
  char b[32];
  std::snprintf(b, sizeof b, f, x);
  return b;
}

struct CleanStats {
  int runs = 0, refused = 0;
  double bias_lo = 0, bias_hi = 0, bias_lo_sd = 0, bias_hi_sd = 0;
  double covered = 0, fresh = 0;
  double third_cov[3] = {0, 0, 0}, third_n[3] = {0, 0, 0};
  std::map<std::string, int> code_runs;  ///< runs on which each code fired
  int any_warning = 0;
  double cov_quarter_u = 0;                            ///< negative control: coverage with U / 4
  int term_runs = 0, flag_runs = 0, checked_runs = 0;  ///< inadequacy term, adequacy flag
  std::vector<double> ratios;                          ///< adequacy ratio R of each run
};

double aux_mid(const Scenario& s) {
  return s.aux_levels.empty() ? 0.0 : s.aux_levels[s.aux_levels.size() / 2];
}

CleanStats run_clean(const Scenario& s, const Settings& st, std::uint64_t seed) {
  CleanStats c;
  std::vector<double> blo, bhi;
  double covered_q = 0;
  for (int run = 0; run < st.runs; ++run) {
    Rng rng(seed + 7919ULL * run);
    const Dataset d = simulate_run(s, Fault::None, rng);
    const McFit fit = calibrate_adapter(d, s.options);
    ++c.runs;
    if (!fit.ok) {
      ++c.refused;
      continue;
    }
    const double am = aux_mid(s);
    blo.push_back((fit.predict(s.response(s.q_lo(), am), am) - s.q_lo()) / s.sigma(s.q_lo()));
    bhi.push_back((fit.predict(s.response(s.q_hi(), am), am) - s.q_hi()) / s.sigma(s.q_hi()));
    for (int i = 0; i < st.fresh; ++i) {
      const double u = rng.uniform();
      const double q = s.q_lo() + u * (s.q_hi() - s.q_lo());
      const double a =
          s.aux_levels.empty()
              ? 0.0
              : s.aux_levels.front() + rng.uniform() * (s.aux_levels.back() - s.aux_levels.front());
      const double x = s.response(q + s.sigma(q) * rng.normal(), a);
      const double err = std::fabs(fit.predict(x, a) - q);
      const double U = fit.expanded(x, a);
      const bool in = err <= U;
      const int third = std::min(2, static_cast<int>(u * 3.0));
      c.covered += in;
      c.fresh += 1;
      c.third_cov[third] += in;
      c.third_n[third] += 1;
      covered_q += err <= 0.25 * U;
    }
    c.term_runs += fit.inadequacy_included;
    c.flag_runs += fit.adequacy_far;
    c.checked_runs += fit.adequacy_computed;
    if (fit.adequacy_computed) c.ratios.push_back(fit.adequacy_ratio);
    std::vector<std::string> codes = fit.warning_codes;
    std::sort(codes.begin(), codes.end());
    codes.erase(std::unique(codes.begin(), codes.end()), codes.end());
    for (const std::string& code : codes) ++c.code_runs[code];
    c.any_warning += !codes.empty();
  }
  auto mean_sd = [](const std::vector<double>& v, double& m, double& sd) {
    m = sd = 0;
    if (v.empty()) return;
    for (double x : v) m += x;
    m /= v.size();
    for (double x : v) sd += (x - m) * (x - m);
    sd = v.size() > 1 ? std::sqrt(sd / (v.size() - 1)) : 0.0;
  };
  mean_sd(blo, c.bias_lo, c.bias_lo_sd);
  mean_sd(bhi, c.bias_hi, c.bias_hi_sd);
  c.cov_quarter_u = c.fresh > 0 ? covered_q / c.fresh : 0.0;
  return c;
}

struct FaultStats {
  int runs = 0, refused = 0, any = 0, fail = 0;
  int detected = 0;                  ///< runs on which one of the fault's own codes fired
  int term_runs = 0, flag_runs = 0;  ///< inadequacy term included, adequacy flag far
  std::map<std::string, int> code_runs;
};

/// The warnings meant to catch each fault (docs/monte-carlo.md, AFTER): a
/// stuck reading or a wrong reference lands in training (lack of fit) or in
/// the test set (test much worse than validation).
std::vector<std::string> fault_codes(Fault f) {
  switch (f) {
    case Fault::Spike:
      return {"outlier"};
    case Fault::Stuck:
    case Fault::WrongLabel:
      return {"lack-of-fit", "test-much-worse-than-validation"};
    case Fault::Underfit:
      return {"lack-of-fit", "residual-pattern"};
    case Fault::Drift:
      return {"drift-between-repeats"};
    default:
      return {};
  }
}

FaultStats run_fault(const Scenario& base, Fault f, const Settings& st, std::uint64_t seed) {
  const Scenario s = with_fault(base, f);
  FaultStats r;
  for (int run = 0; run < st.runs; ++run) {
    Rng rng(seed + 104729ULL * run);
    const Dataset d = simulate_run(s, f, rng);
    const McFit fit = calibrate_adapter(d, s.options);
    ++r.runs;
    if (!fit.ok) {
      ++r.refused;
      continue;
    }
    std::vector<std::string> codes = fit.warning_codes;
    std::sort(codes.begin(), codes.end());
    codes.erase(std::unique(codes.begin(), codes.end()), codes.end());
    for (const std::string& c : codes) ++r.code_runs[c];
    r.any += !codes.empty();
    const std::vector<std::string> own = fault_codes(f);
    r.detected += std::any_of(codes.begin(), codes.end(), [&](const std::string& c) {
      return std::find(own.begin(), own.end(), c) != own.end();
    });
    r.fail += fit.has_verdict && !fit.pass;
    r.term_runs += fit.inadequacy_included;
    r.flag_runs += fit.adequacy_far;
  }
  return r;
}

std::string top_codes(const std::map<std::string, int>& m, int runs, int n,
                      const CleanStats& clean) {
  std::vector<std::pair<int, std::string>> v;
  for (const auto& [code, k] : m) v.push_back({k, code});
  std::sort(v.begin(), v.end(), [](const auto& a, const auto& b) {
    return a.first != b.first ? a.first > b.first : a.second < b.second;
  });
  std::string out;
  for (int i = 0; i < n && i < static_cast<int>(v.size()); ++i) {
    const auto it = clean.code_runs.find(v[i].second);
    const int k = it == clean.code_runs.end() ? 0 : it->second;
    out += (i ? ", " : "") + v[i].second + " " + pct(static_cast<double>(v[i].first) / runs) +
           " (clean " + pct(k / double(std::max(1, clean.runs - clean.refused))) + ")";
  }
  return out.empty() ? "none" : out;
}

double quantile(std::vector<double> v, double p) {
  if (v.empty()) return std::nan("");
  std::sort(v.begin(), v.end());
  const double pos = p * static_cast<double>(v.size() - 1);
  const std::size_t i = static_cast<std::size_t>(pos);
  const double f = pos - static_cast<double>(i);
  return i + 1 < v.size() ? v[i] + f * (v[i + 1] - v[i]) : v[i];
}

/// The model-inadequacy term and the adequacy check (issue 13 item 3).
void inadequacy_table(std::ostringstream& o, const std::vector<Scenario>& scenarios,
                      std::map<std::string, CleanStats>& clean,
                      std::map<std::pair<std::string, int>, FaultStats>& faults) {
  o << "### Model-inadequacy term and adequacy check\n\n"
    << "| scenario | term included (clean) | adequacy ratio R on clean runs: median / 95 % / "
       "99 % / max | flag (R > limit) on clean runs | flag on underfit | flag on stuck | flag "
       "on wrong-label | term included (underfit) |\n|---|---|---|---|---|---|---|---|\n";
  for (const Scenario& s : scenarios) {
    const CleanStats& c = clean[s.name];
    const int fitted = std::max(1, c.runs - c.refused);
    auto fr = [&](Fault f, bool term) {
      const FaultStats& r = faults[{s.name, static_cast<int>(f)}];
      const int n = std::max(1, r.runs - r.refused);
      return pct((term ? r.term_runs : r.flag_runs) / double(n));
    };
    o << "| " << s.name << " | " << pct(c.term_runs / double(fitted)) << " | "
      << num(quantile(c.ratios, 0.5), "%.2f") << " / " << num(quantile(c.ratios, 0.95), "%.2f")
      << " / " << num(quantile(c.ratios, 0.99), "%.2f") << " / "
      << num(quantile(c.ratios, 1.0), "%.2f") << " | "
      << pct(c.flag_runs / double(std::max(1, c.checked_runs))) << " | "
      << fr(Fault::Underfit, false) << " | " << fr(Fault::Stuck, false) << " | "
      << fr(Fault::WrongLabel, false) << " | " << fr(Fault::Underfit, true) << " |\n";
  }
  o << "\nR = test RMS error / RMS of the combined standard uncertainty without the "
       "model-inadequacy term at the test points; the flag makes a PASS UNDECIDED.\n\n";
}

int run(const Settings& st) {
  std::vector<Scenario> scenarios = all_scenarios();
  if (st.least_squares)
    for (Scenario& s : scenarios) s.options.fit.lambdas = {0.0};
  if (st.no_inadequacy)
    for (Scenario& s : scenarios) {
      s.options.assess.uncertainty.inadequacy_alpha = 0.0;
      s.options.assess.adequacy_limit = 0.0;
    }
  std::ostringstream o;
  int problems = 0;
  auto sane = [&](bool ok, const std::string& what) {
    if (!ok) {
      ++problems;
      std::cerr << "monte-carlo check failed: " << what << "\n";
    }
  };
  o << "runs per scenario: " << st.runs << ", fresh points per run: " << st.fresh
    << ", seed: " << st.seed << (st.least_squares ? ", least squares (lambda = 0)" : "") << "\n\n";
  o << "### Clean runs: end bias and coverage of +-U(k=2)\n\n"
    << "| scenario | family follows truth | refused | mean error at low end (sigma) | at high end "
       "(sigma) | coverage overall | low third | middle third | high third |\n"
    << "|---|---|---|---|---|---|---|---|---|\n";
  std::map<std::string, CleanStats> clean;
  std::vector<std::string> codes_seen;
  for (std::size_t i = 0; i < scenarios.size(); ++i) {
    const Scenario& s = scenarios[i];
    const CleanStats c = run_clean(s, st, st.seed + 1000003ULL * i);
    clean[s.name] = c;
    for (const auto& [code, k] : c.code_runs)
      if (std::find(codes_seen.begin(), codes_seen.end(), code) == codes_seen.end())
        codes_seen.push_back(code);
    const double se = std::sqrt(std::max(1, c.runs - c.refused));
    o << "| " << s.name << " | " << (s.family_can_follow ? "yes" : "no") << " | " << c.refused
      << "/" << c.runs << " | " << num(c.bias_lo) << " (SE " << num(c.bias_lo_sd / se, "%.2f")
      << ") | " << num(c.bias_hi) << " (SE " << num(c.bias_hi_sd / se, "%.2f") << ") | "
      << pct(c.covered / c.fresh) << " | " << pct(c.third_cov[0] / c.third_n[0]) << " | "
      << pct(c.third_cov[1] / c.third_n[1]) << " | " << pct(c.third_cov[2] / c.third_n[2])
      << " |\n";
  }
  o << "\nTargets: |mean error at each end| <= 0.25 sigma where the family follows the truth; "
       "coverage >= 93 % overall and >= 90 % in every third.\n\n";
  std::sort(codes_seen.begin(), codes_seen.end());
  o << "### Clean runs: share of runs on which each warning fires (target <= 5 %)\n\n| code |";
  for (const Scenario& s : scenarios) o << " " << s.name << " |";
  o << "\n|---|";
  for (std::size_t i = 0; i < scenarios.size(); ++i) o << "---|";
  o << "\n";
  for (const std::string& code : codes_seen) {
    o << "| " << code << " |";
    for (const Scenario& s : scenarios) {
      const CleanStats& c = clean[s.name];
      const auto it = c.code_runs.find(code);
      o << " " << pct((it == c.code_runs.end() ? 0 : it->second) / double(c.runs - c.refused))
        << " |";
    }
    o << "\n";
  }
  o << "| (any warning) |";
  for (const Scenario& s : scenarios)
    o << " " << pct(clean[s.name].any_warning / double(clean[s.name].runs - clean[s.name].refused))
      << " |";
  o << "\n\n";
  o << "ntc-counts: the family cannot follow the truth, so a warning about the model there "
       "(lack-of-fit, degree-at-grid-edge, non-monotonic, test-much-worse-than-validation) "
       "is a true alarm, not a false one.\n\n";

  // Every fault in every scenario: detection by the fault's own warnings.
  std::map<std::pair<std::string, int>, FaultStats> faults;
  for (std::size_t i = 0; i < scenarios.size(); ++i)
    for (Fault f : all_faults())
      faults[{scenarios[i].name, static_cast<int>(f)}] =
          run_fault(scenarios[i], f, st,
                    st.seed + 31ULL * static_cast<int>(f) + 17 + (i ? 1000003ULL * i : 0ULL));
  o << "### Seeded faults: share of runs on which the fault's own warning fires (target >= 90 "
       "%)\n\n| fault | its warnings |";
  for (const Scenario& s : scenarios) o << " " << s.name << " |";
  o << "\n|---|---|";
  for (std::size_t i = 0; i < scenarios.size(); ++i) o << "---|";
  o << "\n";
  for (Fault f : all_faults()) {
    std::string own;
    for (const std::string& c : fault_codes(f)) own += (own.empty() ? "" : " or ") + c;
    o << "| " << to_string(f) << " | " << own << " |";
    for (const Scenario& s : scenarios) {
      const FaultStats& r = faults[{s.name, static_cast<int>(f)}];
      o << " " << pct(r.detected / double(std::max(1, r.runs - r.refused))) << " |";
    }
    o << "\n";
  }
  o << "\n";

  o << "### Seeded faults: detection (target: the fault's warning in >= 90 % of runs)\n\n"
    << "| scenario | fault | refused | verdict FAIL | any warning (clean) | most frequent codes "
       "(their rate on clean runs) |\n"
    << "|---|---|---|---|---|---|\n";
  for (const Scenario& sc : scenarios) {
    const std::string& name = sc.name;
    const Scenario* it = &sc;
    const CleanStats& c = clean[name];
    for (Fault f : all_faults()) {
      const FaultStats& r = faults[{name, static_cast<int>(f)}];
      const int fitted = r.runs - r.refused;
      o << "| " << name << " | " << to_string(f) << " | " << r.refused << "/" << r.runs << " | "
        << (it->options.assess.tolerance ? pct(r.fail / double(std::max(1, fitted)))
                                         : "no tolerance")
        << " | " << pct(r.any / double(std::max(1, fitted))) << " ("
        << pct(c.any_warning / double(std::max(1, c.runs - c.refused))) << ") | "
        << top_codes(r.code_runs, std::max(1, fitted), 4, c) << " |\n";
    }
  }
  o << "\nFaults: spike = one reading off by 10 sigma; stuck = the repeats of one interior "
       "setpoint read what the previous setpoint read; wrong-label = one interior setpoint's "
       "reference recorded a quarter of a setpoint step off; underfit = a 6-sigma cubic "
       "deviation with the degrees limited to 1..2; drift = 2 sigma more per repeat.\n\n";

  inadequacy_table(o, scenarios, clean, faults);

  const LineStats line = run_line(st.line_units, st.seed + 99991ULL, st.no_inadequacy);
  o << "### Production line of RH probes, tolerance +-(0.8 %RH + 1 % of reading)\n\n"
    << "| units | kind | rejected (refused or FAIL) | flagged (any warning) | rejected or "
       "flagged | undecided (of which U >= limit) | hardware check | batch reason names the "
       "defect | target |\n"
       "|---|---|---|---|---|---|---|---|---|\n";
  for (const LineRow& r : line.rows)
    o << "| " << r.units << " | " << r.kind << " | " << pct(r.rejected / double(r.units)) << " | "
      << pct(r.flagged / double(r.units)) << " | " << pct(r.rejected_or_flagged / double(r.units))
      << " | " << pct(r.undecided / double(r.units)) << " (" << pct(r.undecided_u / double(r.units))
      << ")"
      << " | " << pct(r.hardware / double(r.units)) << " | "
      << (r.kind == "good" || r.kind == "spike" ? std::string("-")
                                                : pct(r.reasoned / double(r.units)))
      << " | " << (r.kind == "good" ? "rejected <= 0.5 %, hardware 0 %" : "rejected 100 %")
      << " |\n";
  std::cout << o.str();

  if (st.check) {
    const CleanStats& p = clean["pt100"];
    const double cov = p.covered / p.fresh;
    // Pt100 with the degree family able to follow the truth: U must cover
    // fresh points in a plausible window (BEFORE measured about 95 %; see docs/monte-carlo.md).
    sane(p.refused == 0, "pt100 clean runs must all be fitted");
    sane(cov >= 0.85 && cov <= 0.999, "pt100 coverage " + pct(cov) + " outside 85..99.9 %");
    // Negative control: a quarter of U cannot cover 95 % of fresh points.
    sane(p.cov_quarter_u < 0.6, "coverage with U/4 is " + pct(p.cov_quarter_u) + ", not < 60 %");
    sane(std::fabs(p.bias_lo) < 2.0 && std::fabs(p.bias_hi) < 2.0, "pt100 end bias beyond 2 sigma");
    // The known-bad family (NTC on counts): without the model-inadequacy term
    // its coverage is worse than the Pt100's; with it, U covers (the full run
    // measured 75.6 % without and 96.7 % with; window 90 %).
    const CleanStats& n = clean["ntc-counts"];
    if (st.no_inadequacy)
      sane(n.covered / n.fresh < cov, "ntc-counts coverage not below pt100's");
    else
      sane(n.covered / n.fresh >= 0.90, "ntc-counts coverage " + pct(n.covered / n.fresh) +
                                            " below 90 % with the model-inadequacy term");
    // The calibrated warnings (issue 13): quiet on clean Pt100 runs, and each
    // catches its seeded fault there (wide windows: 60 runs in the smoke test;
    // the full run measured 0-3 % and 97-100 %).
    // lack-of-fit gets 30 %: it rightly sees the gain tilt of the current
    // penalty (8.5 % in the full run, 10 of 60 here; 1.5 % with lambda = 0);
    // tighten to 15 % once the penalty no longer tilts the curve.
    for (const auto& [code, k] : p.code_runs)
      sane(k <= (code == "lack-of-fit" ? 0.30 : 0.15) * p.runs,
           "pt100 clean runs: " + code + " fires on " + pct(k / double(p.runs)));
    for (Fault f : {Fault::Spike, Fault::Underfit, Fault::Drift, Fault::Stuck}) {
      const FaultStats& r = faults[{"pt100", static_cast<int>(f)}];
      sane(r.detected >= 0.8 * r.runs,
           "pt100 " + to_string(f) + " detected in only " + pct(r.detected / double(r.runs)));
    }
    for (const LineRow& r : line.rows) {
      if (r.kind == "good") sane(r.rejected < 0.2 * r.units, "line false rejects above 20 %");
      if (r.kind == "good") sane(r.hardware == 0, "the hardware check refused a good unit");
      if (r.kind == "stuck" || r.kind == "open-circuit" || r.kind == "missing-cell")
        sane(r.reasoned >= 0.9 * r.units, "a defect's batch reason is not named in 90 % of units");
      if (r.kind == "open-circuit")
        sane(r.rejected >= 0.9 * r.units, "open-circuit units rejected below 90 %");
      if (r.kind == "missing-cell")
        sane(r.rejected == r.units, "a unit with a missing cell was not rejected");
    }
    // Reproducible: the same seed gives the same run.
    const Scenario& s = scenarios.front();
    Rng r1(5), r2(5);
    const McFit a = calibrate_adapter(simulate_run(s, Fault::None, r1), s.options);
    const McFit b = calibrate_adapter(simulate_run(s, Fault::None, r2), s.options);
    sane(a.ok && b.ok && a.predict(130.0, 0) == b.predict(130.0, 0), "runs not reproducible");
    std::cerr << (problems ? "monte-carlo check: FAILED\n" : "monte-carlo check: ok\n");
  }
  return problems ? 1 : 0;
}

}  // namespace
}  // namespace ridgecal::mc

int main(int argc, char** argv) {
  ridgecal::mc::Settings st;
  for (int i = 1; i < argc; ++i) {
    const std::string a = argv[i];
    auto value = [&]() -> std::string {
      if (i + 1 >= argc) {
        std::cerr << a << " needs a value\n";
        std::exit(2);
      }
      return argv[++i];
    };
    try {
      if (a == "--runs")
        st.runs = std::stoi(value());
      else if (a == "--fresh")
        st.fresh = std::stoi(value());
      else if (a == "--line-units")
        st.line_units = std::stoi(value());
      else if (a == "--seed")
        st.seed = std::stoull(value());
      else if (a == "--check")
        st.check = true;
      else if (a == "--least-squares")
        st.least_squares = true;
      else if (a == "--no-inadequacy")
        st.no_inadequacy = true;
      else {
        std::cerr << "usage: ridgecal_monte_carlo [--runs N] [--fresh M] [--line-units N] "
                     "[--seed S] [--check] [--least-squares] [--no-inadequacy]\n";
        return 2;
      }
    } catch (const std::exception&) {
      std::cerr << a << ": not a number\n";
      return 2;
    }
  }
  if (st.runs < 2 || st.fresh < 1 || st.line_units < 10) {
    std::cerr << "--runs >= 2, --fresh >= 1, --line-units >= 10\n";
    return 2;
  }
  return ridgecal::mc::run(st);
}
