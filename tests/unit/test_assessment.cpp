// Tolerance formulas, the decision rule, the uncertainty budget, the record's
// new members and the as-found check.
#define BOOST_TEST_MODULE assessment
#include <unistd.h>

#include <boost/test/unit_test.hpp>
#include <cmath>
#include <cstdio>
#include <filesystem>

#include "ridgecal/as_found.hpp"
#include "ridgecal/assessment.hpp"
#include "ridgecal/atomic_file.hpp"
#include "ridgecal/record.hpp"
#include "test_support.hpp"

using namespace ridgecal;

namespace {

Calibration fit_line(double noise, double lambda = 0.0, std::uint64_t seed = 1) {
  const Dataset ds =
      test::synthetic_run([](double x) { return 2.0 * x + 1.0; }, 0, 10, 11, 2, noise, seed);
  FitOptions o;
  o.fixed_degree = 1;
  o.fixed_lambda = lambda;
  o.split.test_fraction = 0.0;
  const FitOutcome f = fit_calibration(ds, o);
  BOOST_REQUIRE(f.status.ok);
  return f.calibration;
}

}  // namespace

BOOST_AUTO_TEST_CASE(enums_round_trip) {
  for (auto r : {DecisionRule::SimpleAcceptance, DecisionRule::GuardedAcceptance})
    BOOST_TEST((decision_rule_from_string(to_string(r)) == r));
  for (auto v : {Verdict::Pass, Verdict::Fail, Verdict::Undecided})
    BOOST_TEST((verdict_from_string(to_string(v)) == v));
  for (auto p : {TolerancePreset::Iec60751AA, TolerancePreset::Iec60751A,
                 TolerancePreset::Iec60751B, TolerancePreset::Iec60751C})
    BOOST_TEST((tolerance_preset_from_string(to_string(p)) == p));
  for (auto t : {EvaluationType::A, EvaluationType::B})
    BOOST_TEST((evaluation_type_from_string(to_string(t)) == t));
  for (auto d : {Distribution::Normal, Distribution::Rectangular})
    BOOST_TEST((distribution_from_string(to_string(d)) == d));
  for (auto d : {SweepDirection::Up, SweepDirection::Down, SweepDirection::Unspecified})
    BOOST_TEST((sweep_direction_from_string(to_string(d)) == d));
  BOOST_CHECK_THROW(decision_rule_from_string("lenient"), std::invalid_argument);
  BOOST_CHECK_THROW(sweep_direction_from_string("sideways"), std::invalid_argument);
}

BOOST_AUTO_TEST_CASE(tolerance_formula_and_validation) {
  ToleranceSpec t;
  BOOST_TEST(t.validate().find("all 0") != std::string::npos);
  t.offset = -1;
  BOOST_TEST(t.validate().find("offset is -1") != std::string::npos);
  t.offset = 0.1;
  t.proportional = 0.01;
  t.percent_of_span = 0.5;
  BOOST_TEST(t.validate().find("span") != std::string::npos);
  t.span_low = 0;
  t.span_high = 200;
  BOOST_TEST(t.validate().empty());
  BOOST_TEST(t.limit(-50.0) == 0.1 + 0.5 + 1.0, boost::test_tools::tolerance(1e-12));
  BOOST_TEST(t.describe().find("0.5% of span") != std::string::npos);
}

BOOST_AUTO_TEST_CASE(guarded_rule_subtracts_u) {
  ToleranceSpec t;
  t.offset = 1.0;
  const std::vector<PointToJudge> pts{{1, "training", 0, 0.7, 0.2}, {2, "training", 0, 0.85, 0.2}};
  const Decision simple = judge(pts, t, DecisionRule::SimpleAcceptance);
  BOOST_TEST(simple.pass());
  BOOST_TEST(simple.points[1].acceptance_limit == 1.0);
  const Decision guarded = judge(pts, t, DecisionRule::GuardedAcceptance);
  BOOST_TEST(!guarded.pass());
  // Inside the tolerance, in the guard band: not a FAIL, conformity not shown.
  BOOST_TEST(to_string(guarded.verdict) == "UNDECIDED");
  BOOST_TEST(to_string(guarded.points[1].conformity) == "not-shown-guard-band");
  BOOST_TEST(guarded.points[0].pass);
  BOOST_TEST(!guarded.points[1].pass);
  BOOST_TEST(guarded.points[1].acceptance_limit == 0.8, boost::test_tools::tolerance(1e-12));
  BOOST_TEST(guarded.statement.find("Guarded acceptance") != std::string::npos);
  // U larger than the tolerance: nothing can be accepted.
  const Decision none = judge({{1, "training", 0, 0.0, 1.5}}, t, DecisionRule::GuardedAcceptance);
  BOOST_TEST(!none.pass());
  BOOST_TEST(to_string(none.points[0].conformity) == "not-shown-uncertainty");
  // Informative sets do not decide.
  const Decision info = judge({{1, "training", 0, 0.1, 0}, {1, "validation", 0, 2.0, 0}}, t,
                              DecisionRule::SimpleAcceptance, {"validation"});
  BOOST_TEST(info.pass());
  BOOST_TEST(info.sets[1].failed == 1u);
}

