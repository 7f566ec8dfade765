#define BOOST_TEST_MODULE poly_model
#include <boost/test/unit_test.hpp>
BOOST_AUTO_TEST_CASE(placeholder_poly_model) { BOOST_TEST(true); }
