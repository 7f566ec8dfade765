// External checks on thermometry reference functions (data and provenance:
// tests/data/thermometry/README.md).
//  * IEC 60751 Pt100, Callendar-Van Dusen over 0..400 degC: noise-free T(R)
//    fit, coverage of the expanded uncertainty with 0.01 degC reference noise,
//    class A and B tolerance formulas at the class limits.
//  * ITS-90 type K, T(E) over 0..500 degC from the NIST reference function.
#define BOOST_TEST_MODULE thermometry
#include <fmt/format.h>

#include <algorithm>
#include <boost/test/unit_test.hpp>
#include <cmath>
#include <nlohmann/json.hpp>
#include <sstream>

#include "ridgecal/as_found.hpp"
#include "ridgecal/assessment.hpp"
#include "ridgecal/atomic_file.hpp"
#include "ridgecal/calibration.hpp"
#include "ridgecal/diagnostics.hpp"
#include "test_support.hpp"

using namespace ridgecal;

namespace {

// Pt100 noise-free: max |fitted T(R) - T| over 0..400 degC. Measured 4.83e-8
// degC (default selection: degree 7, lambda 2.2e-11); the limit leaves a
// margin of 10x for changes of solver or selection. (The original acceptance
// criterion, 0.005 degC, was 1e5 times the measured error and would have let
// several digits go unnoticed.)
constexpr double kPt100NoiseFreeMaxError = 5e-7;  // degC
constexpr double kPt100ReferenceNoiseSd = 0.01;   // degC, noise added to the reference
// Coverage of U(x) (k = 2) on fresh points, 20 seeds x 100 points: measured
// 95.9 % (worst seed 89 %). k = 2 aims at about 95 %. Two-sided: the lower
// bound (90 %, about 13 binomial SDs of 0.44 % below the measured value)
// catches a U that is too small, the upper bound (98.5 %, 6 SDs above)
// catches an inflated one: U computed with k = 2.5 instead of 2 covers about
// 98.8 % of normal errors.
constexpr double kRequiredCoverage = 0.90;
constexpr double kMaxCoverage = 0.985;
constexpr int kCoverageSeeds = 20;
// NIST's stated error band of its own type K inverse polynomial over 0..500 degC
// is -0.05..+0.04 degC (tests/data/thermometry/its90_thermocouple_KJT.json);
// an external criterion, kept. Measured: 0.0137 degC (margin 3.6x).
constexpr double kTypeKMaxError = 0.05;  // degC
// Agreement of our evaluation of the reference equations (double coefficients)
// with the 9-decimal tables computed in 40-digit arithmetic (README): the
// tables' rounding (5e-10) plus a margin; 1e-8 mV is 0.25 mK for type K.
// Measured: 5.7e-14 ohm (Pt100) and 2.0e-9 mV (type K): the limit is set by
// the tables' rounding, not by our evaluation.
constexpr double kTableAgreementOhm = 1e-8;
constexpr double kTableAgreementMv = 1e-8;

const std::string kDir = RIDGECAL_TEST_DATA_DIR "/thermometry/";

struct Cvd {
  double r0, a, b, c;
  double resistance(double t) const {  // IEC 60751, both ranges
    return t >= 0 ? r0 * (1 + a * t + b * t * t)
                  : r0 * (1 + a * t + b * t * t + c * (t - 100) * t * t * t);
  }
};

Cvd load_cvd() {
  const auto j = nlohmann::json::parse(read_file_bytes(kDir + "iec60751_pt100.json"));
  const auto& k = j["constants"];
  return {k["R0_ohm"].get<double>(), k["A"].get<double>(), k["B"].get<double>(),
          k["C"].get<double>()};
}

struct TypeK {
  std::vector<double> c;  // 0..1372 degC range
  double a0, a1, a2;
  double emf(double t) const {
    long double e = 0;
    for (std::size_t i = c.size(); i-- > 0;) e = e * t + c[i];
    return static_cast<double>(e + a0 * std::exp(a1 * (t - a2) * (t - a2)));
  }
};

TypeK load_type_k() {
  const auto j = nlohmann::json::parse(read_file_bytes(kDir + "its90_thermocouple_KJT.json"));
  const auto& d = j["types"]["K"]["direct_T_to_E"];
  TypeK k;
  for (const auto& r : d["ranges"])
    if (r["t_min_C"].get<double>() == 0.0) k.c = r["coefficients"].get<std::vector<double>>();
  const auto& x = d["exponential_term"];
  k.a0 = x["a0"].get<double>();
  k.a1 = x["a1"].get<double>();
  k.a2 = x["a2"].get<double>();
  return k;
}

// Rows of a two-column numeric CSV (header skipped).
std::vector<std::pair<double, double>> table(const std::string& file) {
  std::istringstream in(read_file_bytes(kDir + file));
  std::string line;
  std::getline(in, line);
  std::vector<std::pair<double, double>> rows;
  while (std::getline(in, line)) {
    const auto comma = line.find(',');
    const auto comma2 = line.find(',', comma + 1);
    rows.emplace_back(std::stod(line.substr(0, comma)),
                      std::stod(line.substr(comma + 1, comma2 - comma - 1)));
  }
  return rows;
}

Dataset pt100_run(const Cvd& cvd, double step, int repeats, double noise, std::uint64_t seed) {
  test::Gauss g(seed);
  Dataset ds;
  ds.file = "pt100.csv";
  std::size_t line = 2;
  for (double t = 0; t <= 400 + 1e-9; t += step)
    for (int r = 0; r < repeats; ++r) {
      Observation ob;
      ob.reading = cvd.resistance(t);
      ob.reference = t + noise * g.next();
      ob.setpoint = fmt::format("{:g}", t);
      ob.line = line++;
      ds.rows.push_back(ob);
    }
  return ds;
}

}  // namespace