// Issue 14 item 1: three outcomes kept apart, under both rules, at the
// boundaries. Limit 1 everywhere (offset only), so the figures are exact.
BOOST_AUTO_TEST_CASE(three_outcomes_at_each_point) {
  ToleranceSpec t;
  t.offset = 1.0;
  const std::vector<PointToJudge> pts{
      {1, "training", 5, 0.8, 0.2, "sp1"},    // on the acceptance limit 1 - 0.2: conforms
      {2, "training", 5, -0.81, 0.2, "sp1"},  // guard band (guarded), conforms (simple)
      {3, "training", 5, 1.0, 0.2, "sp2"},    // on the limit: guard band / conforms
      {4, "training", 5, -1.01, 0.2, "sp2"},  // beyond the limit: does not conform
  };
  const Decision g = judge(pts, t, DecisionRule::GuardedAcceptance);
  BOOST_TEST(to_string(g.points[0].conformity) == "conforms");
  BOOST_TEST(to_string(g.points[1].conformity) == "not-shown-guard-band");
  BOOST_TEST(to_string(g.points[2].conformity) == "not-shown-guard-band");
  BOOST_TEST(to_string(g.points[3].conformity) == "does-not-conform");
  BOOST_TEST(to_string(g.verdict) == "FAIL");  // one point out: FAIL wins over not shown
  BOOST_TEST(g.sets[0].failed == 1u);
  BOOST_TEST(g.sets[0].not_shown == 2u);
  BOOST_TEST(g.points[0].setpoint == "sp1");
  BOOST_TEST(g.points[0].indicated == 5.8, boost::test_tools::tolerance(1e-12));
  BOOST_TEST(g.points[0].tur == 5.0, boost::test_tools::tolerance(1e-12));
  const Decision s = judge(pts, t, DecisionRule::SimpleAcceptance);
  BOOST_TEST(to_string(s.points[1].conformity) == "conforms");
  BOOST_TEST(to_string(s.points[2].conformity) == "conforms");
  BOOST_TEST(to_string(s.points[3].conformity) == "does-not-conform");
  // Without the failing point: guarded gives UNDECIDED, simple PASS.
  const std::vector<PointToJudge> in(pts.begin(), pts.begin() + 3);
  BOOST_TEST(to_string(judge(in, t, DecisionRule::GuardedAcceptance).verdict) == "UNDECIDED");
  BOOST_TEST(to_string(judge(in, t, DecisionRule::SimpleAcceptance).verdict) == "PASS");
  // The terminal text never calls a point inside the tolerance "out of tolerance".
  const std::string text = judge(in, t, DecisionRule::GuardedAcceptance).full();
  BOOST_TEST(text.find("out of tolerance") == std::string::npos);
  BOOST_TEST(text.find("conformity not shown") != std::string::npos);
  // Every outcome name round-trips.
  for (Conformity c : {Conformity::Conforms, Conformity::NotShownGuardBand,
                       Conformity::NotShownUncertainty, Conformity::DoesNotConform})
    BOOST_TEST(to_string(conformity_from_string(to_string(c))) == to_string(c));
  BOOST_CHECK_THROW(conformity_from_string("pass"), std::invalid_argument);
}

