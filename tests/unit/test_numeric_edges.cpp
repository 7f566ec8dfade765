// Numeric edges of the fit: extreme magnitudes, readings that differ only in
// the last digits, constant columns, duplicated rows, too few setpoints, and
// non-finite values. Each gives a correct result or a failed Status with a
// message; a successful fit never holds a non-finite coefficient or prediction.
#define BOOST_TEST_MODULE numeric_edges
#include <boost/test/unit_test.hpp>
#include <cmath>
#include <limits>

#include "ridgecal/calibration.hpp"
#include "ridgecal/calibration_csv.hpp"
#include "ridgecal/errors.hpp"
#include "test_support.hpp"

using namespace ridgecal;

namespace {
// A quadratic sensor over 12 setpoints, 3 repeats, small noise.
Dataset base_run() {
  return test::synthetic_run([](double x) { return 3.0 + 0.7 * x - 0.02 * x * x; }, 1.0, 20.0, 12,
                             3, 0.01, 11);
}

Dataset scaled(Dataset ds, int reading_exp, int reference_exp) {
  for (Observation& ob : ds.rows) {
    ob.reading = std::ldexp(ob.reading, reading_exp);
    ob.reference = std::ldexp(ob.reference, reference_exp);
  }
  return ds;
}

void require_finite(const FitOutcome& f) {
  BOOST_REQUIRE_MESSAGE(f.status.ok, f.status.message);
  for (double c : f.calibration.model.coefficients) BOOST_TEST(std::isfinite(c));
  for (const PointResult& p : f.calibration.points) BOOST_TEST(std::isfinite(p.predicted));
}

Dataset rows(std::initializer_list<std::pair<double, double>> xy) {
  Dataset ds;
  ds.file = "edge.csv";
  std::size_t line = 2;
  for (const auto& [x, y] : xy) {
    Observation ob;
    ob.reading = x;
    ob.reference = y;
    ob.setpoint = "P" + std::to_string(line);  // every row its own setpoint
    ob.line = line++;
    ds.rows.push_back(ob);
  }
  return ds;
}

FitOptions fixed(int degree, double lambda) {
  FitOptions o;
  o.fixed_degree = degree;
  o.fixed_lambda = lambda;
  return o;
}
}  // namespace

// Scaling readings and references by powers of two is exact in floating point,
// so a correct fit of the scaled run is the scaled fit of the run, bit for bit.
// Before the references were rescaled internally, squared errors near 1e300
// overflowed (every CV score inf) and near 1e-300 underflowed (every CV score
// 0), and the selection picked a needlessly shrunk model.
BOOST_AUTO_TEST_CASE(huge_and_tiny_magnitudes_fit_like_moderate_ones) {
  const Dataset base = base_run();
  const FitOutcome ref = fit_calibration(base, FitOptions{});
  require_finite(ref);
  const std::pair<int, int> exps[] = {{0, 990},  {0, -990},   {990, 0},
                                      {-985, 0}, {985, -985}, {-985, 990}};
  for (const auto& [ex, ey] : exps) {
    const Dataset ds = scaled(base, ex, ey);
    const FitOutcome f = fit_calibration(ds, FitOptions{});
    require_finite(f);
    BOOST_TEST_CONTEXT("reading x 2^" << ex << ", reference x 2^" << ey) {
      BOOST_TEST(f.calibration.model.reading_degree() == ref.calibration.model.reading_degree());
      BOOST_TEST(f.calibration.lambda == ref.calibration.lambda);
      BOOST_REQUIRE(f.calibration.model.coefficients.size() ==
                    ref.calibration.model.coefficients.size());
      for (std::size_t k = 0; k < f.calibration.model.coefficients.size(); ++k)
        BOOST_TEST(f.calibration.model.coefficients[k] ==
                   std::ldexp(ref.calibration.model.coefficients[k], ey));
      BOOST_TEST(f.calibration.validation.rmse == std::ldexp(ref.calibration.validation.rmse, ey),
                 boost::test_tools::tolerance(1e-12));
    }
  }
}

