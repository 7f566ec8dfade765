// External check of the n-input degree-1 design (tests/support/linear_inputs_fit.hpp) on NIST
// StRD Longley: 6 predictors, degree 1, no penalty, a notoriously
// ill-conditioned design. Data and certified values: tests/data/nist-strd
// (see its README for the source). Independent cross-check: GSL's
// gsl_multifit_linear (Debian package libgsl-dev) on the raw columns.
#define BOOST_TEST_MODULE longley
#include <fmt/format.h>
#include <gsl/gsl_errno.h>
#include <gsl/gsl_multifit.h>

#include <boost/test/unit_test.hpp>
#include <cmath>
#include <nlohmann/json.hpp>

#include "../support/linear_inputs_fit.hpp"
#include "ridgecal/atomic_file.hpp"
#include "ridgecal/calibration_csv.hpp"
#include "ridgecal/extended_fit.hpp"

using namespace ridgecal;

namespace {

// Required accuracy: the LRE measured on this machine (x86-64, gcc 12;
// printed by this test with --log_level=message) minus a stated margin of
// 1.5 digits (a 30-fold larger error), never below issue 7's criterion 9.
// Measured: min coefficient LRE 13.3, residual SD 15.0, R^2 15.0 (the cap).
constexpr double kLreMargin = 1.5;
constexpr double kRequiredLreFloor = 9.0;
constexpr double kMeasuredCoefLre = 13.3;
constexpr double kMeasuredSdLre = 15.0;
constexpr double kMeasuredR2Lre = 15.0;
constexpr double kRequiredCoefLre = kMeasuredCoefLre - kLreMargin;  // 11.8
constexpr double kRequiredSdLre = kMeasuredSdLre - kLreMargin;      // 13.5
constexpr double kRequiredR2Lre = kMeasuredR2Lre - kLreMargin;      // 13.5
static_assert(kRequiredCoefLre >= kRequiredLreFloor && kRequiredSdLre >= kRequiredLreFloor,
              "floor");
constexpr double kCertifiedDigits = 15.0;
// GSL is a second opinion, not the reference: its answer must agree with the
// certified values to at least this LRE (measured: 11.6 with GSL 2.7's SVD
// with column balancing; margin 1.5 digits), and our predictions must agree
// with GSL's to this relative level (measured: 4.1e-14; margin about 25x;
// predictions are well conditioned even where the coefficients are not).
constexpr double kGslMinLre = 11.6 - kLreMargin;
constexpr double kPredictionAgreement = 1e-12;

double lre(double est, double cert) {
  if (est == cert) return kCertifiedDigits;
  const double rel = cert != 0.0 ? std::fabs(est - cert) / std::fabs(cert) : std::fabs(est);
  return std::min(kCertifiedDigits, -std::log10(rel));
}

struct Longley {
  Eigen::MatrixXd X;
  Eigen::VectorXd y;
  nlohmann::json cert;
};

Longley load() {
  const std::string dir = RIDGECAL_TEST_DATA_DIR "/nist-strd/";
  Longley L;
  L.cert = nlohmann::json::parse(read_file_bytes(dir + "longley.certified.json"));
  // The CSV reader takes one reading column at a time: read the six columns.
  std::vector<Dataset> cols;
  for (int j = 1; j <= 6; ++j) {
    CsvOptions o;
    o.reading_column = "x" + std::to_string(j);
    o.reference_column = "y";
    cols.push_back(read_calibration_csv(dir + "longley.csv", o));
  }
  const Eigen::Index n = static_cast<Eigen::Index>(cols[0].rows.size());
  L.X.resize(n, 6);
  L.y.resize(n);
  for (Eigen::Index i = 0; i < n; ++i) {
    L.y(i) = cols[0].rows[static_cast<std::size_t>(i)].reference;
    for (int j = 0; j < 6; ++j)
      L.X(i, j) = cols[static_cast<std::size_t>(j)].rows[static_cast<std::size_t>(i)].reading;
  }
  return L;
}

// GSL on the raw design [1, x1..x6].
std::vector<double> gsl_fit(const Longley& L) {
  const std::size_t n = static_cast<std::size_t>(L.X.rows()), p = 7;
  gsl_matrix* X = gsl_matrix_alloc(n, p);
  gsl_vector* y = gsl_vector_alloc(n);
  gsl_vector* c = gsl_vector_alloc(p);
  gsl_matrix* cov = gsl_matrix_alloc(p, p);
  for (std::size_t i = 0; i < n; ++i) {
    gsl_matrix_set(X, i, 0, 1.0);
    for (std::size_t j = 1; j < p; ++j)
      gsl_matrix_set(X, i, j, L.X(static_cast<Eigen::Index>(i), static_cast<Eigen::Index>(j - 1)));
    gsl_vector_set(y, i, L.y(static_cast<Eigen::Index>(i)));
  }
  gsl_multifit_linear_workspace* w = gsl_multifit_linear_alloc(n, p);
  double chisq = 0;
  const int rc = gsl_multifit_linear(X, y, c, cov, &chisq, w);
  BOOST_REQUIRE_EQUAL(rc, GSL_SUCCESS);
  std::vector<double> out(p);
  for (std::size_t j = 0; j < p; ++j) out[j] = gsl_vector_get(c, j);
  gsl_multifit_linear_free(w);
  gsl_matrix_free(cov);
  gsl_matrix_free(X);
  gsl_vector_free(y);
  gsl_vector_free(c);
  return out;
}

}  // namespace