// Issue 14 item 5: the test uncertainty ratio.
BOOST_AUTO_TEST_CASE(test_uncertainty_ratio) {
  ToleranceSpec t;
  t.offset = 1.0;
  // TUR 5:1, 2:1 (low), and U > limit (0.8:1) with a zero error.
  const std::vector<PointToJudge> pts{
      {1, "training", 0, 0.0, 0.2}, {2, "training", 0, 0.0, 0.5}, {3, "test", 0, 0.0, 1.25}};
  const Decision d = judge(pts, t, DecisionRule::SimpleAcceptance);
  BOOST_TEST(d.low_tur_points == 2u);
  BOOST_TEST(d.min_tur == 0.8, boost::test_tools::tolerance(1e-12));
  // Simple acceptance never gives a plain PASS where U exceeds the limit.
  BOOST_TEST(to_string(d.points[2].conformity) == "not-shown-uncertainty");
  BOOST_TEST(to_string(d.verdict) == "UNDECIDED");
  BOOST_TEST(d.statement.find("below 4:1 at 2 point(s)") != std::string::npos);
  // Only a low TUR (no U >= limit): PASS with the warning in the statement.
  const std::vector<PointToJudge> low(pts.begin(), pts.begin() + 2);
  const Decision w = judge(low, t, DecisionRule::SimpleAcceptance);
  BOOST_TEST(to_string(w.verdict) == "PASS");
  BOOST_TEST(w.low_tur_points == 1u);
  BOOST_TEST(w.brief().find("below 4:1") != std::string::npos);
  // The threshold is configurable; 1 keeps only the U >= limit rule.
  BOOST_TEST(judge(low, t, DecisionRule::SimpleAcceptance, {}, 1.0).low_tur_points == 0u);
  BOOST_TEST(judge(low, t, DecisionRule::SimpleAcceptance, {}, 10.0).low_tur_points == 2u);
  // No U known (0): no ratio, no warning.
  const Decision none = judge({{1, "training", 0, 0.0, 0.0}}, t, DecisionRule::SimpleAcceptance);
  BOOST_TEST(std::isnan(none.points[0].tur));
  BOOST_TEST(none.low_tur_points == 0u);
  BOOST_TEST(to_string(none.verdict) == "PASS");
  // Validation of the threshold names the field, the value and the rule.
  BOOST_TEST(validate_tur_warning(4.0).empty());
  BOOST_TEST(validate_tur_warning(0.5).find("tur_warning is 0.5") != std::string::npos);
  BOOST_TEST(!validate_tur_warning(std::nan("")).empty());
  BOOST_TEST(!validate_tur_warning(101.0).empty());
  // The per-point results survive the record's JSON.
  const Decision back = decision_from_json(to_json(d), "x.json");
  BOOST_TEST(to_string(back.points[2].conformity) == "not-shown-uncertainty");
  BOOST_TEST(back.points[1].tur == 2.0, boost::test_tools::tolerance(1e-12));
  BOOST_TEST(back.low_tur_points == 2u);
}

BOOST_AUTO_TEST_CASE(least_squares_band_matches_the_textbook_formula) {
  // Straight line: Var(p(x0)) = s^2 (1/n + (x0 - mean)^2 / Sxx).
  const Calibration cal = fit_line(0.05);
  const FitCovariance cov(cal);
  double mean = 0, sxx = 0, rss = 0;
  std::size_t n = 0;
  for (const auto& p : cal.points) mean += p.reading, ++n;
  mean /= static_cast<double>(n);
  for (const auto& p : cal.points)
    sxx += (p.reading - mean) * (p.reading - mean), rss += p.error * p.error;
  const double s = std::sqrt(rss / (static_cast<double>(n) - 2));
  BOOST_TEST(cov.effective_parameters() == 2.0, boost::test_tools::tolerance(1e-12));
  BOOST_TEST(cov.residual_sd() == s, boost::test_tools::tolerance(1e-10));
  for (double x0 : {0.0, 3.0, 10.0}) {
    const double expected = 1.0 / static_cast<double>(n) + (x0 - mean) * (x0 - mean) / sxx;
    BOOST_TEST(cov.variance_factor(x0) == expected, boost::test_tools::tolerance(1e-9));
    BOOST_TEST(cov.leverage(x0) == expected,
               boost::test_tools::tolerance(1e-9));  // same for least squares
  }
  // Ridge: shrinkage lowers the variance.
  const FitCovariance ridge(fit_line(0.05, 0.1));
  BOOST_TEST(ridge.effective_parameters() < 2.0);
  BOOST_TEST(ridge.variance_factor(10.0) < cov.variance_factor(10.0));
}

