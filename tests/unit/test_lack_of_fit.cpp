// The calibrated checks of issue 13 (lack_of_fit.hpp): for each, a clean data
// set that must not warn and a seeded fault that must; the distribution
// functions against scipy.
#define BOOST_TEST_MODULE lack_of_fit
#include <fmt/format.h>

#include <algorithm>
#include <boost/test/unit_test.hpp>
#include <cmath>

#include "ridgecal/assessment.hpp"
#include "ridgecal/calibrate.hpp"
#include "ridgecal/extended_fit.hpp"
#include "ridgecal/lack_of_fit.hpp"
#include "ridgecal/record.hpp"
#include "test_support.hpp"

using namespace ridgecal;

namespace {

// Reference values from scipy 1.10.1 (Debian's python3-scipy):
// scipy.stats.f.sf(f, d1, d2), scipy.stats.t.isf(a/2, df), 2*scipy.stats.t.sf(|t|, df).
// Boost.Math and scipy (Cephes) both compute these to about 1e-15 relative;
// 1e-9 leaves a wide margin for the platform's libm.
constexpr double kDistTol = 1e-9;

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

// 10 setpoints x 4 repeats of a gently curved sensor, noise 0.01.
double curved(double x) {
  return 1.0 + 2.0 * x + 0.05 * x * x;
}
Dataset clean_run(std::uint64_t seed) {
  return test::synthetic_run(curved, 0, 10, 10, 4, 0.01, seed);
}

}  // namespace

BOOST_AUTO_TEST_CASE(distributions_match_scipy) {
  struct F {
    double f, d1, d2, sf;
  };
  // scipy.stats.f.sf
  for (const F& c : {F{2.6, 5, 30, 0.045499219275678196}, F{1.0, 3.5, 12, 0.436488580173399},
                     F{10.0, 1, 5, 0.02503101581845294}, F{0.3, 8, 30, 0.9602035227262112}})
    BOOST_TEST(f_distribution_sf(c.f, c.d1, c.d2) == c.sf, boost::test_tools::tolerance(kDistTol));
  // scipy.stats.t.isf(a / 2, df) and 2 * scipy.stats.t.sf(t, df)
  BOOST_TEST(student_t_two_sided_critical(0.05, 10) == 2.2281388519649385,
             boost::test_tools::tolerance(kDistTol));
  BOOST_TEST(student_t_two_sided_critical(0.01 / 40, 13) == 4.983828857441019,
             boost::test_tools::tolerance(kDistTol));
  BOOST_TEST(student_t_two_sided_p(2.5, 7) == 0.040992218585752874,
             boost::test_tools::tolerance(kDistTol));
  BOOST_TEST(std::isnan(f_distribution_sf(1.0, 0.0, 3.0)));
  BOOST_TEST(std::isnan(student_t_two_sided_critical(1.5, 3.0)));
}

BOOST_AUTO_TEST_CASE(lack_of_fit_clean_and_underfit) {
  const Dataset ds = clean_run(11);
  // The right degree: no lack of fit.
  const LackOfFit ok = lack_of_fit_test(ds, fit(ds, fixed(2)), 0.01);
  BOOST_REQUIRE(ok.computed);
  BOOST_TEST(ok.setpoints == 10u);
  BOOST_TEST(ok.repeated_setpoints == 10u);
  BOOST_TEST(ok.df_pure == 30.0);
  BOOST_TEST(ok.df_lack == 7.0, boost::test_tools::tolerance(1e-9));  // 10 setpoints - 3 terms
  BOOST_TEST(ok.p > 0.01);
  BOOST_TEST(check_lack_of_fit(ok).empty());
  // A straight line through the curve: F is huge.
  const LackOfFit bad = lack_of_fit_test(ds, fit(ds, fixed(1)), 0.01);
  BOOST_REQUIRE(bad.computed);
  BOOST_TEST(bad.p < 1e-6);
  const auto w = check_lack_of_fit(bad);
  BOOST_REQUIRE_EQUAL(w.size(), 1u);
  BOOST_TEST((w[0].code == DiagnosticCode::LackOfFit));
  BOOST_TEST(w[0].message.find("Lack of fit") != std::string::npos);
  // The F statistic by hand from the residuals.
  const Calibration cal = fit(ds, fixed(1));
  std::map<std::string, std::vector<double>> by;
  for (const PointResult& p : cal.points) by[p.setpoint].push_back(p.error);
  double ss_pure = 0, ss_lack = 0;
  for (const auto& [id, e] : by) {
    double m = 0;
    for (double v : e) m += v;
    m /= e.size();
    for (double v : e) ss_pure += (v - m) * (v - m);
    ss_lack += e.size() * m * m;
  }
  BOOST_TEST(bad.f == (ss_lack / 8.0) / (ss_pure / 30.0), boost::test_tools::tolerance(1e-9));
}

