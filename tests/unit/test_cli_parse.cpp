#define BOOST_TEST_MODULE cli_parse
#include <boost/test/unit_test.hpp>
BOOST_AUTO_TEST_CASE(placeholder_cli_parse) { BOOST_TEST(true); }