BOOST_AUTO_TEST_CASE(through_the_origin_band_matches_the_textbook_formula) {
  // One budget for every model (uncertainty.hpp): a one-input line forced
  // through the origin has the design column x alone, not centred, so
  // Var(p(x0)) = s^2 x0^2 / sum x_i^2 and s^2 = RSS / (n - 1). Computed here
  // from the raw readings; the general path builds T_1(t) - T_1(t0), the same
  // column up to a scale. 1e-9 relative: the two differ by rounding only, a
  // wide margin. At reading 0 the variance is 0 (the origin is fixed); a
  // centred design (the intercept case) would give s^2/n there instead.
  const Dataset ds = test::synthetic_run([](double x) { return 2.0 * x; }, 1, 10, 10, 2, 0.05, 3);
  FitOptions o;
  o.fixed_degree = 1;
  o.fixed_lambda = 0.0;
  o.intercept = false;
  o.split.test_fraction = 0.0;
  const FitOutcome f = fit_calibration(ds, o);
  BOOST_REQUIRE(f.status.ok);
  const Calibration& cal = f.calibration;
  const FitCovariance cov(cal);
  long double sxx = 0, rss = 0;
  std::size_t n = 0;
  for (const auto& p : cal.points) {
    sxx += static_cast<long double>(p.reading) * p.reading;
    rss += static_cast<long double>(p.error) * p.error;
    ++n;
  }
  const double s = static_cast<double>(std::sqrt(rss / (n - 1)));
  BOOST_TEST(cov.effective_parameters() == 1.0, boost::test_tools::tolerance(1e-12));
  BOOST_TEST(cov.residual_sd() == s, boost::test_tools::tolerance(1e-10));
  for (double x0 : {0.5, 3.0, 10.0}) {
    const double expected = static_cast<double>(x0 * x0 / sxx);
    BOOST_TEST(cov.variance_factor(x0) == expected, boost::test_tools::tolerance(1e-9));
    BOOST_TEST(cov.leverage(x0) == expected, boost::test_tools::tolerance(1e-9));
  }
  BOOST_TEST(cov.variance_factor(0.0) < 1e-20);  // the origin is fixed: no variance there
}

BOOST_AUTO_TEST_CASE(budget_components) {
  const Calibration cal = fit_line(0.05);
  UncertaintyOptions o;
  o.reference_uncertainty = 0.04;
  o.reference_k = 2.0;
  o.resolution = 0.5;  // reading units; slope 2 -> u = 2 * 0.5 / (2 sqrt 3)
  BOOST_TEST(o.validate().empty());
  const UncertaintyBudget u = evaluate_uncertainty(cal, o);
  // Four components and the model-inadequacy line (0 here: a line fitted by a line).
  BOOST_REQUIRE_EQUAL(u.components.size(), 5u);
  BOOST_TEST(u.components[4].name == "model-inadequacy");
  BOOST_TEST(!u.inadequacy.included);
  BOOST_TEST(u.components[4].standard == 0.0);
  BOOST_TEST(u.components[2].standard == 0.02, boost::test_tools::tolerance(1e-12));
  BOOST_TEST(u.components[3].standard == 0.5 / std::sqrt(3.0), boost::test_tools::tolerance(0.01));
  double sum = 0;
  for (const auto& c : u.components) sum += c.standard * c.standard;
  BOOST_TEST(u.combined == std::sqrt(sum), boost::test_tools::tolerance(1e-12));
  BOOST_TEST(u.expanded == 2.0 * u.combined, boost::test_tools::tolerance(1e-12));
  BOOST_TEST(u.band.size() == 21u);
  for (const auto& b : u.band) BOOST_TEST(b.expanded <= u.expanded * (1 + 1e-12));
  // The band is widest at the ends of the range.
  BOOST_TEST(u.band.front().u_fit > u.band[10].u_fit);
  BOOST_TEST(u.expanded_at(u.band[3].reading) == u.band[3].expanded,
             boost::test_tools::tolerance(1e-12));
  o.reference_k = 0.5;
  BOOST_TEST(o.validate().find("reference_k") != std::string::npos);
}

