// CSV reader: accepted variants and every rejected input, with file:line messages.
#define BOOST_TEST_MODULE csv_reader
#include <boost/test/unit_test.hpp>
#include <cmath>
#include <string>

#include "ridgecal/calibration_csv.hpp"
#include "ridgecal/errors.hpp"

using namespace ridgecal;

namespace {
Dataset parse(const std::string& text, CsvOptions opt = {}) {
  return parse_calibration_csv(text, "run.csv", opt);
}

// Parses and expects an InputError whose text starts with "run.csv:LINE: " and contains `needle`.
void expect_error(const std::string& text, std::size_t line, const std::string& needle,
                  CsvOptions opt = {}) {
  try {
    parse(text, opt);
    BOOST_ERROR("no error for: " << text);
  } catch (const InputError& e) {
    const std::string msg = e.what();
    const std::string prefix = line ? "run.csv:" + std::to_string(line) + ": " : "run.csv: ";
    BOOST_TEST(msg.rfind(prefix, 0) == 0u,
               "message '" << msg << "' should start with '" << prefix << "'");
    BOOST_TEST(msg.find(needle) != std::string::npos,
               "message '" << msg << "' should mention '" << needle << "'");
    BOOST_TEST(e.line() == line);
  }
}
}  // namespace

BOOST_AUTO_TEST_CASE(plain_file) {
  const Dataset d = parse("reading,reference\n1,10\n2,20.5\n");
  BOOST_TEST(d.rows.size() == 2u);
  BOOST_TEST(d.rows[1].reading == 2.0);
  BOOST_TEST(d.rows[1].reference == 20.5);
  BOOST_TEST(d.rows[1].line == 3u);
  BOOST_TEST(d.rows[1].setpoint == "20.5");  // grouped by reference value
  BOOST_TEST(d.sha256.size() == 64u);
}

BOOST_AUTO_TEST_CASE(bom_crlf_comments_blank_lines_quotes) {
  const Dataset d = parse(
      "\xEF\xBB\xBF# a comment\r\n  # indented comment\r\n\"reading\",reference,note\r\n\r\n"
      "1.5,-3e2,\"a, b\"\r\n+2,4,\"say \"\"hi\"\"\"\r\n");
  BOOST_TEST(d.rows.size() == 2u);
  BOOST_TEST(d.rows[0].reading == 1.5);
  BOOST_TEST(d.rows[0].reference == -300.0);
  BOOST_TEST(d.rows[0].line == 5u);
  BOOST_TEST(d.rows[1].reading == 2.0);
}

BOOST_AUTO_TEST_CASE(named_columns_setpoint_and_role) {
  CsvOptions opt;
  opt.reading_column = "counts";
  opt.reference_column = "degC";
  opt.setpoint_column = "sp";
  opt.role_column = "use";
  const Dataset d = parse("sp,counts,degC,use\nA,1,2,fit\nA,1.1,2.01,fit\nB,3,4,CHECK\n", opt);
  BOOST_TEST(d.rows.size() == 3u);
  BOOST_TEST(d.rows[0].setpoint == "A");
  BOOST_TEST((d.rows[2].role == UserRole::Check));
}

BOOST_AUTO_TEST_CASE(semicolon_and_tab_delimiters) {
  CsvOptions opt;
  opt.delimiter = ';';
  BOOST_TEST(parse("reading;reference\n1;2\n", opt).rows.size() == 1u);
  opt.delimiter = '\t';
  BOOST_TEST(parse("reading\treference\n1\t2\n", opt).rows.size() == 1u);
}

