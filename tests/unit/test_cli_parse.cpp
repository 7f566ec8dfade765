// CLI parsing of `ridgecal fit`, without running anything.
#define BOOST_TEST_MODULE cli_parse
#include <boost/test/unit_test.hpp>

#include "cli_common.hpp"
#include "fit_command.hpp"

using namespace ridgecal;
using namespace ridgecal::cli;

BOOST_AUTO_TEST_CASE(defaults) {
  const FitCommand c = parse_fit_command({"run.csv"});
  BOOST_TEST(c.data_path == "run.csv");
  BOOST_TEST(c.csv.reading_column == "reading");
  BOOST_TEST(c.csv.reference_column == "reference");
  BOOST_TEST(c.fit.degrees == std::vector<int>({1, 2, 3, 4, 5, 6, 7}));
  BOOST_TEST(c.fit.lambdas.size() == 31u);
  BOOST_TEST(c.fit.split.folds == 5);
  BOOST_TEST(c.fit.split.test_fraction == 0.2);
  BOOST_TEST(!c.fit.fixed_degree.has_value());
}

BOOST_AUTO_TEST_CASE(all_options) {
  const FitCommand c = parse_fit_command(
      {"run.csv", "-o",         "r.json", "--reading",       "counts",        "--reference",
       "degC",    "--setpoint", "sp",     "--role",          "use",           "--delimiter",
       "tab",     "--degrees",  "2..4",   "--lambdas",       "0,1e-6:1e-2:5", "--rule",
       "min-cv",  "--folds",    "4",      "--test-fraction", "0.25",          "--seed",
       "9"});
  BOOST_TEST(c.output_path == "r.json");
  BOOST_TEST(c.csv.delimiter == '\t');
  BOOST_TEST(c.fit.degrees == std::vector<int>({2, 3, 4}));
  BOOST_TEST(c.fit.lambdas.size() == 6u);
  BOOST_TEST(std::abs(c.fit.lambdas[3] - 1e-4) < 1e-18);
  BOOST_TEST(to_string(c.fit.rule) == "min-cv");
  BOOST_TEST(c.fit.split.seed == 9u);
}

BOOST_AUTO_TEST_CASE(fixed_model) {
  const FitCommand c =
      parse_fit_command({"run.csv", "--degree", "10", "--lambda", "0", "--through-origin"});
  BOOST_TEST(*c.fit.fixed_degree == 10);
  BOOST_TEST(*c.fit.fixed_lambda == 0.0);
  BOOST_TEST(!c.fit.intercept);
}

BOOST_AUTO_TEST_CASE(usage_errors_name_the_option) {
  auto bad = [](std::vector<std::string> args, const std::string& needle) {
    try {
      parse_fit_command(args);
      BOOST_ERROR("accepted bad arguments, expected " << needle);
    } catch (const UsageError& e) {
      BOOST_TEST(std::string(e.what()).find(needle) != std::string::npos, e.what());
    }
  };
  bad({}, "data file");
  bad({"a.csv", "b.csv"}, "exactly one");
  bad({"a.csv", "--degrees", "x"}, "--degrees");
  bad({"a.csv", "--degrees", "0..3"}, "degrees contains 0");
  bad({"a.csv", "--lambdas", "-1"}, "negative");
  bad({"a.csv", "--lambdas", "1:0.1:5"}, "--lambdas");
  bad({"a.csv", "--rule", "best"}, "--rule");
  bad({"a.csv", "--folds", "1"}, "folds is 1");
  bad({"a.csv", "--test-fraction", "0.9"}, "test_fraction");
  bad({"a.csv", "--degree", "3"}, "--degree and --lambda");
  bad({"a.csv", "--delimiter", "|"}, "--delimiter");
  bad({"a.csv", "--reading", "x", "--reference", "x"}, "must differ");
  bad({"a.csv", "--bogus"}, "bogus");
}

BOOST_AUTO_TEST_CASE(degree_lists) {
  BOOST_TEST(parse_degree_list("3,1..2,5-6") == std::vector<int>({1, 2, 3, 5, 6}));
  BOOST_CHECK_THROW(parse_degree_list("5..2"), UsageError);
  BOOST_CHECK_THROW(parse_degree_list(""), UsageError);
}

BOOST_AUTO_TEST_CASE(injected_time) {
  BOOST_TEST(creation_time("none").empty());
  BOOST_TEST(creation_time("2026-01-01T00:00:00Z") == "2026-01-01T00:00:00Z");
  BOOST_TEST(creation_time("").size() == 20u);
}

BOOST_AUTO_TEST_CASE(extended_options) {
  const FitCommand plain = parse_fit_command({"run.csv"});
  BOOST_TEST(!plain.comp.active());
  const FitCommand c =
      parse_fit_command({"run.csv", "--aux", "temp", "--aux-setpoint", "chamber", "--aux-degree",
                         "0..2", "--reading-transform", "ln", "--reference-transform",
                         "reciprocal-kelvin", "--divider-resistor", "10000", "--divider-full-scale",
                         "4095", "--divider-position", "sensor-high"});
  BOOST_TEST(c.comp.active());
  BOOST_TEST(c.comp.aux);
  BOOST_TEST(c.csv.aux_column == "temp");
  BOOST_TEST(c.csv.aux_setpoint_column == "chamber");
  BOOST_TEST(c.comp.aux_degrees == std::vector<int>({0, 1, 2}));
  BOOST_TEST((c.comp.transforms.reading == ReadingTransform::Ln));
  BOOST_TEST((c.comp.transforms.reference == ReferenceTransform::ReciprocalKelvin));
  BOOST_TEST(c.comp.transforms.divider.enabled);
  BOOST_TEST((c.comp.transforms.divider.position == DividerPosition::SensorHigh));
  BOOST_TEST(c.comp.transforms.divider.full_scale == 4095.0);
  const FitCommand p =
      parse_fit_command({"run.csv", "--powers", "0,1,3", "--degree", "3", "--lambda", "0"});
  BOOST_TEST(p.comp.powers == std::vector<int>({0, 1, 3}));
  BOOST_CHECK_THROW(
      parse_fit_command({"run.csv", "--powers", "0,1,3", "--degree", "2", "--lambda", "0"}),
      UsageError);
  BOOST_CHECK_THROW(parse_fit_command({"run.csv", "--powers", "x"}), UsageError);
  BOOST_CHECK_THROW(parse_fit_command({"run.csv", "--aux-degree", "1"}), UsageError);
  BOOST_CHECK_THROW(parse_fit_command({"run.csv", "--divider-position", "sensor-high"}),
                    UsageError);
  BOOST_CHECK_THROW(parse_fit_command({"run.csv", "--reference-transform", "kelvin"}), UsageError);
  BOOST_CHECK_THROW(parse_fit_command({"run.csv", "--aux", "reading"}), UsageError);
  BOOST_CHECK_THROW(parse_fit_command({"run.csv", "--aux", "t", "--through-origin"}), UsageError);
}