BOOST_AUTO_TEST_CASE(longley_certified_coefficients) {
  const Longley L = load();
  const LinearInputsFit f = fit_linear_inputs(L.X, L.y);
  BOOST_REQUIRE_MESSAGE(f.status.ok, f.status.message);
  BOOST_TEST_MESSAGE(fmt::format("Longley: condition number of the centred scaled design {:.3g}",
                                 f.condition_number));
  double min_lre = kCertifiedDigits;
  for (const auto& p : L.cert["parameters"]) {
    const std::string term = p["term"];
    const double est = term == "1" ? static_cast<double>(f.intercept)
                                   : static_cast<double>(f.slopes.at(
                                         static_cast<std::size_t>(std::stoi(term.substr(1)) - 1)));
    const double l = lre(est, p["estimate"].get<double>());
    BOOST_TEST_MESSAGE(fmt::format("Longley {}: estimate {:.15e} certified {} LRE {:.1f}",
                                   p["name"].get<std::string>(), est,
                                   p["estimate_text"].get<std::string>(), l));
    BOOST_TEST(l >= kRequiredCoefLre,
               "coefficient " << p["name"].get<std::string>() << " LRE " << l);
    min_lre = std::min(min_lre, l);
  }
  const double sd_lre = lre(f.residual_sd, L.cert["residual_std_dev"].get<double>());
  const double r2_lre = lre(f.r2, L.cert["r_squared"].get<double>());
  BOOST_TEST_MESSAGE(
      fmt::format("Longley: min coefficient LRE {:.1f}, residual SD LRE {:.1f}, R2 LRE {:.1f}",
                  min_lre, sd_lre, r2_lre));
  BOOST_TEST(sd_lre >= kRequiredSdLre);
  BOOST_TEST(r2_lre >= kRequiredR2Lre);
}

BOOST_AUTO_TEST_CASE(longley_agrees_with_gsl) {
  const Longley L = load();
  const LinearInputsFit f = fit_linear_inputs(L.X, L.y);
  BOOST_REQUIRE(f.status.ok);
  const std::vector<double> g = gsl_fit(L);
  double gsl_min_lre = kCertifiedDigits;
  std::size_t k = 0;
  for (const auto& p : L.cert["parameters"]) {
    const double l = lre(g[k++], p["estimate"].get<double>());
    gsl_min_lre = std::min(gsl_min_lre, l);
  }
  BOOST_TEST_MESSAGE(
      fmt::format("GSL gsl_multifit_linear on Longley: min coefficient LRE {:.1f}", gsl_min_lre));
  BOOST_TEST(gsl_min_lre >= kGslMinLre);
  // Fitted values at the data rows: ours against GSL's.
  double worst = 0;
  for (Eigen::Index i = 0; i < L.X.rows(); ++i) {
    long double yg = g[0];
    for (int j = 0; j < 6; ++j)
      yg += static_cast<long double>(g[static_cast<std::size_t>(j + 1)]) * L.X(i, j);
    const double ours = f.predict(L.X.row(i));
    worst = std::max(
        worst, std::fabs(ours - static_cast<double>(yg)) / std::fabs(static_cast<double>(yg)));
  }
  BOOST_TEST_MESSAGE(fmt::format(
      "Longley: largest relative difference of fitted values, ours vs GSL: {:.2e}", worst));
  BOOST_TEST(worst <= kPredictionAgreement);
}

BOOST_AUTO_TEST_CASE(a_constant_input_is_a_status) {
  Eigen::MatrixXd X(5, 2);
  X << 1, 7, 2, 7, 3, 7, 4, 7, 5, 7;
  const Eigen::VectorXd y = Eigen::VectorXd::LinSpaced(5, 0.0, 1.0);
  const LinearInputsFit f = fit_linear_inputs(X, y);
  BOOST_TEST(!f.status.ok);
  BOOST_TEST(f.status.message.find("input 2 is constant") != std::string::npos);
}
