#define BOOST_TEST_MODULE grouped_split
#include <boost/test/unit_test.hpp>
BOOST_AUTO_TEST_CASE(placeholder_grouped_split) { BOOST_TEST(true); }
