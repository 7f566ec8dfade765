#define BOOST_TEST_MODULE csv_reader
#include <boost/test/unit_test.hpp>
BOOST_AUTO_TEST_CASE(placeholder_csv_reader) { BOOST_TEST(true); }