BOOST_AUTO_TEST_CASE(reference_equations_match_the_computed_tables) {
  const Cvd cvd = load_cvd();
  double worst = 0;
  for (const auto& [t, r] : table("pt100_resistance_10C.csv"))
    worst = std::max(worst, std::fabs(cvd.resistance(t) - r));
  BOOST_TEST_MESSAGE(fmt::format("Pt100: max |R_ours - R_table| = {:.2e} ohm", worst));
  BOOST_TEST(worst <= kTableAgreementOhm);
  const TypeK k = load_type_k();
  worst = 0;
  for (const auto& [t, e] : table("typeK_emf_10C.csv"))
    if (t >= 0 && t <= 500) worst = std::max(worst, std::fabs(k.emf(t) - e));
  BOOST_TEST_MESSAGE(fmt::format("type K 0..500 degC: max |E_ours - E_table| = {:.2e} mV", worst));
  BOOST_TEST(worst <= kTableAgreementMv);
}

BOOST_AUTO_TEST_CASE(pt100_noise_free_fit_reproduces_the_equation) {
  const Cvd cvd = load_cvd();
  const Dataset ds = pt100_run(cvd, 10.0, 1, 0.0, 1);
  const FitOutcome fit = fit_calibration(ds, FitOptions{});
  BOOST_REQUIRE(fit.status.ok);
  double worst = 0;
  for (double t = 0; t <= 400; t += 0.1)
    worst = std::max(worst, std::fabs(fit.calibration.model.eval(cvd.resistance(t)) - t));
  BOOST_TEST_MESSAGE(fmt::format(
      "Pt100 noise-free: degree {}, lambda {:g}, max |T_fit - T| over 0..400 degC = {:.2e} degC",
      fit.calibration.model.reading_degree(), fit.calibration.lambda, worst));
  BOOST_TEST(worst <= kPt100NoiseFreeMaxError);
}

