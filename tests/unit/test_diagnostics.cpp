// Every diagnostic: one data set that triggers it and one that does not.
#define BOOST_TEST_MODULE diagnostics
#include <algorithm>
#include <boost/test/unit_test.hpp>
#include <cmath>

#include "ridgecal/assessment.hpp"
#include "ridgecal/diagnostics.hpp"
#include "test_support.hpp"

using namespace ridgecal;

namespace {

bool has(const std::vector<Warning>& ws, DiagnosticCode c) {
  return std::any_of(ws.begin(), ws.end(), [c](const Warning& w) { return w.code == c; });
}

FitOptions fixed(int degree, double lambda = 0.0) {
  FitOptions o;
  o.fixed_degree = degree;
  o.fixed_lambda = lambda;
  o.split.test_fraction = 0.0;
  return o;
}

Calibration fit(const Dataset& ds, const FitOptions& o) {
  const FitOutcome f = fit_calibration(ds, o);
  BOOST_REQUIRE_MESSAGE(f.status.ok, f.status.message);
  return f.calibration;
}

Dataset rows(const std::vector<double>& x, const std::function<double(double)>& f) {
  Dataset ds;
  ds.file = "t.csv";
  for (std::size_t i = 0; i < x.size(); ++i) {
    Observation ob;
    ob.reading = x[i];
    ob.reference = f(x[i]);
    ob.setpoint = "S" + std::to_string(i);
    ob.line = i + 2;
    ds.rows.push_back(ob);
  }
  return ds;
}

double noisy_line(double x) {
  return 2.0 * x + 1.0;
}

}  // namespace

BOOST_AUTO_TEST_CASE(codes_round_trip) {
  for (DiagnosticCode c : all_diagnostic_codes())
    BOOST_TEST((diagnostic_code_from_string(to_string(c)) == c));
  BOOST_CHECK_THROW(diagnostic_code_from_string("no-such-code"), std::invalid_argument);
  BOOST_TEST(all_diagnostic_codes().size() == 16u);
}

BOOST_AUTO_TEST_CASE(degree_and_lambda_at_grid_edge) {
  const auto cubic = [](double x) { return 0.5 * x * x * x - x + 2.0; };
  const Dataset ds = test::synthetic_run(cubic, -2, 2, 20, 1, 0.001, 4);
  FitOptions narrow;  // the cubic needs degree 3, the grid stops there
  narrow.rule = SelectionRule::MinCv;
  narrow.degrees = {1, 2, 3};
  narrow.lambdas = {0.0, 1e-9};
  const auto w1 = check_grid_edges(fit(ds, narrow));
  BOOST_TEST(has(w1, DiagnosticCode::DegreeAtGridEdge));
  FitOptions wide;
  wide.rule = SelectionRule::MinCv;
  wide.degrees = {1, 2, 3, 4, 5, 6};
  const auto w2 = check_grid_edges(fit(ds, wide));
  BOOST_TEST(!has(w2, DiagnosticCode::DegreeAtGridEdge));
  BOOST_TEST(!has(w2, DiagnosticCode::LambdaAtGridEdge));
  // Only huge penalties on offer: the largest one is chosen or the smallest; either is an edge.
  FitOptions heavy;
  heavy.degrees = {3};
  heavy.lambdas = {1e-6, 1e-5};
  BOOST_TEST(has(check_grid_edges(fit(ds, heavy)), DiagnosticCode::LambdaAtGridEdge));
}

BOOST_AUTO_TEST_CASE(range_not_covered_and_coverage_gap) {
  DiagnosticOptions o;
  o.span_low = 0;
  o.span_high = 100;
  const auto id = [](double x) { return x; };
  const Calibration narrow = fit(test::synthetic_run(id, 20, 80, 10, 1, 0.01, 6), fixed(1));
  BOOST_TEST(has(check_coverage(narrow, o), DiagnosticCode::RangeNotCovered));
  const Calibration full = fit(test::synthetic_run(id, 0, 100, 11, 1, 0.01, 6), fixed(1));
  BOOST_TEST(check_coverage(full, o).empty());
  const Calibration gappy = fit(rows({0, 1, 2, 3, 4, 5, 6, 7, 8, 30}, id), fixed(1));
  const auto w = check_coverage(gappy, DiagnosticOptions{});
  BOOST_TEST(has(w, DiagnosticCode::CoverageGap));
  BOOST_TEST(!has(w, DiagnosticCode::RangeNotCovered));  // no span declared
}

BOOST_AUTO_TEST_CASE(residual_pattern_by_runs_test) {
  DiagnosticOptions o;
  const auto quad = [](double x) { return x * x; };
  const Dataset ds = test::synthetic_run(quad, 0, 1, 20, 1, 0.001, 8);
  BOOST_TEST(
      has(check_residual_runs(fit(ds, fixed(1)), o), DiagnosticCode::ResidualPattern));  // underfit
  BOOST_TEST(check_residual_runs(fit(ds, fixed(2)), o).empty());
  BOOST_TEST(runs_test_z({1, 1, 1, 1, 1, -1, -1, -1, -1, -1}) < -2.0);
  BOOST_TEST(runs_test_z({1, -1, 1, -1, 1, -1, 1, -1, 1, -1}) > 2.0);
  BOOST_TEST(std::isnan(runs_test_z({1, 1, 1, -1})));
}

BOOST_AUTO_TEST_CASE(non_monotonic) {
  Calibration cal;
  // t + 0.5 T3 = 2t^3 - 0.5t: slope < 0 near 0
  cal.model = one_input_model(PolyModel{{-1.0, 1.0}, {0.0, 1.0, 0.0, 0.5}});
  BOOST_TEST(has(check_monotonic(cal), DiagnosticCode::NonMonotonic));
  cal.model.coefficients = {0.0, 1.0, 0.0, 0.1};  // slope 0.7 + 1.2t^2 > 0
  BOOST_TEST(check_monotonic(cal).empty());
}