BOOST_AUTO_TEST_CASE(rejections_name_file_line_and_cause) {
  expect_error("", 1, "empty");
  expect_error("# only a comment\n", 1, "empty");
  expect_error("reading,reference\n", 1, "no data rows");
  expect_error("# c\nreading,reference\n# c\n", 2, "no data rows");
  expect_error("reading,value\n1,2\n", 1, "no reference column 'reference'");
  expect_error("counts,reference\n1,2\n", 1, "no reading column 'reading'");
  expect_error("reading,reference\n1,2\n3\n", 3, "has 1 fields but the header (line 1) has 2");
  expect_error("reading,reference\n1,2,3\n", 2, "has 3 fields");
  expect_error("reading,reference\n1,abc\n", 2, "'abc', which is not a number");
  expect_error("reading,reference\n1,\n", 2, "is empty");
  expect_error("reading,reference\nnan,1\n", 2, "not a finite number");
  expect_error("reading,reference\n1,inf\n", 2, "not a finite number");
  expect_error("reading,reference\n1,-Infinity\n", 2, "not a finite number");
  expect_error("reading,reference\n1,1e999\n", 2, "out of the range");
  expect_error("reading,reference\n1,\"2\n", 2, "unterminated");
  expect_error("reading,reading,reference\n1,2,3\n", 1, "appears twice");
  expect_error("reading,reference\n\"1,5\",2\n", 2, "decimal point");
  CsvOptions opt;
  opt.role_column = "role";
  expect_error("reading,reference,role\n1,2,train\n", 2, "role column 'role' holds 'train'", opt);
  opt = {};
  opt.setpoint_column = "sp";
  expect_error("reading,reference,sp\n1,2,\n", 2, "setpoint column 'sp' is empty", opt);
}

BOOST_AUTO_TEST_CASE(other_delimiter_gets_a_hint) {
  try {
    parse("reading;reference\n1;2\n");
    BOOST_ERROR("expected an error");
  } catch (const InputError& e) {
    BOOST_TEST(std::string(e.what()).find("--delimiter") != std::string::npos);
  }
}

BOOST_AUTO_TEST_CASE(options_validation_names_the_field) {
  CsvOptions opt;
  opt.reading_column = "x";
  opt.reference_column = "x";
  BOOST_TEST(opt.validate().find("reading_column") != std::string::npos);
  opt = {};
  opt.delimiter = '|';
  BOOST_TEST(opt.validate().find("delimiter") != std::string::npos);
}

BOOST_AUTO_TEST_CASE(role_spellings) {
  BOOST_TEST((user_role_from_string("fit") == UserRole::Fit));
  BOOST_TEST((user_role_from_string(to_string(UserRole::Check)) == UserRole::Check));
  BOOST_CHECK_THROW(user_role_from_string("test"), std::invalid_argument);
}

BOOST_AUTO_TEST_CASE(aux_and_aux_setpoint_columns) {
  CsvOptions opt;
  opt.aux_column = "temp";
  opt.aux_setpoint_column = "chamber";
  const Dataset d = parse("reading,reference,temp,chamber\n1,10,20.5,C20\n2,20,-4.25,C-5\n", opt);
  BOOST_REQUIRE_EQUAL(d.rows.size(), 2u);
  BOOST_TEST(d.rows[1].aux == -4.25);
  BOOST_TEST(d.rows[1].aux_setpoint == "C-5");
  // Without an aux column the aux value is NaN.
  BOOST_TEST(std::isnan(parse("reading,reference\n1,10\n").rows[0].aux));
  expect_error("reading,reference,temp,chamber\n1,10,warm,C20\n", 2, "column 'temp' holds 'warm'",
               opt);
  expect_error("reading,reference,temp,chamber\n1,10,20,\n", 2,
               "the aux setpoint column 'chamber' is empty", opt);
  expect_error("reading,reference,chamber\n1,10,C20\n", 1, "no aux column 'temp'", opt);
  CsvOptions same;
  same.aux_column = "reading";
  BOOST_TEST(same.validate().find("aux_column") != std::string::npos);
  CsvOptions orphan;
  orphan.aux_setpoint_column = "chamber";
  BOOST_TEST(orphan.validate().find("aux_setpoint_column") != std::string::npos);
}