BOOST_AUTO_TEST_CASE(record_round_trips_the_assessment) {
  const Dataset ds =
      test::synthetic_run([](double x) { return 2.0 * x + 1.0; }, 0, 10, 11, 2, 0.05, 2);
  FitOptions fo;
  fo.degrees = {1, 2};
  const FitOutcome f = fit_calibration(ds, fo);
  BOOST_REQUIRE(f.status.ok);
  AssessmentOptions ao;
  ao.tolerance = ToleranceSpec{};
  ao.tolerance->percent_of_span = 1.0;  // span: the calibrated reference range
  ao.rule = DecisionRule::GuardedAcceptance;
  BOOST_REQUIRE(ao.validate().empty());
  const Assessment a = assess_calibration(ds, f.calibration, ao);
  BOOST_REQUIRE(a.tolerance && a.decision);
  BOOST_TEST(a.tolerance->span() > 19.0);
  CalibrationRecord rec;
  rec.tool_version = "test";
  rec.calibration = f.calibration;
  rec.tolerance = a.tolerance;
  rec.decision = a.decision;
  rec.uncertainty = a.uncertainty;
  rec.warnings = a.warnings;
  Warning w;
  w.code = DiagnosticCode::Outlier;
  w.message = "m";
  w.lines = {7};
  w.value = 4.2;
  rec.warnings.push_back(w);
  const nlohmann::json j = record_to_json(rec);
  BOOST_TEST(record_integrity_ok(j));
  BOOST_TEST(j["decision"]["verdict"].get<std::string>() == to_string(a.decision->verdict));
  BOOST_TEST(j["uncertainty"]["k"].get<double>() == 2.0);
  const CalibrationRecord back = record_from_json(j, "r.json");
  BOOST_REQUIRE(back.tolerance && back.decision && back.uncertainty);
  BOOST_TEST(back.tolerance->percent_of_span == 1.0);
  BOOST_TEST(back.tolerance->span_high == a.tolerance->span_high);
  BOOST_TEST((back.decision->rule == DecisionRule::GuardedAcceptance));
  BOOST_TEST(back.decision->points.size() == a.decision->points.size());
  BOOST_TEST(back.uncertainty->expanded == a.uncertainty.expanded);
  BOOST_TEST(back.uncertainty->band.size() == a.uncertainty.band.size());
  BOOST_REQUIRE_EQUAL(back.warnings.size(), rec.warnings.size());
  BOOST_TEST(back.warnings.back().lines == std::vector<std::size_t>{7});
  BOOST_TEST(back.warnings.back().value == 4.2);
  // Writing the read-back record again gives the same JSON (and digest).
  BOOST_TEST(record_to_json(back) == j);
  // A record without the new members still reads (older records).
  nlohmann::json old = j;
  for (const char* k : {"tolerance", "decision", "uncertainty", "warnings"}) old.erase(k);
  const CalibrationRecord plain = record_from_json(old, "old.json");
  BOOST_TEST(!plain.tolerance.has_value());
  BOOST_TEST(plain.warnings.empty());
  // A member in another layout is an error naming it (record_from_json reads
  // the assessment strictly: a verdict is never silently dropped).
  nlohmann::json bad = j;
  bad["decision"]["verdict"] = "MAYBE";
  for (int pass = 0; pass < 2; ++pass) {
    try {
      if (pass == 0)
        record_from_json(bad, "bad.json");
      else
        decision_from_json(bad["decision"], "bad.json");
      BOOST_FAIL("no error");
    } catch (const InputError& e) {
      BOOST_TEST(e.message().find("decision.verdict") != std::string::npos);
    }
  }
}