BOOST_AUTO_TEST_CASE(the_documented_extremes_1e300_and_1e_300_are_accepted) {
  // Decimal 1e300 and 1e-300 themselves (not powers of two): the fit succeeds,
  // and a straight line through exact data is recovered to rounding.
  Dataset ds =
      rows({{1e-300, 2e299}, {2e-300, 4e299}, {3e-300, 6e299}, {4e-300, 8e299}, {5e-300, 1e300}});
  const FitOutcome f = fit_calibration(ds, fixed(1, 0.0));
  require_finite(f);
  for (const PointResult& p : f.calibration.points)
    BOOST_TEST(p.predicted == p.reference, boost::test_tools::tolerance(1e-12));
}

BOOST_AUTO_TEST_CASE(magnitudes_outside_the_range_fail_clearly) {
  for (double bad : {1e301, -1e301, 1e-301, 5e-324, std::numeric_limits<double>::quiet_NaN(),
                     std::numeric_limits<double>::infinity()}) {
    Dataset ds = rows({{1, 1}, {2, 2}, {3, bad}, {4, 4}});
    const FitOutcome f = fit_calibration(ds, fixed(1, 0.0));
    BOOST_TEST(!f.status.ok, "accepted " << bad);
    BOOST_TEST(f.status.message.find("line 4") != std::string::npos, f.status.message);
    ds = rows({{1, 1}, {bad, 2}, {3, 3}, {4, 4}});
    BOOST_TEST(!fit_calibration(ds, fixed(1, 0.0)).status.ok, "accepted reading " << bad);
  }
  // 0 and negative values inside the range are fine.
  require_finite(fit_calibration(rows({{0, -1e300}, {1, 0}, {2, 1e300}}), fixed(1, 0.0)));
}

BOOST_AUTO_TEST_CASE(readings_that_differ_only_in_the_last_digits) {
  // Readings one ulp apart: 1, 1+eps, ..., 1+9 eps; references 10..19. The
  // mapping to t is exact, so a line fits the data to rounding.
  const double eps = std::numeric_limits<double>::epsilon();
  Dataset ds;
  for (int i = 0; i < 10; ++i) {
    Observation ob;
    ob.reading = 1.0 + i * eps;
    ob.reference = 10.0 + i;
    ob.setpoint = "S" + std::to_string(i);
    ob.line = static_cast<std::size_t>(i + 2);
    ds.rows.push_back(ob);
  }
  FitOptions o;
  o.degrees = {1, 2};
  const FitOutcome f = fit_calibration(ds, o);
  require_finite(f);
  for (const PointResult& p : f.calibration.points)
    BOOST_TEST(p.predicted == p.reference, boost::test_tools::tolerance(1e-9));
  // References differing in the last digits only: the fit follows them.
  Dataset r = ds;
  for (std::size_t i = 0; i < r.rows.size(); ++i) {
    r.rows[i].reading = static_cast<double>(i);
    r.rows[i].reference = 1.0 + static_cast<double>(i) * eps;
  }
  const FitOutcome g = fit_calibration(r, fixed(1, 0.0));
  require_finite(g);
  for (const PointResult& p : g.calibration.points)
    BOOST_TEST(std::fabs(p.predicted - p.reference) <= 4 * eps);
}

BOOST_AUTO_TEST_CASE(constant_reference_gives_a_flat_curve) {
  const FitOutcome f =
      fit_calibration(rows({{1, 5}, {2, 5}, {3, 5}, {4, 5}, {5, 5}, {6, 5}}), FitOptions{});
  require_finite(f);
  for (const PointResult& p : f.calibration.points) BOOST_TEST(p.predicted == 5.0);
  BOOST_TEST(std::isnan(f.calibration.training.r2));  // undefined: written as null, printed as n/a
  BOOST_TEST(f.calibration.training.brief().find("nan") == std::string::npos);
}

BOOST_AUTO_TEST_CASE(constant_readings_fail) {
  const FitOutcome f = fit_calibration(rows({{3, 1}, {3, 2}, {3, 3}}), fixed(1, 0.0));
  BOOST_TEST(!f.status.ok);
  BOOST_TEST(f.status.message.find("readings are equal") != std::string::npos);
}

