// CLI parsing of the tolerance, decision and uncertainty options (`fit`) and
// of `ridgecal verify`, without running anything.
#define BOOST_TEST_MODULE cli_judgement
#include <boost/test/unit_test.hpp>

#include "cli_common.hpp"
#include "fit_command.hpp"
#include "verify_command.hpp"

using namespace ridgecal;
using namespace ridgecal::cli;

namespace {
std::string usage_error(const std::vector<std::string>& args, bool verify = false) {
  try {
    if (verify)
      parse_verify_command(args);
    else
      parse_fit_command(args);
  } catch (const UsageError& e) {
    return e.what();
  }
  return {};
}
}  // namespace

BOOST_AUTO_TEST_CASE(fit_defaults_have_no_tolerance) {
  const FitCommand c = parse_fit_command({"run.csv"});
  BOOST_TEST(!c.assess.tolerance.has_value());
  BOOST_TEST((c.assess.rule == DecisionRule::SimpleAcceptance));
  BOOST_TEST(c.assess.uncertainty.reference_uncertainty == 0.0);
  BOOST_TEST(c.assess.uncertainty.reference_k == 1.0);
  BOOST_TEST(c.assess.uncertainty.coverage_k == 2.0);
  BOOST_TEST(c.csv.direction_column.empty());
}

BOOST_AUTO_TEST_CASE(fit_tolerance_and_uncertainty_options) {
  const FitCommand c = parse_fit_command(
      {"run.csv", "--tol-offset", "0.1", "--tol-proportional", "0.002", "--tol-percent-span", "0.5",
       "--span", "-50..150", "--decision", "guarded", "--ref-uncertainty", "0.04", "--ref-k", "2",
       "--resolution", "0.5", "--direction", "dir"});
  BOOST_REQUIRE(c.assess.tolerance.has_value());
  BOOST_TEST(c.assess.tolerance->offset == 0.1);
  BOOST_TEST(c.assess.tolerance->proportional == 0.002);
  BOOST_TEST(c.assess.tolerance->percent_of_span == 0.5);
  BOOST_TEST(c.assess.tolerance->span_low == -50.0);
  BOOST_TEST(c.assess.tolerance->span_high == 150.0);
  BOOST_TEST(c.assess.diagnostics.span_low == -50.0);
  BOOST_TEST((c.assess.rule == DecisionRule::GuardedAcceptance));
  BOOST_TEST(c.assess.uncertainty.reference_uncertainty == 0.04);
  BOOST_TEST(c.assess.uncertainty.reference_k == 2.0);
  BOOST_TEST(c.assess.uncertainty.resolution == 0.5);
  BOOST_TEST(c.csv.direction_column == "dir");
}

BOOST_AUTO_TEST_CASE(fit_tolerance_class) {
  const FitCommand c = parse_fit_command({"run.csv", "--tol-class", "iec60751-A"});
  BOOST_REQUIRE(c.assess.tolerance.has_value());
  BOOST_TEST(c.assess.tolerance->offset == 0.15);
  BOOST_TEST(c.assess.tolerance->proportional == 0.002);
  BOOST_TEST(c.assess.tolerance->source == "iec60751-A");
}

BOOST_AUTO_TEST_CASE(fit_bad_options_name_the_option) {
  BOOST_TEST(usage_error({"run.csv", "--tol-offset", "x"}).find("--tol-offset") !=
             std::string::npos);
  BOOST_TEST(usage_error({"run.csv", "--tol-offset", "-0.1"}).find("offset is -0.1") !=
             std::string::npos);
  BOOST_TEST(usage_error({"run.csv", "--tol-class", "iec60751-Z"}).find("--tol-class") !=
             std::string::npos);
  BOOST_TEST(usage_error({"run.csv", "--tol-class", "iec60751-A", "--tol-offset", "1"})
                 .find("--tol-class") != std::string::npos);
  BOOST_TEST(
      usage_error({"run.csv", "--decision", "guarded"}).find("--decision needs a tolerance") !=
      std::string::npos);
  BOOST_TEST(
      usage_error({"run.csv", "--tol-offset", "1", "--decision", "lenient"}).find("--decision") !=
      std::string::npos);
  BOOST_TEST(usage_error({"run.csv", "--span", "5..1"}).find("--span") != std::string::npos);
  BOOST_TEST(usage_error({"run.csv", "--ref-k", "2"}).find("--ref-uncertainty") !=
             std::string::npos);
  BOOST_TEST(usage_error({"run.csv", "--ref-uncertainty", "0.1", "--ref-k", "0.5"})
                 .find("reference_k is 0.5") != std::string::npos);
  BOOST_TEST(usage_error({"run.csv", "--resolution", "-1"}).find("resolution is -1") !=
             std::string::npos);
}

BOOST_AUTO_TEST_CASE(verify_parsing) {
  const VerifyCommand v =
      parse_verify_command({"rec.json", "new.csv", "-o", "af.json", "--allow-modified", "--reading",
                            "r", "--tol-offset", "0.2"});
  BOOST_TEST(v.record_path == "rec.json");
  BOOST_TEST(v.data_path == "new.csv");
  BOOST_TEST(v.output_path == "af.json");
  BOOST_TEST(v.allow_modified);
  BOOST_TEST(*v.reading_column == "r");
  BOOST_TEST(!v.reference_column.has_value());
  BOOST_REQUIRE(v.as_found.tolerance.has_value());
  BOOST_TEST(v.as_found.tolerance->offset == 0.2);
  BOOST_TEST(!v.as_found.rule.has_value());
  const VerifyCommand d = parse_verify_command({"rec.json", "new.csv"});
  BOOST_TEST(!d.allow_modified);
  BOOST_TEST(!d.as_found.tolerance.has_value());
  BOOST_TEST(usage_error({"rec.json"}, true).find("give a record and a data file") !=
             std::string::npos);
  BOOST_TEST(usage_error({"rec.json", "new.csv", "--tol-percent-span", "1"}, true).find("--span") !=
             std::string::npos);
  BOOST_TEST(parse_verify_command({"--help"}).help);
}
