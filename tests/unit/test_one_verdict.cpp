// One verdict (issue 12): the PASS/FAIL is computed once, by the assessment,
// and stored in the record. A FAIL record never yields a C header or an HTML
// report that says PASS: not from `export` (with or without --tolerance, in
// every numeric mode), not from `report`, `fit --report` or `batch --headers
// --reports`, for one-input and two-input records.
#define BOOST_TEST_MODULE one_verdict
#include <boost/test/unit_test.hpp>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include "batch_command.hpp"
#include "cli_common.hpp"
#include "export_command.hpp"
#include "fit_command.hpp"
#include "report_command.hpp"
#include "test_support.hpp"

namespace fs = std::filesystem;
using namespace ridgecal::cli;

namespace {

using ridgecal::test::call_main;
using ridgecal::test::slurp;
using ridgecal::test::TempDir;

const std::string kSamples = RIDGECAL_SAMPLES_DIR;

// The QA block's result line of a generated header.
std::string result_line(const std::string& header) {
  const std::string key = " *   result:              ";
  const auto pos = header.find(key);
  if (pos == std::string::npos) return "(no result line)";
  return header.substr(pos + key.size(), header.find('\n', pos) - pos - key.size());
}

// The load-cell demo judged against +-0.002 kg: 42 of 44 points conform, FAIL
// (the repro of issue 12).
const std::vector<std::string> kLoadcellFail = {kSamples + "/loadcell-hopper/loadcell-hopper.csv",
                                                "--setpoint",
                                                "setpoint",
                                                "--reference-unit",
                                                "kg",
                                                "--tol-offset",
                                                "0.002",
                                                "--timestamp",
                                                "none"};
// The pressure demo (reading + temperature) against +-0.002 bar: FAIL.
const std::vector<std::string> kPressureFail = {kSamples + "/pressure-tempco/pressure-tempco.csv",
                                                "--setpoint",
                                                "setpoint",
                                                "--aux",
                                                "temperature",
                                                "--aux-setpoint",
                                                "chamber",
                                                "--aux-degree",
                                                "0..3",
                                                "--reference-unit",
                                                "bar",
                                                "--tol-offset",
                                                "0.002",
                                                "--timestamp",
                                                "none"};

fs::path fit_record(const TempDir& t, const std::string& name, std::vector<std::string> args,
                    int expected_rc, const fs::path& report = {}) {
  const fs::path rec = t.path() / (name + ".json");
  args.insert(args.end(), {"-o", rec.string()});
  if (!report.empty()) args.insert(args.end(), {"--report", report.string()});
  std::string err;
  BOOST_REQUIRE_MESSAGE(call_main(fit_main, args, &err) == expected_rc, err);
  return rec;
}

void check_fail_header(const fs::path& h) {
  const std::string text = slurp(h);
  BOOST_TEST_CONTEXT(h.filename().string() << ": " << result_line(text)) {
    BOOST_TEST(result_line(text).rfind("FAIL: ", 0) == 0);
    BOOST_TEST(text.find("PASS") == std::string::npos);
  }
}

void check_fail_report(const fs::path& html) {
  const std::string text = slurp(html);
  BOOST_TEST_CONTEXT(html.filename().string()) {
    BOOST_TEST(
        text.find("<div class=\"verdict fail\" id=\"verdict\">\n<div class=\"word\">FAIL</div>") !=
        std::string::npos);
    BOOST_TEST(text.find("class=\"verdict pass\"") == std::string::npos);
    BOOST_TEST(text.find("<div class=\"word\">PASS</div>") == std::string::npos);
  }
}

}  // namespace

BOOST_AUTO_TEST_CASE(a_fail_one_input_record_gives_fail_headers_whatever_the_tolerance_option) {
  TempDir t;
  const fs::path rec = fit_record(t, "lc", kLoadcellFail, kExitOutOfTolerance);
  // Without --tolerance; with the record's own tolerance; with one so loose
  // that the test set alone would pass; with a tolerance text; in each mode.
  const std::vector<std::vector<std::string>> variants = {
      {},
      {"--tolerance", "0.002"},
      {"--tolerance", "1"},
      {"--tolerance", "1", "--tolerance-text", "+/- 1 kg"}};
  int n = 0;
  for (const auto& extra : variants)
    for (const char* mode : {"float", "double", "fixed"}) {
      const fs::path h = t.path() / ("lc" + std::to_string(n++) + ".h");
      std::vector<std::string> args = {rec.string(), "--prefix", "lc",      "--numeric",
                                       mode,         "-o",       h.string()};
      if (std::string(mode) == "fixed") args.insert(args.end(), {"--output-scale", "1000000"});
      args.insert(args.end(), extra.begin(), extra.end());
      std::string err;
      BOOST_REQUIRE_MESSAGE(call_main(export_main, args, &err) == kExitOk, err);
      check_fail_header(h);
    }
}

