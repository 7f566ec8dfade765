#include <boost/test/unit_test.hpp>

#include "ridgecal/report/html_escape.hpp"

using namespace ridgecal::report;

BOOST_AUTO_TEST_SUITE(html_escape_suite)

BOOST_AUTO_TEST_CASE(markup_characters_become_references) {
  BOOST_TEST(html_escape("<script>alert('x')</script>") ==
             "&lt;script&gt;alert(&#39;x&#39;)&lt;/script&gt;");
  BOOST_TEST(html_escape("a & \"b\"") == "a &amp; &quot;b&quot;");
  BOOST_TEST(html_escape("&amp;") == "&amp;amp;");  // already-escaped text is shown as typed
}

BOOST_AUTO_TEST_CASE(controls_become_visible_pictures) {
  BOOST_TEST(html_escape("a\nb") == "a\u21B5b");
  BOOST_TEST(html_escape("a\tb\r") == "a\u21E5b[U+000D]");
  BOOST_TEST(html_escape(std::string("x\0y", 3)) == "x[U+0000]y");
  BOOST_TEST(html_escape("\x7F") == "[U+007F]");
}

BOOST_AUTO_TEST_CASE(non_ascii_is_kept_and_invalid_utf8_replaced) {
  BOOST_TEST(html_escape("°C Ω µ – 温度") == "°C Ω µ – 温度");
  BOOST_TEST(html_escape("a\xFF"
                         "b") == "a\uFFFDb");
  BOOST_TEST(html_escape("\xC3") == "\uFFFD");                      // truncated sequence
  BOOST_TEST(html_escape("\xC0\xAF") == "\uFFFD\uFFFD");            // overlong '/'
  BOOST_TEST(html_escape("\xED\xA0\x80") == "\uFFFD\uFFFD\uFFFD");  // surrogate
  BOOST_TEST(html_escape("\xC2\x85") == "\uFFFD");                  // C1 control
  BOOST_TEST(is_valid_utf8(html_escape("\xFE\xFF mixed \xE2\x82")));
  BOOST_TEST(!is_valid_utf8("\xFF"));
}

BOOST_AUTO_TEST_SUITE_END()
