// Selection sanity on synthetic data with a known answer.
#define BOOST_TEST_MODULE selection
#include <fmt/format.h>

#include <boost/test/unit_test.hpp>
#include <map>

#include "ridgecal/calibration.hpp"
#include "test_support.hpp"

using namespace ridgecal;

namespace {
// A sensor-like cubic over 0..100 reading units: the cubic term moves the
// output by about 4 % of span, well above the noise (0.05 % of span).
double cubic(double x) {
  const double t = x / 100.0;
  return -20.0 + 150.0 * t + 12.0 * t * t - 8.0 * t * t * t;
}
constexpr double kCubicNoise = 0.05;
// Acceptance from the issue: degree 3 chosen in at least 9 of 10 seeds by the
// default rule (one-se). Measured (seeds 1..10): cubic 10 of 10, margin 1;
// line 9 of 10, margin 0.
constexpr int kSeeds = 10;
constexpr int kRequiredHits = 9;
// min-cv, measured on the same seeds: on the cubic it picked degrees
// 6 3 3 3 7 7 3 3 3 3 (degree 3 in 7 of 10, never below 3); on the line
// 3 7 1 5 2 7 6 6 1 1 (degree 1 in 3 of 10). Its lowest score often belongs to
// a higher degree that CV cannot tell apart, which is why one-se is the
// default. Asserted with a margin of one seed; min-cv must never underfit the
// cubic (a degree below 3 misses a term 80 times the noise).
constexpr int kMinCvCubicHits = 6;
constexpr int kMinCvLineHits = 2;
}  // namespace

BOOST_AUTO_TEST_CASE(known_cubic_picks_degree_three) {
  for (SelectionRule rule : {SelectionRule::MinCv, SelectionRule::OneSe}) {
    int hits = 0, below = 0;
    std::string picks;
    for (int seed = 1; seed <= kSeeds; ++seed) {
      const Dataset ds = test::synthetic_run(cubic, 0.0, 100.0, 15, 4, kCubicNoise, 1000 + seed);
      FitOptions opt;
      opt.rule = rule;
      opt.split.seed = static_cast<std::uint64_t>(seed);
      const FitOutcome fit = fit_calibration(ds, opt);
      BOOST_REQUIRE_MESSAGE(fit.status.ok, fit.status.message);
      const int d = fit.calibration.model.reading_degree();
      picks += fmt::format(" {}", d);
      if (d == 3) ++hits;
      if (d < 3) ++below;
    }
    BOOST_TEST_MESSAGE("rule " << to_string(rule) << ": degrees chosen" << picks);
    BOOST_TEST(below == 0, "rule " << to_string(rule) << " underfitted the cubic:" << picks);
    const int required = rule == FitOptions{}.rule ? kRequiredHits : kMinCvCubicHits;
    BOOST_TEST(hits >= required, "rule " << to_string(rule) << " picked degree 3 in " << hits
                                         << " of " << kSeeds << " seeds (required " << required
                                         << "):" << picks);
  }
}

BOOST_AUTO_TEST_CASE(noise_around_a_line_picks_degree_one) {
  std::map<SelectionRule, int> hits_of;
  for (SelectionRule rule : {SelectionRule::MinCv, SelectionRule::OneSe}) {
    std::string picks;
    int hits = 0;
    for (int seed = 1; seed <= kSeeds; ++seed) {
      const Dataset ds = test::synthetic_run([](double x) { return 2.0 + 0.5 * x; }, 0.0, 100.0, 12,
                                             4, 0.5, 2000 + seed);
      FitOptions opt;
      opt.rule = rule;
      opt.split.seed = static_cast<std::uint64_t>(seed);
      const FitOutcome fit = fit_calibration(ds, opt);
      BOOST_REQUIRE(fit.status.ok);
      picks += fmt::format(" {}", fit.calibration.model.reading_degree());
      if (fit.calibration.model.reading_degree() == 1) ++hits;
    }
    BOOST_TEST_MESSAGE("rule " << to_string(rule) << ": degrees chosen" << picks);
    const int required = rule == FitOptions{}.rule ? kRequiredHits : kMinCvLineHits;
    BOOST_TEST(hits >= required, "rule " << to_string(rule) << " picked degree 1 in " << hits
                                         << " of " << kSeeds << " seeds (required " << required
                                         << "):" << picks);
    hits_of[rule] = hits;
  }
  // The reason one-se is the default: it finds the line far more often.
  BOOST_TEST(hits_of[SelectionRule::OneSe] > hits_of[SelectionRule::MinCv]);
}

