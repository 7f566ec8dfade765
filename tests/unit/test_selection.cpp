#define BOOST_TEST_MODULE selection
#include <boost/test/unit_test.hpp>
BOOST_AUTO_TEST_CASE(placeholder_selection) { BOOST_TEST(true); }
