// `ridgecal report`: command-line parsing and running (exit codes, atomic output).
#include <stdlib.h>

#include <boost/test/unit_test.hpp>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <sstream>

#include "cli_common.hpp"
#include "report_command.hpp"

using namespace ridgecal::cli;
namespace fs = std::filesystem;

namespace {
const std::string kDir = RIDGECAL_REPORT_TEST_DIR;

// A fresh directory of this test's own (mkdtemp), removed with what it holds
// at the end: nothing outside it is written or deleted.
struct TempDir {
  fs::path path;
  TempDir() {
    std::string t = (fs::temp_directory_path() / "ridgecal-report-cli-XXXXXX").string();
    BOOST_REQUIRE(::mkdtemp(t.data()) != nullptr);
    path = t;
  }
  ~TempDir() {
    std::error_code ec;
    fs::remove_all(path, ec);
  }
};

std::string slurp(const fs::path& p) {
  std::ifstream in(p, std::ios::binary);
  std::ostringstream ss;
  ss << in.rdbuf();
  return ss.str();
}
}  // namespace

BOOST_AUTO_TEST_SUITE(report_cli)

BOOST_AUTO_TEST_CASE(parses_record_output_and_date) {
  const ReportCommand c =
      parse_report_command({"rec.json", "-o", "out.html", "--date", "2026-12-02 09:00"});
  BOOST_TEST(c.record_path == "rec.json");
  BOOST_TEST(c.output_path == "out.html");
  BOOST_TEST(c.date.value_or("") == "2026-12-02 09:00");
  BOOST_TEST(!parse_report_command({"rec.json", "-o", "x"}).date.has_value());
  BOOST_TEST(parse_report_command({"--help"}).help);
}

BOOST_AUTO_TEST_CASE(bad_command_lines_are_usage_errors) {
  BOOST_CHECK_THROW(parse_report_command({}), UsageError);
  BOOST_CHECK_THROW(parse_report_command({"rec.json"}), UsageError);  // no -o
  BOOST_CHECK_THROW(parse_report_command({"a.json", "b.json", "-o", "x"}), UsageError);
  BOOST_CHECK_THROW(parse_report_command({"rec.json", "-o", "x", "--bogus"}), UsageError);
  BOOST_CHECK_THROW(parse_report_command({"rec.json", "-o"}), UsageError);
  std::ostringstream out, err;
  BOOST_TEST(report_main({"rec.json"}, out, err) == kExitBadInput);
  BOOST_TEST(err.str().find("-o REPORT.html") != std::string::npos);
}

BOOST_AUTO_TEST_CASE(writes_the_report) {
  TempDir t;
  const fs::path out = t.path / "report.html";
  std::ostringstream o, e;
  const int rc = report_main(
      {kDir + "/fixtures/record_full.json", "-o", out.string(), "--date", "D-DAY"}, o, e);
  BOOST_TEST(rc == kExitOk);
  BOOST_TEST(e.str() == "");
  const std::string html = slurp(out);
  BOOST_TEST(html.find("<dd>D-DAY</dd>") != std::string::npos);
  BOOST_TEST(html.find(">PASS<") != std::string::npos);
  // Atomic write: nothing but the report is left in the directory.
  BOOST_TEST(std::distance(fs::directory_iterator(t.path), fs::directory_iterator()) == 1);
}

BOOST_AUTO_TEST_CASE(bad_input_exits_2_and_writes_nothing) {
  TempDir t;
  const fs::path out = t.path / "report.html";
  const fs::path not_json = t.path / "not.json";
  std::ofstream(not_json) << "{ this is not json";
  const fs::path other = t.path / "other.json";
  std::ofstream(other) << R"({"format": "something-else", "format_version": 1})";
  const fs::path incomplete = t.path / "incomplete.json";
  std::ofstream(incomplete) << R"({"format": "ridgecal-record", "format_version": 1})";
  for (const fs::path& in : {t.path / "missing.json", not_json, other, incomplete}) {
    BOOST_TEST_CONTEXT(in.filename().string()) {
      std::ostringstream o, e;
      BOOST_TEST(report_main({in.string(), "-o", out.string()}, o, e) == kExitBadInput);
      BOOST_TEST(e.str().find("ridgecal report: ") == 0u);
      BOOST_TEST(!fs::exists(out));
    }
  }
}

BOOST_AUTO_TEST_CASE(an_existing_report_survives_bad_input) {
  TempDir t;
  const fs::path out = t.path / "report.html";
  std::ofstream(out) << "old";
  std::ostringstream o, e;
  BOOST_TEST(report_main({(t.path / "missing.json").string(), "-o", out.string()}, o, e) ==
             kExitBadInput);
  BOOST_TEST(slurp(out) == "old");
}

BOOST_AUTO_TEST_CASE(edited_record_is_refused_unless_allowed) {
  TempDir t;
  const fs::path out = t.path / "report.html";
  std::ostringstream o0, e0;
  BOOST_TEST(report_main({kDir + "/fixtures/record_hostile.json", "-o", out.string()}, o0, e0) ==
             kExitBadInput);
  BOOST_TEST(!fs::exists(out));
  std::ostringstream o, e;
  BOOST_TEST(
      report_main({kDir + "/fixtures/record_hostile.json", "-o", out.string(), "--allow-modified"},
                  o, e) == kExitOk);
  BOOST_TEST(e.str().find("integrity digest does not match") != std::string::npos);
  BOOST_TEST(slurp(out).find("DOES NOT MATCH") != std::string::npos);
}

BOOST_AUTO_TEST_CASE(standard_output) {
  std::ostringstream o, e;
  BOOST_TEST(report_main({kDir + "/fixtures/record_basic.json", "-o", "-"}, o, e) == kExitOk);
  BOOST_TEST(o.str().rfind("<!DOCTYPE html>", 0) == 0u);
}

BOOST_AUTO_TEST_SUITE_END()
