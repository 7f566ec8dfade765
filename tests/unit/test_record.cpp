#define BOOST_TEST_MODULE record
#include <boost/test/unit_test.hpp>
BOOST_AUTO_TEST_CASE(placeholder_record) { BOOST_TEST(true); }