BOOST_AUTO_TEST_CASE(duplicated_rows_change_nothing) {
  // The data term is a mean and setpoints are grouped, so every row twice is
  // the same problem: same choice, same curve (to rounding).
  const Dataset base = base_run();
  Dataset twice = base;
  for (const Observation& ob : base.rows) twice.rows.push_back(ob);
  const FitOutcome a = fit_calibration(base, FitOptions{});
  const FitOutcome b = fit_calibration(twice, FitOptions{});
  require_finite(a);
  require_finite(b);
  BOOST_TEST(a.calibration.model.reading_degree() == b.calibration.model.reading_degree());
  BOOST_TEST(a.calibration.lambda == b.calibration.lambda);
  for (double x : {1.0, 5.5, 12.0, 20.0})
    BOOST_TEST(a.calibration.model.eval(x) == b.calibration.model.eval(x),
               boost::test_tools::tolerance(1e-9));
}

BOOST_AUTO_TEST_CASE(a_single_setpoint_fails) {
  Dataset ds = rows({{1, 10}, {1.1, 10.1}, {0.9, 9.9}});
  for (Observation& ob : ds.rows) ob.setpoint = "A";  // all rows at one setpoint
  const FitOutcome f = fit_calibration(ds, fixed(1, 0.0));
  BOOST_TEST(!f.status.ok);
  BOOST_TEST(f.status.message.find("only 1 distinct setpoint") != std::string::npos,
             f.status.message);
}

BOOST_AUTO_TEST_CASE(more_coefficients_than_setpoints_fail) {
  const Dataset ds = rows({{1, 1}, {2, 4}, {3, 9}, {4, 16}});
  for (double lambda : {0.0, 1e-3}) {
    const FitOutcome f = fit_calibration(ds, fixed(5, lambda));
    BOOST_TEST(!f.status.ok);
    BOOST_TEST(f.status.message.find("setpoint") != std::string::npos, f.status.message);
  }
  FitOptions o;
  o.degrees = {5, 6, 7};
  BOOST_TEST(!fit_calibration(ds, o).status.ok);
  // As many coefficients as setpoints is an exact interpolation, and fine.
  require_finite(fit_calibration(ds, fixed(3, 0.0)));
}

BOOST_AUTO_TEST_CASE(through_origin_far_from_zero_fails_instead_of_overflowing) {
  // Readings 9e299 (1 + i 1e-14), i = 0..12: reading 0 is ~1.7e13 half-widths
  // away, and T_12 there is ~1e162: the design would be meaningless.
  Dataset ds;
  for (int i = 0; i <= 12; ++i) {
    Observation ob;
    ob.reading = 9e299 * (1.0 + i * 1e-14);
    ob.reference = i + 1.0;
    ob.setpoint = "S" + std::to_string(i);
    ob.line = static_cast<std::size_t>(i + 2);
    ds.rows.push_back(ob);
  }
  FitOptions o = fixed(12, 0.0);
  o.intercept = false;
  const FitOutcome f = fit_calibration(ds, o);
  BOOST_TEST(!f.status.ok);
  BOOST_TEST(f.status.message.find("through the origin") != std::string::npos, f.status.message);
}

BOOST_AUTO_TEST_CASE(csv_refuses_magnitudes_outside_the_range_with_the_line) {
  for (const char* cell : {"1e301", "-2e305", "1e-301", "4.9e-324", "1e-310"}) {
    try {
      parse_calibration_csv(std::string("reading,reference\n1,2\n2,") + cell + "\n", "m.csv",
                            CsvOptions{});
      BOOST_ERROR("accepted " << cell);
    } catch (const InputError& e) {
      BOOST_TEST(e.line() == 3u);
      BOOST_TEST(std::string(e.what()).find("outside the supported range") != std::string::npos,
                 e.what());
    }
  }
  const Dataset ok =
      parse_calibration_csv("reading,reference\n1e-300,-1e300\n0,0\n", "m.csv", CsvOptions{});
  BOOST_TEST(ok.rows.size() == 2u);
}