BOOST_AUTO_TEST_CASE(the_header_states_the_record_verdict_verbatim_and_names_the_tolerance_option) {
  TempDir t;
  const fs::path rec = fit_record(t, "lc", kLoadcellFail, kExitOutOfTolerance);
  const fs::path h = t.path() / "lc.h";
  BOOST_REQUIRE(call_main(export_main, {rec.string(), "--prefix", "lc", "--tolerance", "0.002",
                                        "-o", h.string()}) == kExitOk);
  const std::string text = slurp(h);
  BOOST_TEST(result_line(text) ==
             "FAIL: Simple acceptance: a point conforms when |error| <= tolerance +-(0.002); the "
             "measurement "
             "uncertainty is reported but not subtracted. FAIL: 42 of 44 judged points conform.");
  BOOST_TEST(text.find("0.002 kg (--tolerance, for the refusal rule only)") != std::string::npos);
  BOOST_TEST(text.find("(record tolerance)") == std::string::npos);
}

BOOST_AUTO_TEST_CASE(a_record_without_a_decision_is_not_judged_by_the_export) {
  TempDir t;
  std::vector<std::string> args(kLoadcellFail.begin(), kLoadcellFail.end() - 4);  // no --tol-offset
  args.insert(args.end(), {"--timestamp", "none"});
  const fs::path rec = fit_record(t, "lc", args, kExitOk);
  const fs::path h = t.path() / "lc.h";
  BOOST_REQUIRE(call_main(export_main, {rec.string(), "--prefix", "lc", "--tolerance", "1", "-o",
                                        h.string()}) == kExitOk);
  const std::string text = slurp(h);
  BOOST_TEST(result_line(text) == "not assessed (no tolerance in the record)");
  BOOST_TEST(text.find("PASS") == std::string::npos);
  BOOST_TEST(text.find("FAIL") == std::string::npos);
}

BOOST_AUTO_TEST_CASE(a_pass_record_gives_a_pass_header) {
  // The control: the checks above can see a PASS when there is one.
  TempDir t;
  std::vector<std::string> args = kLoadcellFail;
  args[6] = "0.01";  // --tol-offset 0.01 kg: every point conforms
  const fs::path rec = fit_record(t, "lc", args, kExitOk);
  const fs::path h = t.path() / "lc.h";
  BOOST_REQUIRE(call_main(export_main, {rec.string(), "--prefix", "lc", "--tolerance", "0.0001",
                                        "-o", h.string(), "--numeric", "double"}) == kExitOk);
  BOOST_TEST(result_line(slurp(h)).rfind("PASS: ", 0) == 0);
}

BOOST_AUTO_TEST_CASE(a_fail_two_input_record_gives_fail_headers_and_reports) {
  TempDir t;
  const fs::path fit_html = t.path() / "fit.html";
  const fs::path rec = fit_record(t, "pt", kPressureFail, kExitOutOfTolerance, fit_html);
  check_fail_report(fit_html);
  for (const std::vector<std::string>& extra : {std::vector<std::string>{}, {"--tolerance", "10"}})
    for (const char* mode : {"float", "double"}) {
      const fs::path h =
          t.path() / (std::string("pt-") + mode + std::to_string(extra.size()) + ".h");
      std::vector<std::string> args = {rec.string(), "--prefix", "pt",      "--numeric",
                                       mode,         "-o",       h.string()};
      args.insert(args.end(), extra.begin(), extra.end());
      std::string err;
      BOOST_REQUIRE_MESSAGE(call_main(export_main, args, &err) == kExitOk, err);
      check_fail_header(h);
    }
  const fs::path html = t.path() / "pt.html";
  BOOST_REQUIRE(call_main(report_main, {rec.string(), "-o", html.string()}) == kExitOk);
  check_fail_report(html);
}

BOOST_AUTO_TEST_CASE(a_fail_one_input_record_gives_fail_reports) {
  TempDir t;
  const fs::path fit_html = t.path() / "fit.html";
  const fs::path rec = fit_record(t, "lc", kLoadcellFail, kExitOutOfTolerance, fit_html);
  check_fail_report(fit_html);
  const fs::path html = t.path() / "lc.html";
  BOOST_REQUIRE(call_main(report_main, {rec.string(), "-o", html.string()}) == kExitOk);
  check_fail_report(html);
}

BOOST_AUTO_TEST_CASE(batch_headers_and_reports_of_fail_units_say_fail) {
  TempDir t;
  const fs::path csv = t.path() / "batch.csv";
  {
    std::ifstream in(kSamples + "/loadcell-hopper/loadcell-hopper.csv");
    std::ofstream out(csv);
    std::string line;
    bool header = true;
    std::vector<std::string> rows;
    while (std::getline(in, line)) {
      if (line.empty() || line[0] == '#') continue;
      if (header) {
        out << "unit," << line << "\n";
        header = false;
      } else {
        rows.push_back(line);
      }
    }
    for (const char* unit : {"U1", "U2"})
      for (const auto& r : rows) out << unit << "," << r << "\n";
  }
  const fs::path dir = t.path() / "out";
  std::string err;
  BOOST_REQUIRE_MESSAGE(
      call_main(batch_main,
                {csv.string(), "--unit", "unit", "--setpoint", "setpoint", "--tol-offset", "0.002",
                 "-o", dir.string(), "-j", "1", "--progress", "none", "--timestamp", "none",
                 "--reports", "--headers", "lc"},
                &err) == kExitOutOfTolerance,
      err);
  for (const char* unit : {"U1", "U2"}) {
    check_fail_header(dir / "headers" / (std::string(unit) + ".h"));
    check_fail_report(dir / "reports" / (std::string(unit) + ".html"));
  }
}
