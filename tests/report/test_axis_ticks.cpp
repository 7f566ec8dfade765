#include <boost/test/unit_test.hpp>
#include <cmath>

#include "ridgecal/report/axis_ticks.hpp"

using namespace ridgecal::report;

BOOST_AUTO_TEST_SUITE(axis_ticks)

BOOST_AUTO_TEST_CASE(steps_are_one_two_five) {
  BOOST_TEST(nice_step(0.7) == 1.0);
  BOOST_TEST(nice_step(1.0) == 1.0);
  BOOST_TEST(nice_step(1.3) == 2.0);
  BOOST_TEST(nice_step(3.0) == 5.0);
  BOOST_TEST(nice_step(6.0) == 10.0);
  BOOST_TEST(std::fabs(nice_step(0.013) - 0.02) < 1e-15);
  BOOST_TEST(nice_step(2.0000000001) == 2.0);
}

BOOST_AUTO_TEST_CASE(linear_axis_covers_data_with_whole_steps) {
  const LinearAxis ax = linear_axis(-21.3, 163.9, 6);
  BOOST_TEST(ax.step == 50.0);
  BOOST_TEST(ax.lo == -50.0);
  BOOST_TEST(ax.hi == 200.0);
  BOOST_REQUIRE(ax.ticks.size() == 6u);
  BOOST_TEST(ax.ticks[0].label == "-50");
  BOOST_TEST(ax.ticks[1].label == "0");
  BOOST_TEST(ax.ticks[5].label == "200");
}

BOOST_AUTO_TEST_CASE(linear_labels_have_enough_decimals_and_no_negative_zero) {
  const LinearAxis ax = linear_axis(-0.13, 0.14, 6);
  BOOST_TEST(ax.step == 0.05);
  bool saw_zero = false;
  for (const Tick& t : ax.ticks) {
    BOOST_TEST(t.label != "-0.00");
    if (t.label == "0.00") saw_zero = true;
  }
  BOOST_TEST(saw_zero);
  BOOST_TEST(ax.ticks.front().label == "-0.15");
}

BOOST_AUTO_TEST_CASE(degenerate_ranges_still_draw) {
  const LinearAxis a = linear_axis(5.0, 5.0);
  BOOST_TEST(a.lo < 5.0);
  BOOST_TEST(a.hi > 5.0);
  const LinearAxis b = linear_axis(NAN, INFINITY);
  BOOST_TEST(b.ticks.size() >= 2u);
}

BOOST_AUTO_TEST_CASE(log_axis_labels_decades_with_superscripts) {
  const LogAxis ax = log_axis(1e-6, 1e-1);
  BOOST_TEST(ax.lo < 1e-6);
  BOOST_TEST(ax.hi > 1e-1);
  int labelled = 0;
  for (const Tick& t : ax.ticks)
    if (t.major && !t.label.empty()) ++labelled;
  BOOST_TEST(labelled == 6);
  BOOST_TEST(power_of_ten_label(-3) == "10\u207B\u00B3");
  BOOST_TEST(power_of_ten_label(12) == "10\u00B9\u00B2");
}

BOOST_AUTO_TEST_CASE(narrow_log_axis_labels_two_and_five) {
  const LogAxis ax = log_axis(0.011, 0.06);
  bool two = false, five = false;
  for (const Tick& t : ax.ticks) {
    if (t.label == "0.02") two = true;
    if (t.label == "0.05") five = true;
  }
  BOOST_TEST(two);
  BOOST_TEST(five);
}

BOOST_AUTO_TEST_SUITE_END()