BOOST_AUTO_TEST_CASE(lack_of_fit_needs_repeats) {
  const Dataset ds = test::synthetic_run(curved, 0, 10, 12, 1, 0.01, 3);
  const LackOfFit l = lack_of_fit_test(ds, fit(ds, fixed(1)), 0.01);
  BOOST_TEST(!l.computed);
  BOOST_TEST(check_lack_of_fit(l).empty());
}

BOOST_AUTO_TEST_CASE(lack_of_fit_two_inputs) {
  // A surface whose aux dependence is quadratic: aux degree 0 cannot follow it.
  const auto surf = [](double x, double a) { return 0.01 * x + 0.02 * a + 0.001 * a * a; };
  test::Gauss g(5);
  Dataset ds;
  ds.file = "surface.csv";
  std::size_t line = 2;
  for (int j = 0; j < 5; ++j)
    for (int i = 0; i < 6; ++i)
      for (int r = 0; r < 3; ++r) {
        Observation ob;
        ob.reading = 100.0 + 160.0 * i;
        ob.aux = -10.0 + 15.0 * j;
        ob.aux_setpoint = "A" + std::to_string(j);
        ob.reference = surf(ob.reading, ob.aux) + 0.002 * g.next();
        ob.setpoint = "P" + std::to_string(i);
        ob.line = line++;
        ds.rows.push_back(ob);
      }
  ds.columns.aux_setpoint_column = "aux_setpoint";
  FitOptions fo = fixed(2);
  ExtendedOptions comp;
  comp.aux = true;
  comp.aux_degrees = {2};
  const FitOutcome good = fit_extended(ds, fo, comp);
  BOOST_REQUIRE_MESSAGE(good.status.ok, good.status.message);
  const LackOfFit lg = lack_of_fit_test(ds, good.calibration, 0.01);
  BOOST_REQUIRE(lg.computed);
  BOOST_TEST(lg.setpoints == 30u);  // 6 readings x 5 aux levels
  BOOST_TEST(lg.p > 0.01);
  comp.aux_degrees = {0};
  const FitOutcome flat = fit_extended(ds, fo, comp);
  BOOST_REQUIRE_MESSAGE(flat.status.ok, flat.status.message);
  const LackOfFit lf = lack_of_fit_test(ds, flat.calibration, 0.01);
  BOOST_REQUIRE(lf.computed);
  BOOST_TEST(lf.p < 1e-6);
}

BOOST_AUTO_TEST_CASE(lack_of_fit_in_the_record) {
  const Dataset ds = clean_run(12);
  CalibrateOptions co;
  co.fit = fixed(1);
  const CalibrateResult r = calibrate(ds, co);
  BOOST_REQUIRE_MESSAGE(r.status.ok, r.status.message);
  BOOST_REQUIRE(r.record.lack_of_fit.has_value());
  BOOST_TEST(has(r.record.warnings, DiagnosticCode::LackOfFit));
  const nlohmann::json j = record_to_json(r.record);
  BOOST_REQUIRE(j.contains("lack_of_fit"));
  BOOST_TEST(j["lack_of_fit"]["df_pure"].get<double>() == 30.0);
  const CalibrationRecord back = record_from_json(j, "r.json");
  BOOST_REQUIRE(back.lack_of_fit.has_value());
  BOOST_TEST(back.lack_of_fit->f == r.record.lack_of_fit->f);
  BOOST_TEST(back.lack_of_fit->p == r.record.lack_of_fit->p);
  nlohmann::json broken = j;
  broken["lack_of_fit"]["p"] = "small";
  BOOST_CHECK_EXCEPTION(record_from_json(broken, "r.json"), InputError, [](const InputError& e) {
    return std::string(e.what()).find("lack_of_fit.p") != std::string::npos;
  });
}

BOOST_AUTO_TEST_CASE(outlier_bonferroni_clean_and_spike) {
  DiagnosticOptions o;
  Dataset ds = clean_run(13);
  BOOST_TEST(check_outliers_bonferroni(ds, fit(ds, fixed(2)), o).empty());
  ds.rows[17].reference += 0.1;  // 10 noise SDs at one reading of setpoint S04
  const auto w = check_outliers_bonferroni(ds, fit(ds, fixed(2)), o);
  BOOST_REQUIRE_EQUAL(w.size(), 1u);
  BOOST_TEST((w[0].code == DiagnosticCode::Outlier));
  BOOST_TEST(w[0].lines == std::vector<std::size_t>{ds.rows[17].line});
  BOOST_TEST(w[0].message.find("Line " + std::to_string(ds.rows[17].line)) != std::string::npos);
}

BOOST_AUTO_TEST_CASE(outlier_bonferroni_without_repeats) {
  DiagnosticOptions o;
  Dataset ds = test::synthetic_run(curved, 0, 10, 20, 1, 0.01, 7);
  BOOST_TEST(check_outliers_bonferroni(ds, fit(ds, fixed(2)), o).empty());
  ds.rows[7].reference += 0.2;  // 20 noise SDs
  const auto w = check_outliers_bonferroni(ds, fit(ds, fixed(2)), o);
  BOOST_REQUIRE_EQUAL(w.size(), 1u);
  BOOST_TEST(w[0].lines == std::vector<std::size_t>{ds.rows[7].line});
}