BOOST_AUTO_TEST_CASE(hysteresis_with_direction_column) {
  const auto make = [](double down_offset) {
    Dataset ds = test::synthetic_run(noisy_line, 0, 10, 11, 2, 0.005, 9);
    for (std::size_t i = 0; i < ds.rows.size(); ++i) {
      ds.rows[i].direction = i % 2 == 0 ? SweepDirection::Up : SweepDirection::Down;
      if (i % 2 == 1) ds.rows[i].reference += down_offset;
    }
    return ds;
  };
  ToleranceSpec tol;
  tol.offset = 0.1;
  for (const double off : {0.3, 0.0}) {
    const Dataset ds = make(off);
    const Calibration cal = fit(ds, fixed(1));
    const UncertaintyBudget u = evaluate_uncertainty(cal, UncertaintyOptions{});
    BOOST_TEST(has(check_hysteresis(ds, cal, u, &tol), DiagnosticCode::Hysteresis) == (off > 0),
               "offset " << off);
    BOOST_TEST(check_hysteresis(ds, cal, u, nullptr).empty());  // no tolerance: not judged
  }
  // No direction column: nothing to compare.
  Dataset plain = make(0.3);
  for (auto& ob : plain.rows) ob.direction = SweepDirection::Unspecified;
  const Calibration cal = fit(plain, fixed(1));
  BOOST_TEST(
      check_hysteresis(plain, cal, evaluate_uncertainty(cal, UncertaintyOptions{}), &tol).empty());
}

BOOST_AUTO_TEST_CASE(high_condition_number) {
  DiagnosticOptions o;
  Calibration cal;
  cal.condition_number = 1e9;
  BOOST_TEST(has(check_condition(cal, o), DiagnosticCode::HighConditionNumber));
  cal.condition_number = 12.0;
  BOOST_TEST(check_condition(cal, o).empty());
}

BOOST_AUTO_TEST_CASE(extrapolation_outside_range) {
  Calibration cal;  // a one-input line over readings 10..20 (the N = 1 general model)
  cal.model = one_input_model(PolyModel{{10.0, 20.0}, {0.0, 1.0}});
  const Model m = general_model(cal);
  const auto w = check_extrapolation(m, {9.0, 15.0, 21.0}, {}, {3, 4, 5}, "as-found readings");
  BOOST_REQUIRE_EQUAL(w.size(), 1u);
  BOOST_TEST(w[0].lines == (std::vector<std::size_t>{3, 5}));
  // Reading units beyond the range (21 vs 20), through the scaled reading:
  // (6/5 - 1) * 5 rounds to 1 - 2e-16 (measured); 1e-12 is a wide margin.
  BOOST_TEST(w[0].value == 1.0, boost::test_tools::tolerance(1e-12));
  BOOST_TEST(w[0].message.find("reading range 10..20") != std::string::npos);
  BOOST_TEST(
      check_extrapolation(m, {10.0, 15.0, 20.0}, {}, {3, 4, 5}, "as-found readings").empty());
}

BOOST_AUTO_TEST_CASE(clean_fits_rarely_warn) {
  // Well-planned runs: 21 setpoints, 3 repeats, a quadratic sensor, the
  // default degrees and rule, least squares. The deterministic checks must stay silent. The two
  // statistical ones fire by chance at a known rate: |t| > 3.5 among 63 points
  // in about 5 % of runs, the one-sided runs test at z < -1.96 in about 2.5-4 %.
  const auto f = [](double x) { return 0.01 * x * x + x; };
  DiagnosticOptions o;
  o.span_low = 0;
  o.span_high = 100;
  int chance_alarms = 0;
  const int seeds = 20;
  for (int seed = 1; seed <= seeds; ++seed) {
    const Dataset ds =
        test::synthetic_run(f, 0, 100, 21, 3, 0.01, static_cast<std::uint64_t>(seed));
    FitOptions fo;
    fo.split.seed = static_cast<std::uint64_t>(seed);
    fo.lambdas = {0.0};  // least squares: ridge shrinkage of the gain is a real (detectable) bias
    const Calibration cal = fit(ds, fo);
    ToleranceSpec tol;
    tol.offset = 0.1;
    const auto w = diagnose_fit(ds, cal, evaluate_uncertainty(cal, UncertaintyOptions{}), &tol, o);
    bool alarm = false;
    for (const Warning& x : w) {
      const bool statistical =
          x.code == DiagnosticCode::Outlier || x.code == DiagnosticCode::ResidualPattern ||
          x.code == DiagnosticCode::LackOfFit || x.code == DiagnosticCode::DriftBetweenRepeats;
      BOOST_TEST(statistical, "seed " << seed << ": " << x.message);
      alarm = alarm || statistical;
      BOOST_TEST_MESSAGE("seed " << seed << " degree " << cal.model.reading_degree() << " lambda "
                                 << cal.lambda << ": " << x.message);
    }
    if (alarm) ++chance_alarms;
  }
  BOOST_TEST_MESSAGE("clean runs with a chance outlier or runs-test warning: " << chance_alarms
                                                                               << " of " << seeds);
  BOOST_TEST(chance_alarms <= 5);
}

BOOST_AUTO_TEST_CASE(options_validate_names_field) {
  DiagnosticOptions o;
  BOOST_TEST(o.validate().empty());
  o.gap_factor = 0.5;
  BOOST_TEST(o.validate().find("gap_factor") != std::string::npos);
  o = DiagnosticOptions{};
  o.span_low = 5;
  BOOST_TEST(o.validate().find("span_low") != std::string::npos);
}
