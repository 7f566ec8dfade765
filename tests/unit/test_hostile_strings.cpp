// Hostile strings in records: quotes, comment terminators, markup, newlines,
// non-ASCII, invalid UTF-8 and very long strings in every free-text member.
// The JSON must round-trip them exactly (valid UTF-8) and keep its integrity
// digest valid after a write and a read.
#define BOOST_TEST_MODULE hostile_strings
#include <boost/test/unit_test.hpp>
#include <string>
#include <vector>

#include "ridgecal/record.hpp"
#include "ridgecal/record_guard.hpp"
#include "ridgecal/text_check.hpp"
#include "test_support.hpp"

using namespace ridgecal;

namespace {
const std::vector<std::string>& hostile() {
  static const std::vector<std::string> v = {
      "probe \"7\" 'single'",
      "end of comment */ int x = 1; /* again",
      "// line comment \\ backslash \\",
      "<script>alert('x')</script> & &amp; <b>bold</b>",
      "two\nlines\r\nand\ttab",
      "#define X 1\n#include <stdio.h>",
      "Temperatur-Fühler °C, 温度センサー, 🌡️",
      "\u202Eright-to-left override",
      std::string("nul\0inside", 10),
      std::string(100000, 'L') + "ong",
      "${HOME} $(rm -rf /) `id`",
      "%s %n %x",
  };
  return v;
}

CalibrationRecord record_with(const std::string& s) {
  const Dataset ds =
      test::synthetic_run([](double x) { return 2.0 + 0.5 * x; }, 0.0, 10.0, 8, 2, 0.01, 3);
  FitOptions o;
  o.degrees = {1, 2};
  const FitOutcome fit = fit_calibration(ds, o);
  BOOST_REQUIRE(fit.status.ok);
  CalibrationRecord rec;
  rec.tool_version = tool_version();
  rec.sensor = {s, s + "u1", s + "u2"};
  rec.input = {s + ".csv", ds.sha256, ds.rows.size(), CsvOptions{}};
  rec.input.columns.reading_column = s + "r";
  rec.input.columns.reference_column = s + "f";
  rec.input.columns.setpoint_column = s + "s";
  rec.calibration = fit.calibration;
  for (auto& sp : rec.calibration.setpoints) sp.id = s + sp.id;
  for (auto& p : rec.calibration.points) p.setpoint = s + p.setpoint;
  rec.calibration.selection.notes.push_back(s);
  return rec;
}
}  // namespace

BOOST_AUTO_TEST_CASE(json_round_trips_hostile_strings_exactly) {
  for (const std::string& s : hostile()) {
    BOOST_TEST_CONTEXT("string: " << shown_text(s)) {
      const CalibrationRecord rec = record_with(s);
      const std::string text = record_text(record_to_json(rec));
      const GuardedRecord back = check_record_text(text, "h.json", /*allow_modified=*/false);
      BOOST_TEST(!back.modified);
      const CalibrationRecord& r = back.record;
      BOOST_TEST(r.sensor.name == rec.sensor.name);
      BOOST_TEST(r.sensor.reading_unit == rec.sensor.reading_unit);
      BOOST_TEST(r.sensor.reference_unit == rec.sensor.reference_unit);
      BOOST_TEST(r.input.file == rec.input.file);
      BOOST_TEST(r.input.columns.reading_column == rec.input.columns.reading_column);
      BOOST_TEST(r.input.columns.reference_column == rec.input.columns.reference_column);
      BOOST_TEST(r.input.columns.setpoint_column == rec.input.columns.setpoint_column);
      BOOST_TEST(r.calibration.setpoints.front().id == rec.calibration.setpoints.front().id);
      BOOST_TEST(r.calibration.points.back().setpoint == rec.calibration.points.back().setpoint);
      BOOST_TEST(r.calibration.selection.notes.back() == s);
      // Raw text never carries an unescaped control character or quote break.
      BOOST_TEST(text.find(std::string("\"two\nlines")) == std::string::npos);
      BOOST_TEST(is_valid_utf8(text));
    }
  }
}

BOOST_AUTO_TEST_CASE(invalid_utf8_is_replaced_and_the_digest_stays_valid) {
  // The CLI refuses invalid UTF-8 before it reaches a record (see
  // test_input_limits and the CLI tests); the library writes U+FFFD instead,
  // consistently in the text and in its digest.
  const std::string bad = "Temp\xe9rature \xff\xfe end";
  const CalibrationRecord rec = record_with(bad);
  const std::string text = record_text(record_to_json(rec));
  BOOST_TEST(is_valid_utf8(text));
  const GuardedRecord back = check_record_text(text, "h.json", false);
  BOOST_TEST(!back.modified);
  BOOST_TEST(back.record.sensor.name == "Temp\xef\xbf\xbdrature \xef\xbf\xbd\xef\xbf\xbd end");
}

BOOST_AUTO_TEST_CASE(utf8_validation) {
  BOOST_TEST(is_valid_utf8(""));
  BOOST_TEST(is_valid_utf8("plain ASCII"));
  BOOST_TEST(is_valid_utf8("\xc3\xa9 \xe2\x82\xac \xf0\x9f\x8c\xa1"));  // é € 🌡
  BOOST_TEST(!is_valid_utf8("\xc3"));                                   // truncated
  BOOST_TEST(!is_valid_utf8("\xc0\xaf"));                               // overlong '/'
  BOOST_TEST(!is_valid_utf8("\xe0\x80\xaf"));                           // overlong
  BOOST_TEST(!is_valid_utf8("\xed\xa0\x80"));                           // surrogate
  BOOST_TEST(!is_valid_utf8("\xf4\x90\x80\x80"));                       // above U+10FFFF
  BOOST_TEST(!is_valid_utf8("\xff"));
  BOOST_TEST(name_problem("ok name", 16).empty());
  BOOST_TEST(name_problem("tab\there", 16).find("control character 0x09") != std::string::npos);
  BOOST_TEST(name_problem(std::string(17, 'x'), 16).find("17 bytes") != std::string::npos);
  BOOST_TEST(shown_text("a\nb\xff", 40) == "a\\x0ab\\xff");
  BOOST_TEST(shown_text(std::string(50, 'z'), 40) == std::string(40, 'z') + "...");
}