BOOST_AUTO_TEST_CASE(as_found_refuses_a_modified_record) {
  const test::TempDir tmp;
  const auto& dir = tmp.path();
  const Calibration cal = fit_line(0.01);
  CalibrationRecord rec;
  rec.tool_version = "test";
  rec.calibration = cal;
  rec.tolerance = ToleranceSpec{};
  rec.tolerance->offset = 0.1;
  rec.decision = Decision{};
  nlohmann::json j = record_to_json(rec);
  const std::string good = (dir / "good.json").string(), bad = (dir / "bad.json").string();
  write_file_atomic(good, record_text(j));
  j["model"]["chebyshev_coefficients"][0] =
      j["model"]["chebyshev_coefficients"][0].get<double>() + 0.5;
  write_file_atomic(bad, record_text(j));

  BOOST_TEST(read_checked_record(good, false).integrity_ok);
  try {
    read_checked_record(bad, false);
    BOOST_FAIL("modified record accepted");
  } catch (const InputError& e) {
    BOOST_TEST(e.message().find("modified") != std::string::npos);
    BOOST_TEST(e.hint().find("ridgecal fit") != std::string::npos);
    BOOST_TEST(e.hint().find("--allow-modified") != std::string::npos);
  }
  const CheckedRecord allowed = read_checked_record(bad, true);
  BOOST_TEST(!allowed.integrity_ok);

  // Fresh readings of the same sensor: PASS with the good record; the modified
  // record (offset by 0.5) fails the record's own 0.1 tolerance and says so.
  const Dataset fresh =
      test::synthetic_run([](double x) { return 2.0 * x + 1.0; }, 0, 10, 6, 1, 0.01, 9);
  const AsFoundResult ok =
      evaluate_as_found(read_checked_record(good, false), fresh, AsFoundOptions{});
  BOOST_REQUIRE(ok.decision.has_value());
  BOOST_TEST(ok.decision->pass());
  BOOST_TEST(ok.tolerance_source == "record");
  const AsFoundResult mod = evaluate_as_found(allowed, fresh, AsFoundOptions{});
  BOOST_TEST(!mod.decision->pass());
  BOOST_TEST((mod.warnings.front().code == DiagnosticCode::RecordModified));
  const nlohmann::json out = as_found_to_json(mod, "");
  BOOST_TEST(out["record"]["integrity_ok"].get<bool>() == false);
  BOOST_TEST(out["decision"]["verdict"].get<std::string>() == "FAIL");
  BOOST_TEST(record_integrity_ok(out));
  // A new tolerance from the command line replaces the record's.
  AsFoundOptions wide;
  wide.tolerance = ToleranceSpec{};
  wide.tolerance->offset = 1.0;
  const AsFoundResult w = evaluate_as_found(allowed, fresh, wide);
  BOOST_TEST(w.decision->pass());
  BOOST_TEST(w.tolerance_source == "command line");
  // Guarded acceptance needs the record's uncertainty.
  AsFoundOptions guarded;
  guarded.rule = DecisionRule::GuardedAcceptance;
  BOOST_CHECK_THROW(evaluate_as_found(allowed, fresh, guarded), InputError);
}

// Issue 13 item 6: the variation rule and the zero span.
BOOST_AUTO_TEST_CASE(near_constant_columns_are_bad_input) {
  Dataset ds;
  ds.file = "d.csv";
  for (int i = 0; i < 6; ++i) {
    Observation o;
    o.reading = 100.0 + 100.0 * i;
    o.reference = 20.0;
    o.line = static_cast<std::size_t>(i) + 2;
    ds.rows.push_back(o);
  }
  // Frozen reference: exact, and within the relative rule (1e-9 * 20 = 2e-8).
  BOOST_CHECK_THROW(require_variation(ds, VariationFloors{}, false), InputError);
  BOOST_CHECK_THROW(require_variation(ds, VariationFloors{}, true), InputError);
  ds.rows[3].reference = 20.0 + 1e-8;
  try {
    require_variation(ds, VariationFloors{}, false);
    BOOST_FAIL("a spread of 1e-8 on 20 must count as constant");
  } catch (const InputError& e) {
    BOOST_TEST(e.line() == 2u);
    BOOST_TEST(e.message().find("the references do not vary") == 0u);
  }
  // Just above the relative rule: accepted; a floor above the spread refuses again.
  ds.rows[3].reference = 20.0 + 3e-8;
  BOOST_CHECK_NO_THROW(require_variation(ds, VariationFloors{}, false));
  VariationFloors f;
  f.reference = 1e-7;
  BOOST_CHECK_THROW(require_variation(ds, f, false), InputError);
  // Both constant: bad for a fit, a one-point check for verify.
  for (Observation& o : ds.rows) o.reading = 300.0, o.reference = 20.0;
  BOOST_CHECK_THROW(require_variation(ds, VariationFloors{}, false), InputError);
  BOOST_CHECK_NO_THROW(require_variation(ds, VariationFloors{}, true));
}

BOOST_AUTO_TEST_CASE(percent_of_span_on_a_zero_span_throws) {
  Calibration cal = fit_line(0.0);
  for (SetpointResult& sp : cal.setpoints)
    sp.mean_reference = 5.0;  // every training reference equal
  ToleranceSpec t;
  t.percent_of_span = 1.0;
  BOOST_CHECK_THROW(resolve_span(t, cal, DiagnosticOptions{}, "d.csv"), InputError);
  DiagnosticOptions declared;
  declared.span_low = 0.0;
  declared.span_high = 10.0;
  BOOST_CHECK_NO_THROW(resolve_span(t, cal, declared, "d.csv"));
  BOOST_TEST(t.span() == 10.0);
}
