#define BOOST_TEST_MODULE ridge_path
#include <boost/test/unit_test.hpp>
BOOST_AUTO_TEST_CASE(placeholder_ridge_path) { BOOST_TEST(true); }
