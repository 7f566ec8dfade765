// Record integrity for consumers: load_record_checked refuses a record edited
// by hand (or without a digest) unless allow_modified, and says how to
// re-create it; hostile record files are InputErrors, never crashes.
#define BOOST_TEST_MODULE record_guard
#include <boost/test/unit_test.hpp>
#include <cstdio>
#include <fstream>
#include <string>

#include "ridgecal/atomic_file.hpp"
#include "ridgecal/errors.hpp"
#include "ridgecal/record_guard.hpp"
#include "test_support.hpp"

using namespace ridgecal;

namespace {
std::string good_text() {
  const Dataset ds =
      test::synthetic_run([](double x) { return 1.0 + 2.0 * x; }, 0.0, 5.0, 8, 2, 0.01, 9);
  FitOptions o;
  o.degrees = {1, 2};
  const FitOutcome fit = fit_calibration(ds, o);
  BOOST_REQUIRE(fit.status.ok);
  CalibrationRecord rec;
  rec.tool_version = tool_version();
  rec.sensor = {"guard probe", "counts", "degC"};
  rec.input = {"g.csv", ds.sha256, ds.rows.size(), CsvOptions{}};
  rec.calibration = fit.calibration;
  return record_text(record_to_json(rec));
}

std::string error_of(const std::string& text, bool allow) {
  try {
    check_record_text(text, "rec.json", allow);
  } catch (const InputError& e) {
    return e.what();
  }
  return "(no error)";
}
bool has(const std::string& s, const std::string& n) {
  return s.find(n) != std::string::npos;
}
}  // namespace

BOOST_AUTO_TEST_CASE(intact_record_loads_from_a_file) {
  const test::TempDir tmp;
  const std::string path = tmp / "guard.json";
  write_file_atomic(path, good_text());
  const GuardedRecord r = load_record_checked(path, false);
  BOOST_TEST(!r.modified);
  BOOST_TEST(r.record.sensor.name == "guard probe");
  BOOST_TEST(r.seal.intact());
  BOOST_TEST(r.seal.stored == r.seal.computed);
  std::remove(path.c_str());
  BOOST_CHECK_THROW(load_record_checked(path, false), InputError);  // gone
}

BOOST_AUTO_TEST_CASE(edited_record_is_refused_with_how_to_recreate_it) {
  std::string text = good_text();
  const std::size_t at = text.find("\"guard probe\"");
  BOOST_REQUIRE(at != std::string::npos);
  text.replace(at, 13, "\"guard Probe\"");
  const std::string e = error_of(text, false);
  BOOST_TEST(has(e, "rec.json: the record was modified after ridgecal wrote it"), e);
  BOOST_TEST(has(e, "ridgecal fit"), e);
  BOOST_TEST(has(e, "--allow-modified"), e);
  const GuardedRecord r = check_record_text(text, "rec.json", true);
  BOOST_TEST(r.modified);
  BOOST_TEST(r.record.sensor.name == "guard Probe");
  BOOST_TEST(has(modified_record_note("rec.json"), "rec.json was modified"));
  BOOST_TEST(has(modified_record_note("rec.json"), "--allow-modified"));
}

BOOST_AUTO_TEST_CASE(whitespace_only_edits_keep_the_record_valid) {
  // The digest is over the content, not the bytes: reformatting is no edit.
  std::string text = good_text();
  text = "\n\n" + text + "   \n";
  BOOST_TEST(!check_record_text(text, "rec.json", false).modified);
}

BOOST_AUTO_TEST_CASE(record_without_digest_is_refused) {
  nlohmann::json j = nlohmann::json::parse(good_text());
  j.erase("integrity");
  const std::string e = error_of(j.dump(), false);
  BOOST_TEST(has(e, "no integrity SHA-256"), e);
  BOOST_TEST(check_record_text(j.dump(), "rec.json", true).modified);
}

BOOST_AUTO_TEST_CASE(hostile_record_files_are_input_errors) {
  BOOST_TEST(has(error_of("{\"a\": [1, 2,\n", true), "rec.json:2: the file is not valid JSON"));
  BOOST_TEST(has(error_of("[1e99999]", true),
                 "not a usable JSON document"));  // number overflow (fuzz finding)
  BOOST_TEST(has(error_of(std::string(100000, '[') + std::string(100000, ']'), true),
                 "nests deeper than 32"));
  BOOST_TEST(has(error_of("\"[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[\"", true),
                 "top level"));  // brackets in a string
  BOOST_TEST(has(
      error_of("{\"format\": \"ridgecal-record\", \"format_version\": 18446744073709551615}", true),
      "format_version"));
  nlohmann::json j = nlohmann::json::parse(good_text());
  j["points"][0]["line"] = -5;
  BOOST_TEST(has(error_of(j.dump(), true), "points[].line' is -5"));
  j = nlohmann::json::parse(good_text());
  j["selection"]["degrees"][0] = "two";
  BOOST_TEST(
      has(error_of(j.dump(), true), "selection.degrees' holds a value that is not an integer"));
  j = nlohmann::json::parse(good_text());
  j["split"]["seed"] = -1;
  BOOST_TEST(has(error_of(j.dump(), true), "split.seed"));
}