BOOST_AUTO_TEST_CASE(drift_between_repeats) {
  DiagnosticOptions o;
  Dataset ds = clean_run(14);
  BOOST_TEST(check_repeat_drift(ds, fit(ds, fixed(2)), o).empty());
  for (std::size_t i = 0; i < ds.rows.size(); ++i)
    ds.rows[i].reference += 0.02 * static_cast<double>(i % 4);  // 2 noise SDs per repeat
  const auto w = check_repeat_drift(ds, fit(ds, fixed(2)), o);
  BOOST_REQUIRE_EQUAL(w.size(), 1u);
  BOOST_TEST((w[0].code == DiagnosticCode::DriftBetweenRepeats));
  BOOST_TEST(w[0].message.find("lower") != std::string::npos);  // residual = fit - reference
  // Sweep directions: up/down order would alias hysteresis, the check stands aside.
  for (Observation& ob : ds.rows) ob.direction = SweepDirection::Up;
  BOOST_TEST(check_repeat_drift(ds, fit(ds, fixed(2)), o).empty());
}

BOOST_AUTO_TEST_CASE(spare_setpoints) {
  DiagnosticOptions o;
  const Dataset ds = test::synthetic_run(curved, 0, 10, 6, 3, 0.01, 5);
  // 6 setpoints, 6 coefficients: none to spare.
  const auto w = check_spare_setpoints(fit(ds, fixed(5)), o);
  BOOST_REQUIRE_EQUAL(w.size(), 1u);
  BOOST_TEST((w[0].code == DiagnosticCode::FewSetpointsPerCoefficient));
  BOOST_TEST(w[0].value == 0.0);
  // 5 coefficients: 1 to spare, the lack-of-fit test can run.
  BOOST_TEST(check_spare_setpoints(fit(ds, fixed(4)), o).empty());
  // 3 coefficients: 3 to spare.
  BOOST_TEST(check_spare_setpoints(fit(ds, fixed(2)), o).empty());
}

BOOST_AUTO_TEST_CASE(test_vs_validation_f) {
  DiagnosticOptions o;
  Calibration cal;
  for (int i = 0; i < 10; ++i) {
    SetpointResult sp;
    sp.id = "S" + std::to_string(i);
    sp.role = i == 4 || i == 7 ? SetRole::Test : SetRole::Train;
    sp.fold = sp.role == SetRole::Train && i > 0 && i < 9 ? i % 3 : -1;
    cal.setpoints.push_back(sp);
  }
  cal.validation.n = 18;
  cal.validation.rmse = 0.1;
  cal.test.n = 6;
  cal.test.rmse = 0.2;  // F = 4 on (2, 6): p = 0.079, chance
  BOOST_TEST(check_test_vs_validation_f(cal, o).empty());
  cal.test.rmse = 0.5;  // F = 25 on (2, 6): p = 0.0012
  const auto w = check_test_vs_validation_f(cal, o);
  BOOST_REQUIRE_EQUAL(w.size(), 1u);
  BOOST_TEST((w[0].code == DiagnosticCode::TestMuchWorseThanValidation));
  BOOST_TEST(w[0].value == 5.0, boost::test_tools::tolerance(1e-12));
}

BOOST_AUTO_TEST_CASE(grid_edge_when_the_data_are_the_limit) {
  Calibration cal;
  SelectionInfo& s = cal.selection;
  s.mode = SelectionMode::CrossValidation;
  s.degrees = {1, 2, 3};
  s.lambdas = {0.0};
  for (int d : s.degrees) {
    GridCell c;
    c.degree = d;
    c.terms = d + 1;
    s.grid.push_back(c);
  }
  s.chosen = 2;  // degree 3, the highest scored
  BOOST_TEST(has(check_grid_edges_feasible(cal), DiagnosticCode::DegreeAtGridEdge));
  s.notes = {"degree 4 dropped: it needs 5 training setpoints, there are 4"};
  BOOST_TEST(!has(check_grid_edges_feasible(cal), DiagnosticCode::DegreeAtGridEdge));
  // A note about a lower degree does not excuse the edge.
  s.notes = {"degree 0 dropped: something"};
  BOOST_TEST(has(check_grid_edges_feasible(cal), DiagnosticCode::DegreeAtGridEdge));
}

BOOST_AUTO_TEST_CASE(options_validate_alphas) {
  DiagnosticOptions o;
  o.outlier_alpha = 1.5;
  BOOST_TEST(o.validate().find("outlier_alpha is 1.5") != std::string::npos);
  o = DiagnosticOptions{};
  o.min_spare_setpoints = -1;
  BOOST_TEST(o.validate().find("min_spare_setpoints") != std::string::npos);
}
