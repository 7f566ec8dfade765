// Clear messages (issue 15, item 13): an absurd penalty is a usage error
// naming the rule, not "the data are too extreme"; a record whose model
// overflows on the as-found readings prints "not finite", never nan or inf;
// export, report and verify refuse a record's negative or null tolerance with
// one message (one validation, in the record reader).
#define BOOST_TEST_MODULE cli_messages
#include <boost/test/unit_test.hpp>
#include <filesystem>
#include <fstream>
#include <nlohmann/json.hpp>
#include <string>

#include "cli_common.hpp"
#include "export_command.hpp"
#include "fit_command.hpp"
#include "report_command.hpp"
#include "test_support.hpp"
#include "verify_command.hpp"

namespace fs = std::filesystem;
using namespace ridgecal::cli;
using ridgecal::test::call_main;
using ridgecal::test::slurp;
using ridgecal::test::TempDir;

namespace {
const std::string kSample =
    std::string(RIDGECAL_SAMPLES_DIR) + "/loadcell-hopper/loadcell-hopper.csv";
}

BOOST_AUTO_TEST_CASE(an_absurd_penalty_is_a_usage_error) {
  for (const char* lambdas : {"1e308", "1e7", "0,1e9"}) {
    std::string text;
    BOOST_TEST(call_main(fit_main, {kSample, "--setpoint", "setpoint", "--lambdas", lambdas},
                         &text) == kExitBadInput);
    BOOST_TEST(text.find("every penalty must be between 0 and 1e+06") != std::string::npos, text);
    BOOST_TEST(text.find("too extreme") == std::string::npos, text);
  }
}

BOOST_AUTO_TEST_CASE(an_overflowing_model_prints_not_finite_never_nan_or_inf) {
  TempDir t;
  const std::string rec = t / "lc.json";
  std::string text;
  BOOST_REQUIRE(call_main(fit_main,
                          {kSample, "--setpoint", "setpoint", "--tol-offset", "0.01", "--timestamp",
                           "none", "-o", rec},
                          &text) == kExitOk);
  nlohmann::json j = nlohmann::json::parse(slurp(rec));
  for (auto& c : j["model"]["chebyshev_coefficients"]) c = 1e308;
  const std::string big = t / "big.json";
  std::ofstream(big) << j.dump(2);
  const int rc =
      call_main(verify_main, {big, kSample, "--setpoint", "setpoint", "--allow-modified"}, &text);
  BOOST_TEST(rc == kExitOutOfTolerance, text);
  BOOST_TEST(text.find("not finite") != std::string::npos, text);
  for (const char* bad : {"nan", "inf%", " inf"})
    BOOST_TEST(text.find(bad) == std::string::npos, bad);
}

BOOST_AUTO_TEST_CASE(export_report_and_verify_refuse_a_bad_record_tolerance_alike) {
  TempDir t;
  const std::string rec = t / "lc.json";
  std::string text;
  BOOST_REQUIRE(call_main(fit_main,
                          {kSample, "--setpoint", "setpoint", "--tol-offset", "0.01", "--timestamp",
                           "none", "-o", rec},
                          &text) == kExitOk);
  const nlohmann::json good = nlohmann::json::parse(slurp(rec));
  const std::pair<const char*, nlohmann::json> cases[] = {
      {"offset is -0.01; it must be a finite number >= 0", -0.01},
      {"record member 'tolerance.offset' is not a finite number", nullptr}};
  for (const auto& [expected, value] : cases) {
    nlohmann::json j = good;
    j["tolerance"]["offset"] = value;
    const std::string bad = t / "bad.json";
    std::ofstream(bad) << j.dump(2);
    const std::string header = t / "h.h", report = t / "r.html";
    const std::vector<std::pair<SubcommandMain, std::vector<std::string>>> runs = {
        {export_main,
         {bad, "--prefix", "lc", "--numeric", "float", "--allow-modified", "-o", header}},
        {report_main, {bad, "--allow-modified", "-o", report}},
        {verify_main, {bad, kSample, "--setpoint", "setpoint", "--allow-modified"}}};
    for (const auto& [m, args] : runs) {
      BOOST_TEST(call_main(m, args, &text) == kExitBadInput, text);
      BOOST_TEST(text.find(expected) != std::string::npos, text);
    }
    BOOST_TEST(!fs::exists(header));
    BOOST_TEST(!fs::exists(report));
  }
}
