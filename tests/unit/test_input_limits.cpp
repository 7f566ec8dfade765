// Bounded input: row, field, field-length and file-size limits of the CSV
// reader (tested with lowered limits, so no big file is needed), the decimal
// comma option, and non-UTF-8 labels.
#define BOOST_TEST_MODULE input_limits
#include <boost/test/unit_test.hpp>
#include <cstdio>
#include <fstream>
#include <string>

#include "ridgecal/atomic_file.hpp"
#include "ridgecal/calibration_csv.hpp"
#include "ridgecal/errors.hpp"
#include "test_support.hpp"

using namespace ridgecal;

namespace {
std::string error_of(const std::string& text, const CsvOptions& opt) {
  try {
    parse_calibration_csv(text, "lim.csv", opt);
  } catch (const InputError& e) {
    return e.what();
  }
  return "(no error)";
}
bool has(const std::string& s, const std::string& needle) {
  return s.find(needle) != std::string::npos;
}
}  // namespace

BOOST_AUTO_TEST_CASE(defaults_are_documented_values) {
  const CsvLimits l;
  BOOST_TEST(l.max_rows == 1000000u);
  BOOST_TEST(l.max_bytes == 256u * 1024u * 1024u);
  BOOST_TEST(l.max_fields == 1024u);
  BOOST_TEST(l.max_field_bytes == 4096u);
  BOOST_TEST(l.validate().empty());
}

BOOST_AUTO_TEST_CASE(row_limit) {
  CsvOptions opt;
  opt.limits.max_rows = 3;
  BOOST_TEST(parse_calibration_csv("reading,reference\n1,1\n2,2\n# c\n3,3\n", "lim.csv", opt)
                 .rows.size() == 3u);
  const std::string e = error_of("reading,reference\n1,1\n2,2\n3,3\n4,4\n5,5\n", opt);
  BOOST_TEST(has(e, "lim.csv:5: the file has more than 3 data rows"), e);
  BOOST_TEST(has(e, "--max-rows"), e);
}

BOOST_AUTO_TEST_CASE(field_count_and_length_limits) {
  CsvOptions opt;
  opt.limits.max_fields = 3;
  BOOST_TEST(parse_calibration_csv("reading,reference,x\n1,1,a\n", "lim.csv", opt).rows.size() ==
             1u);
  std::string e = error_of("reading,reference,x,y\n1,1,a,b\n", opt);
  BOOST_TEST(has(e, "lim.csv:1: the row has more than 3 fields"), e);
  opt = {};
  opt.limits.max_field_bytes = 12;
  e = error_of("reading,reference,note\n1,1,abcdefghijklmn\n", opt);
  BOOST_TEST(has(e, "lim.csv:2: field 3 is longer than 12 bytes"), e);
  e = error_of("reading,reference\n1,\"2222222222222\n", opt);  // runaway quote
  BOOST_TEST(has(e, "closing quote"), e);
  // A hostile single line of a million delimiters stops at the field limit.
  opt = {};
  e = error_of("reading,reference\n1,2" + std::string(1000000, ',') + "\n", opt);
  BOOST_TEST(has(e, "more than 1024 fields"), e);
}

BOOST_AUTO_TEST_CASE(file_size_limit_is_checked_before_reading) {
  const ridgecal::test::TempDir tmp;
  const std::string path = tmp / "limits.csv";
  {
    std::ofstream out(path);
    out << "reading,reference\n";
    for (int i = 0; i < 100; ++i) out << i << "," << 2 * i << "\n";
  }
  CsvOptions opt;
  BOOST_TEST(read_calibration_csv(path, opt).rows.size() == 100u);
  opt.limits.max_bytes = 100;
  try {
    read_calibration_csv(path, opt);
    BOOST_ERROR("no error");
  } catch (const InputError& e) {
    BOOST_TEST(has(e.what(), "the limit is 100 bytes"), e.what());
    BOOST_TEST(has(e.what(), "--max-bytes"), e.what());
  }
  // A stream without a size (a character device that never ends) is cut off too.
  try {
    read_file_bytes_limited("/dev/zero", 1 << 20, "hint");
    BOOST_ERROR("no error");
  } catch (const InputError& e) {
    BOOST_TEST(has(e.what(), "longer than the limit"), e.what());
  }
}

BOOST_AUTO_TEST_CASE(limits_validate_names_the_field) {
  CsvOptions opt;
  opt.limits.max_rows = 0;
  BOOST_TEST(has(opt.validate(), "limits.max_rows"));
  opt = {};
  opt.limits.max_fields = 1;
  BOOST_TEST(has(opt.validate(), "limits.max_fields"));
}

BOOST_AUTO_TEST_CASE(decimal_comma) {
  CsvOptions opt;
  opt.delimiter = ';';
  opt.decimal_comma = true;
  const Dataset d =
      parse_calibration_csv("reading;reference\n1,5;-2,25\n2;3e2\n\"3,5\";4,0\n", "dc.csv", opt);
  BOOST_TEST(d.rows[0].reading == 1.5);
  BOOST_TEST(d.rows[0].reference == -2.25);
  BOOST_TEST(d.rows[1].reference == 300.0);
  BOOST_TEST(d.rows[2].reading == 3.5);
  // A '.' next to the decimal comma would be a thousands separator: refused.
  std::string e = error_of("reading;reference\n1.000,5;2\n", opt);
  BOOST_TEST((has(e, "dc.csv") || has(e, "lim.csv")));
  BOOST_TEST(has(e, "'.' although --decimal-comma"), e);
  // Without the option a decimal comma is a clear error that names it.
  opt.decimal_comma = false;
  e = error_of("reading;reference\n1,5;2\n", opt);
  BOOST_TEST(has(e, "lim.csv:2: column 'reading' holds '1,5', which is not a number"), e);
  BOOST_TEST(has(e, "--decimal-comma"), e);
  // With ',' as delimiter a decimal comma splits the field; the hint says so.
  e = error_of("reading,reference\n1,5,2\n", CsvOptions{});
  BOOST_TEST((has(e, "has 3 fields") && has(e, "--decimal-comma")), e);
  // The option needs another delimiter.
  CsvOptions bad;
  bad.decimal_comma = true;
  BOOST_TEST(has(bad.validate(), "decimal_comma"));
}

BOOST_AUTO_TEST_CASE(labels_and_column_names_must_be_utf8) {
  CsvOptions opt;
  opt.setpoint_column = "sp";
  BOOST_TEST(parse_calibration_csv("sp,reading,reference\nTempérature 20 °C,1,2\n", "u.csv", opt)
                 .rows.size() == 1u);
  const std::string e = error_of("sp,reading,reference\nTemp\xe9rature,1,2\n", opt);
  BOOST_TEST(has(e, "lim.csv:2: the setpoint label 'Temp\\xe9rature' is not valid UTF-8"), e);
  opt.reading_column = "bad\xff";
  BOOST_TEST(has(opt.validate(), "reading_column"));
  opt.reading_column = "two\nlines";
  BOOST_TEST(has(opt.validate(), "control character"));
}