BOOST_AUTO_TEST_CASE(pt100_expanded_uncertainty_covers_fresh_points) {
  const Cvd cvd = load_cvd();
  std::size_t covered = 0, total = 0;
  double worst_seed = 1.0;
  for (int seed = 1; seed <= kCoverageSeeds; ++seed) {
    const Dataset ds =
        pt100_run(cvd, 10.0, 2, kPt100ReferenceNoiseSd, static_cast<std::uint64_t>(seed));
    FitOptions fo;
    fo.split.seed = static_cast<std::uint64_t>(seed);
    const FitOutcome fit = fit_calibration(ds, fo);
    BOOST_REQUIRE(fit.status.ok);
    const UncertaintyBudget u = evaluate_uncertainty(fit.calibration, UncertaintyOptions{});
    // Fresh points: new temperatures, new reference noise (a different stream).
    test::Gauss g(1000 + static_cast<std::uint64_t>(seed));
    SplitRng pick(5000 + static_cast<std::uint64_t>(seed));
    std::size_t c = 0;
    const int fresh = 100;
    for (int i = 0; i < fresh; ++i) {
      const double t = 400.0 * static_cast<double>(pick.below(1000001)) / 1e6;
      const double reading = cvd.resistance(t);
      const double reference = t + kPt100ReferenceNoiseSd * g.next();
      if (std::fabs(fit.calibration.model.eval(reading) - reference) <= u.expanded_at(reading)) ++c;
    }
    covered += c;
    total += fresh;
    worst_seed = std::min(worst_seed, static_cast<double>(c) / fresh);
  }
  const double coverage = static_cast<double>(covered) / static_cast<double>(total);
  BOOST_TEST_MESSAGE(fmt::format(
      "Pt100 with {} degC reference noise: U(x) (k=2) covers {:.1f} % of {} fresh points "
      "over {} seeds (worst seed {:.0f} %)",
      kPt100ReferenceNoiseSd, 100 * coverage, total, kCoverageSeeds, 100 * worst_seed));
  BOOST_TEST(coverage >= kRequiredCoverage);
  BOOST_TEST(coverage <= kMaxCoverage, "U(x) covers "
                                           << coverage << " of the fresh errors: more than "
                                           << kMaxCoverage << ", the band looks inflated");
}

BOOST_AUTO_TEST_CASE(pt100_class_limits_judged_exactly) {
  const auto j = nlohmann::json::parse(read_file_bytes(kDir + "iec60751_pt100.json"));
  const auto& ex = j["tolerance_classes"]["examples_degC_computed"];
  for (const auto& [name, preset] :
       {std::pair{"A", TolerancePreset::Iec60751A}, std::pair{"B", TolerancePreset::Iec60751B}}) {
    const ToleranceSpec tol = preset_tolerance(preset);
    const auto& cls = j["tolerance_classes"][name];
    BOOST_TEST(tol.offset == cls["a"].get<double>());
    BOOST_TEST(tol.proportional == cls["b"].get<double>());
    for (const auto& [t_text, expected] : ex[name].items()) {
      const double t = std::stod(t_text);
      const double limit = tol.limit(t);
      BOOST_TEST(std::fabs(limit - expected.get<double>()) < 1e-12, name << " at " << t);
      // On the limit conforms, just beyond it does not, on both sides.
      const std::vector<PointToJudge> pts{{1, "s", t, limit, 0.0},
                                          {2, "s", t, -limit, 0.0},
                                          {3, "s", t, std::nextafter(limit, 1e9), 0.0},
                                          {4, "s", t, -std::nextafter(limit, 1e9), 0.0}};
      const Decision d = judge(pts, tol, DecisionRule::SimpleAcceptance);
      BOOST_TEST(d.points[0].pass);
      BOOST_TEST(d.points[1].pass);
      BOOST_TEST(!d.points[2].pass);
      BOOST_TEST(!d.points[3].pass);
      BOOST_TEST(to_string(d.verdict) == "FAIL");
    }
  }
}

