#define BOOST_TEST_MODULE ridgecal_report
#include <boost/test/unit_test.hpp>