BOOST_AUTO_TEST_CASE(test_set_never_influences_the_choice) {
  // Perturb only the test rows wildly: the chosen model must not change.
  const Dataset ds = test::synthetic_run(cubic, 0.0, 100.0, 15, 4, kCubicNoise, 77);
  FitOptions opt;
  const FitOutcome a = fit_calibration(ds, opt);
  BOOST_REQUIRE(a.status.ok);
  Dataset poisoned = ds;
  for (const PointResult& p : a.calibration.points)
    if (p.role == SetRole::Test)
      for (auto& ob : poisoned.rows)
        if (ob.line == p.line) ob.reference += 1000.0;
  const FitOutcome b = fit_calibration(poisoned, opt);
  BOOST_REQUIRE(b.status.ok);
  BOOST_TEST(a.calibration.model.coefficients == b.calibration.model.coefficients);
  BOOST_TEST(a.calibration.lambda == b.calibration.lambda);
  BOOST_TEST(b.calibration.test.rmse > 100.0);
}

BOOST_AUTO_TEST_CASE(one_se_rule_never_picks_a_more_complex_model) {
  const Dataset ds = test::synthetic_run(cubic, 0.0, 100.0, 15, 4, 0.5, 5);
  FitOptions opt;
  opt.rule = SelectionRule::MinCv;
  const FitOutcome a = fit_calibration(ds, opt);
  opt.rule = SelectionRule::OneSe;
  const FitOutcome b = fit_calibration(ds, opt);
  BOOST_REQUIRE(a.status.ok && b.status.ok);
  BOOST_TEST(b.calibration.model.reading_degree() <= a.calibration.model.reading_degree());
  const auto& g = b.calibration.selection.grid;
  const auto& best =
      a.calibration.selection.grid[static_cast<std::size_t>(a.calibration.selection.chosen)];
  const auto& pick = g[static_cast<std::size_t>(b.calibration.selection.chosen)];
  BOOST_TEST(pick.cv_rmse <= best.cv_rmse + best.cv_se);
}

BOOST_AUTO_TEST_CASE(fixed_mode_skips_selection) {
  const Dataset ds = test::synthetic_run(cubic, 0.0, 100.0, 8, 3, kCubicNoise, 9);
  FitOptions opt;
  opt.fixed_degree = 2;
  opt.fixed_lambda = 0.0;
  const FitOutcome fit = fit_calibration(ds, opt);
  BOOST_REQUIRE(fit.status.ok);
  BOOST_TEST(fit.calibration.model.reading_degree() == 2);
  BOOST_TEST(fit.calibration.selection.grid.size() == 1u);
  BOOST_TEST(to_string(fit.calibration.selection.mode) == "fixed");
}

BOOST_AUTO_TEST_CASE(too_few_setpoints_is_a_status_not_a_crash) {
  const Dataset ds = test::synthetic_run(cubic, 0.0, 100.0, 2, 3, kCubicNoise, 9);
  FitOptions opt;
  opt.degrees = {2, 3};
  const FitOutcome fit = fit_calibration(ds, opt);
  BOOST_TEST(!fit.status.ok);
  BOOST_TEST(fit.status.message.find("setpoint") != std::string::npos);
}

BOOST_AUTO_TEST_CASE(all_readings_equal_is_a_status) {
  Dataset ds = test::synthetic_run(cubic, 0.0, 100.0, 5, 3, kCubicNoise, 9);
  for (auto& ob : ds.rows) ob.reading = 42.0;
  const FitOutcome fit = fit_calibration(ds, FitOptions{});
  BOOST_TEST(!fit.status.ok);
  BOOST_TEST(fit.status.message.find("equal") != std::string::npos);
}

BOOST_AUTO_TEST_CASE(end_setpoints_stay_in_training_and_groups_never_straddle) {
  for (int seed = 1; seed <= 20; ++seed) {
    const Dataset ds = test::synthetic_run(cubic, 0.0, 100.0, 13, 4, kCubicNoise, 300 + seed);
    FitOptions opt;
    opt.split.seed = static_cast<std::uint64_t>(seed);
    const FitOutcome fit = fit_calibration(ds, opt);
    BOOST_REQUIRE(fit.status.ok);
    const auto& sps = fit.calibration.setpoints;
    BOOST_TEST((sps.front().role == SetRole::Train && sps.front().fold == -1));
    BOOST_TEST((sps.back().role == SetRole::Train && sps.back().fold == -1));
    std::map<std::string, std::pair<SetRole, int>> seen;
    for (const PointResult& p : fit.calibration.points) {
      auto [it, fresh] = seen.emplace(p.setpoint, std::make_pair(p.role, p.fold));
      if (!fresh) BOOST_TEST((it->second == std::make_pair(p.role, p.fold)));
    }
    // Training range covers every test reading: no extrapolation in the test.
    for (const PointResult& p : fit.calibration.points)
      if (p.role == SetRole::Test) {
        BOOST_TEST(p.reading >= fit.calibration.model.input.min);
        BOOST_TEST(p.reading <= fit.calibration.model.input.max);
      }
  }
}