BOOST_AUTO_TEST_CASE(pt100_as_found_at_class_a_limit) {
  // A Pt100 calibrated noise-free, then found shifted by 99 % and 101 % of the
  // class A limit: the as-found check passes the first and fails the second.
  const Cvd cvd = load_cvd();
  const FitOutcome fit = fit_calibration(pt100_run(cvd, 10.0, 1, 0.0, 1), FitOptions{});
  BOOST_REQUIRE(fit.status.ok);
  CheckedRecord rec;
  rec.record.calibration = fit.calibration;
  rec.integrity_ok = true;
  const ToleranceSpec a = preset_tolerance(TolerancePreset::Iec60751A);
  for (const double share : {0.99, 1.01}) {
    Dataset found;
    found.file = "found.csv";
    std::size_t line = 2;
    for (double t = 5; t <= 395; t += 30) {
      Observation ob;
      ob.reference = t;
      ob.reading =
          cvd.resistance(t + share * a.limit(t));  // the sensor reads high by share * limit
      ob.setpoint = fmt::format("{:g}", t);
      ob.line = line++;
      found.rows.push_back(ob);
    }
    AsFoundOptions opt;
    opt.tolerance = a;
    const AsFoundResult r = evaluate_as_found(rec, found, opt);
    BOOST_REQUIRE(r.decision.has_value());
    BOOST_TEST(to_string(r.decision->verdict) == (share < 1 ? "PASS" : "FAIL"), "share " << share);
    BOOST_TEST(r.decision->sets[0].failed == (share < 1 ? 0u : found.rows.size()));
  }
}

BOOST_AUTO_TEST_CASE(type_k_inverse_over_0_to_500) {
  const TypeK k = load_type_k();
  Dataset ds;
  ds.file = "typeK.csv";
  std::size_t line = 2;
  for (int t = 0; t <= 500; t += 5) {
    Observation ob;
    ob.reading = k.emf(t);
    ob.reference = t;
    ob.setpoint = std::to_string(t);
    ob.line = line++;
    ds.rows.push_back(ob);
  }
  FitOptions fo;
  fo.degrees.clear();
  for (int d = 1; d <= 12; ++d) fo.degrees.push_back(d);
  const FitOutcome fit = fit_calibration(ds, fo);
  BOOST_REQUIRE(fit.status.ok);
  double worst = 0;
  for (double t = 0; t <= 500; t += 0.05)
    worst = std::max(worst, std::fabs(fit.calibration.model.eval(k.emf(t)) - t));
  BOOST_TEST_MESSAGE(
      fmt::format("type K T(E) 0..500 degC: degree {}, lambda {:g}, max error {:.4f} degC (NIST "
                  "inverse band -0.05..0.04)",
                  fit.calibration.model.reading_degree(), fit.calibration.lambda, worst));
  BOOST_TEST(worst <= kTypeKMaxError);

  // The default degrees (1..7) are not enough here (max error about 0.16 degC);
  // the fit then says so with a degree-at-grid-edge warning.
  const FitOutcome narrow = fit_calibration(ds, FitOptions{});
  BOOST_REQUIRE(narrow.status.ok);
  double worst_narrow = 0;
  for (double t = 0; t <= 500; t += 0.05)
    worst_narrow = std::max(worst_narrow, std::fabs(narrow.calibration.model.eval(k.emf(t)) - t));
  BOOST_TEST_MESSAGE(
      fmt::format("type K with the default degrees 1..7: degree {}, max error {:.3f} degC",
                  narrow.calibration.model.reading_degree(), worst_narrow));
  const auto edge = check_grid_edges(narrow.calibration);
  BOOST_TEST((worst_narrow <= kTypeKMaxError ||
              std::any_of(edge.begin(), edge.end(), [](const Warning& w) {
                return w.code == DiagnosticCode::DegreeAtGridEdge;
              })));
}
