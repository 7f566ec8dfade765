#include <boost/test/unit_test.hpp>
#include <cmath>
#include <limits>

#include "ridgecal/report/number_format.hpp"

using namespace ridgecal::report;

BOOST_AUTO_TEST_SUITE(number_format)

BOOST_AUTO_TEST_CASE(non_finite_values_print_as_not_available) {
  const double nan = std::numeric_limits<double>::quiet_NaN();
  const double inf = std::numeric_limits<double>::infinity();
  for (double v : {nan, inf, -inf}) {
    BOOST_TEST(format_fixed(v, 3) == "n/a");
    BOOST_TEST(format_sig(v) == "n/a");
    BOOST_TEST(format_exact(v) == "n/a");
    BOOST_TEST(format_lambda(v) == "n/a");
  }
  BOOST_TEST(format_sig(std::optional<double>{}) == "n/a");
  BOOST_TEST(format_coord(nan) == "0");
}

BOOST_AUTO_TEST_CASE(fixed_and_significant) {
  BOOST_TEST(format_fixed(1.23456, 2) == "1.23");
  BOOST_TEST(format_fixed(-0.0001, 2) == "0.00");  // no "-0.00"
  BOOST_TEST(format_sig(0.0123456, 3) == "0.0123");
  BOOST_TEST(format_sig(123456.0, 4) == "123456");
  BOOST_TEST(format_sig(1.5e-7, 3) == "1.5e-07");
  BOOST_TEST(format_sig(-0.0, 3) == "0");
  BOOST_TEST(format_lambda(0.0) == "0");
  BOOST_TEST(format_lambda(1e-6) == "10\u207B\u2076");
  BOOST_TEST(format_lambda(4.1753e-5) == "4.18\u00D710\u207B\u2075");
  BOOST_TEST(format_lambda(9.9999e-5) == "10\u207B\u2074");
  BOOST_TEST(format_lambda(0.5) == "0.5");
  BOOST_TEST(format_lambda(12.0) == "12");
  BOOST_TEST(format_exact(0.1) == "0.1");
}

BOOST_AUTO_TEST_CASE(coordinates_are_short) {
  BOOST_TEST(format_coord(12.0) == "12");
  BOOST_TEST(format_coord(12.345) == "12.35");
  BOOST_TEST(format_coord(-0.001) == "0");
}

BOOST_AUTO_TEST_SUITE_END()
