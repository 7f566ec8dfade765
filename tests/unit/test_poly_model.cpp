// The polynomial model: evaluation and conversions between coefficient forms.
#define BOOST_TEST_MODULE poly_model
#include <boost/test/unit_test.hpp>
#include <cmath>

#include "ridgecal/calibration.hpp"
#include "ridgecal/model.hpp"
#include "ridgecal/poly_model.hpp"

using namespace ridgecal;

namespace {
// Conversions run in long double; 1e-12 relative to the function's size is
// ample for degree <= 7 on these ranges (about 1000x double epsilon).
constexpr double kConversionRelTol = 1e-12;
}  // namespace

BOOST_AUTO_TEST_CASE(chebyshev_rows_match_cosine_definition) {
  double row[8];
  for (double t : {-1.0, -0.3, 0.0, 0.7, 1.0}) {
    chebyshev_row(t, 7, row);
    for (int k = 0; k <= 7; ++k) BOOST_TEST(std::fabs(row[k] - std::cos(k * std::acos(t))) < 1e-14);
  }
}

BOOST_AUTO_TEST_CASE(all_forms_agree) {
  PolyModel m;
  m.scaling = {2500.0, 3900.0};
  m.cheb = {-5.0, -20.0, 1.5, -0.4, 0.1, -0.02};
  const auto mono = m.monomial_in_t();
  const auto power = m.power_in_x_ld();
  for (double x = 2500.0; x <= 3900.0; x += 70.0) {
    const double p = m.eval(x);
    const double t = m.scaling.to_t(x);
    double h = 0;
    for (std::size_t k = mono.size(); k-- > 0;) h = h * t + mono[k];
    long double hp = 0;
    for (std::size_t k = power.size(); k-- > 0;) hp = hp * x + power[k];
    BOOST_TEST(std::fabs(h - p) <= kConversionRelTol * 25.0);
    BOOST_TEST(std::fabs(static_cast<double>(hp) - p) <=
               1e-9 * 25.0);  // power form: cancellation, long double
  }
}

BOOST_AUTO_TEST_CASE(derivative_matches_finite_difference) {
  PolyModel m;
  m.scaling = {0.0, 10.0};
  m.cheb = {1.0, 2.0, 0.5, 0.25};
  for (double x : {0.5, 3.0, 9.0}) {
    const double h = 1e-5;
    const double fd = (m.eval(x + h) - m.eval(x - h)) / (2 * h);
    BOOST_TEST(std::fabs(m.derivative(x) - fd) < 1e-7);
  }
}

BOOST_AUTO_TEST_CASE(scaling_maps_range_to_unit_interval) {
  const Scaling s{-5.0, 15.0};
  BOOST_TEST(s.to_t(-5.0) == -1.0);
  BOOST_TEST(s.to_t(15.0) == 1.0);
  BOOST_TEST(s.to_t(5.0) == 0.0);
  BOOST_TEST(s.contains(0.0));
  BOOST_TEST(!s.contains(15.5));
}

// One model (issue 12): the one-input polynomial is the N = 1 case of the
// general model. one_input_model() must evaluate the same curve. Both run
// Clenshaw on the same coefficients and the same scaling, so they agree to
// rounding: 1e-13 relative (measured 0 on this range) leaves a wide margin.
BOOST_AUTO_TEST_CASE(one_input_model_is_the_same_curve) {
  const PolyModel p{{2500.0, 3900.0}, {-5.0, -20.0, 1.5, -0.4, 0.1, -0.02}};
  Calibration cal;
  cal.model = one_input_model(p);
  BOOST_TEST(!is_extended(cal));
  const Model& g = cal.model;
  BOOST_TEST(g.terms.size() == p.cheb.size());
  BOOST_TEST(g.has_intercept());
  BOOST_TEST(!g.has_aux);
  BOOST_TEST(g.transforms.identity());
  for (double x = 2500.0; x <= 3900.0; x += 7.0)
    BOOST_TEST(std::fabs(g.eval(x) - p.eval(x)) <= 1e-13 * 25.0);
  // And back: the evaluation helper gives the same polynomial bit for bit.
  const PolyModel back = one_input_polynomial(g);
  BOOST_TEST(back.cheb == p.cheb);
  BOOST_TEST(back.scaling.x_min == p.scaling.x_min);
  BOOST_TEST(back.scaling.x_max == p.scaling.x_max);
}

// is_extended() is computed from the one model: each extension alone makes
// the layout extended.
BOOST_AUTO_TEST_CASE(is_extended_is_computed_from_the_model) {
  Calibration cal;
  cal.model = one_input_model(PolyModel{{0.0, 1.0}, {0.5, 1.0}});
  BOOST_TEST(!is_extended(cal));
  Calibration aux = cal;
  aux.model.has_aux = true;
  BOOST_TEST(is_extended(aux));
  Calibration power = cal;
  power.model.basis = ModelBasis::Power;
  BOOST_TEST(is_extended(power));
  Calibration ln = cal;
  ln.model.transforms.reading = ReadingTransform::Ln;
  BOOST_TEST(is_extended(ln));
}
