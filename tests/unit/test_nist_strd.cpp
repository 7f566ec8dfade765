// External check: NIST StRD linear least-squares problems, fitted with the
// fixed model (degree of the certified polynomial, lambda 0, no test hold-out).
// Data and certified values: tests/data/nist-strd (see its README for the source).
// Accuracy is the log relative error LRE = -log10(|est - cert| / |cert|),
// capped at the 15 certified digits.
#define BOOST_TEST_MODULE nist_strd
#include <fmt/format.h>

#include <boost/test/unit_test.hpp>
#include <cmath>
#include <nlohmann/json.hpp>

#include "ridgecal/atomic_file.hpp"
#include "ridgecal/calibration.hpp"
#include "ridgecal/calibration_csv.hpp"

using namespace ridgecal;

namespace {

// Required accuracy: the LRE measured on this machine (x86-64, gcc 12,
// RelWithDebInfo; printed by this test with --log_level=message) minus a
// stated margin. The margin, 1.5 digits (a 30-fold larger error), absorbs
// changes of solver, compiler or evaluation order; losing more than that is
// a regression to look at. LRE is capped at the 15 certified digits.
// The floor kRequiredLreFloor (9, 7 for Filip's coefficients) was the
// original acceptance criterion and is kept as a lower limit of the limits.
constexpr double kLreMargin = 1.5;
constexpr double kRequiredLreFloor = 9.0;
constexpr double kRequiredLreFloorFilip = 7.0;

struct MeasuredLre {
  double coef, sd, r2;  // min coefficient LRE, residual SD LRE, R^2 LRE
};
// Measured (see above). R^2 reaches the cap on every set.
constexpr MeasuredLre kNorris{13.4, 14.9, 15.0};
constexpr MeasuredLre kPontius{13.4, 13.5, 15.0};
constexpr MeasuredLre kNoInt1{14.8, 14.9, 15.0};
constexpr MeasuredLre kNoInt2{15.0, 15.0, 15.0};
constexpr MeasuredLre kFilip{14.0, 14.8, 15.0};

double required(double measured, double floor) {
  return std::max(floor, measured - kLreMargin);
}
constexpr double kCertifiedDigits = 15.0;

double lre(double est, double cert) {
  if (est == cert) return kCertifiedDigits;
  const double rel = cert != 0.0 ? std::fabs(est - cert) / std::fabs(cert) : std::fabs(est);
  return std::min(kCertifiedDigits, -std::log10(rel));
}

struct NistResult {
  double min_coef_lre = kCertifiedDigits;
  double sd_lre = 0, r2_lre = 0;
};

NistResult check(const std::string& name) {
  const std::string dir = RIDGECAL_TEST_DATA_DIR "/nist-strd/";
  const auto cert = nlohmann::json::parse(read_file_bytes(dir + name + ".certified.json"));
  CsvOptions csv;
  csv.reading_column = "x";
  csv.reference_column = "y";
  const Dataset ds = read_calibration_csv(dir + name + ".csv", csv);
  FitOptions opt;
  opt.fixed_degree = cert["polynomial_degree"].get<int>();
  opt.fixed_lambda = 0.0;
  opt.split.test_fraction = 0.0;
  opt.intercept = cert["intercept"].get<bool>();
  BOOST_REQUIRE(opt.validate().empty());
  const FitOutcome fit = fit_calibration(ds, opt);
  BOOST_REQUIRE_MESSAGE(fit.status.ok, fit.status.message);
  const Calibration& cal = fit.calibration;
  const std::vector<long double> a = one_input_polynomial(cal.model).power_in_x_ld();
  NistResult res;
  for (const auto& p : cert["parameters"]) {
    const std::string term = p["term"];
    const int power = term == "1" ? 0 : term == "x" ? 1 : std::stoi(term.substr(2));
    const double est = static_cast<double>(a.at(static_cast<std::size_t>(power)));
    const double l = lre(est, p["estimate"].get<double>());
    BOOST_TEST_MESSAGE(fmt::format("{} {}: estimate {:.15e} certified {} LRE {:.1f}", name,
                                   p["name"].get<std::string>(), est,
                                   p["estimate_text"].get<std::string>(), l));
    res.min_coef_lre = std::min(res.min_coef_lre, l);
  }
  if (!opt.intercept)
    BOOST_CHECK_SMALL(static_cast<double>(a[0]), 1e-9 * std::fabs(static_cast<double>(a[1])));
  res.sd_lre = lre(cal.training.residual_sd, cert["residual_std_dev"].get<double>());
  res.r2_lre = lre(cal.training.r2, cert["r_squared"].get<double>());
  BOOST_TEST_MESSAGE(
      fmt::format("{}: min coefficient LRE {:.1f}, residual SD LRE {:.1f}, R2 LRE {:.1f}", name,
                  res.min_coef_lre, res.sd_lre, res.r2_lre));
  return res;
}

void require_close_to_measured(const NistResult& r, const MeasuredLre& m, double coef_floor) {
  BOOST_TEST(r.min_coef_lre >= required(m.coef, coef_floor),
             "min coefficient LRE " << r.min_coef_lre << ", measured " << m.coef << " - margin");
  BOOST_TEST(r.sd_lre >= required(m.sd, kRequiredLreFloor),
             "residual SD LRE " << r.sd_lre << ", measured " << m.sd << " - margin");
  BOOST_TEST(r.r2_lre >= required(m.r2, kRequiredLreFloor),
             "R^2 LRE " << r.r2_lre << ", measured " << m.r2 << " - margin");
}

}  // namespace

BOOST_AUTO_TEST_CASE(norris) {
  require_close_to_measured(check("norris"), kNorris, kRequiredLreFloor);
}

BOOST_AUTO_TEST_CASE(pontius) {
  require_close_to_measured(check("pontius"), kPontius, kRequiredLreFloor);
}

BOOST_AUTO_TEST_CASE(noint1) {
  require_close_to_measured(check("noint1"), kNoInt1, kRequiredLreFloor);
}

BOOST_AUTO_TEST_CASE(noint2) {
  require_close_to_measured(check("noint2"), kNoInt2, kRequiredLreFloor);
}

// Filip (degree 10, higher difficulty): coefficients, residual SD and R^2.
BOOST_AUTO_TEST_CASE(filip) {
  require_close_to_measured(check("filip"), kFilip, kRequiredLreFloorFilip);
}
