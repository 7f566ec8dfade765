// One pipeline (issue 12): calibrate() (calibrate.hpp) is fit -> assess ->
// record, used by `ridgecal fit`, `ridgecal batch` and library callers. The
// same unit gives the same record, verdict and warnings through all three; in
// particular the direction column reaches the hysteresis check in a batch too,
// for one-input and two-input fits.
#define BOOST_TEST_MODULE calibrate
#include <boost/test/unit_test.hpp>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include "batch_command.hpp"
#include "cli_common.hpp"
#include "fit_command.hpp"
#include "ridgecal/calibrate.hpp"
#include "ridgecal/record.hpp"
#include "test_support.hpp"

namespace fs = std::filesystem;
using namespace ridgecal;
using namespace ridgecal::cli;

namespace {

using ridgecal::test::call_main;
using ridgecal::test::slurp;
using ridgecal::test::TempDir;

const std::string kSamples = RIDGECAL_SAMPLES_DIR;

// The data rows (comments and header dropped) and the header of a sample.
struct Csv {
  std::string header;
  std::vector<std::string> rows;
};
Csv read_sample(const std::string& path) {
  Csv c;
  std::ifstream in(path);
  for (std::string line; std::getline(in, line);) {
    if (line.empty() || line[0] == '#') continue;
    if (c.header.empty())
      c.header = line;
    else
      c.rows.push_back(line);
  }
  return c;
}

// Writes the same rows as a single-run file and as a one-unit batch file, on
// the same lines, so that line numbers in warnings agree.
void write_pair(const Csv& c, const fs::path& single, const fs::path& batch) {
  std::ofstream s(single), b(batch);
  s << c.header << "\n";
  b << "unit," << c.header << "\n";
  for (const std::string& r : c.rows) {
    s << r << "\n";
    b << "U1," << r << "\n";
  }
}

// The pressure demo swept up and down: each row once as `up` and once as
// `down` with the reading 40 counts higher (about 0.012 bar of hysteresis,
// invented for this test).
Csv pressure_with_direction() {
  const Csv src = read_sample(kSamples + "/pressure-tempco/pressure-tempco.csv");
  BOOST_REQUIRE(src.header == "setpoint,chamber,temperature,reading,reference");
  Csv c;
  c.header = "setpoint,chamber,temperature,reading,reference,direction";
  for (const std::string& r : src.rows) {
    std::vector<std::string> f;
    std::stringstream ss(r);
    for (std::string x; std::getline(ss, x, ',');) f.push_back(x);
    BOOST_REQUIRE(f.size() == 5u);
    c.rows.push_back(r + ",up");
    c.rows.push_back(f[0] + "," + f[1] + "," + f[2] + "," + std::to_string(std::stod(f[3]) + 40.0) +
                     "," + f[4] + ",down");
  }
  return c;
}

// A record's JSON without the members that name the input file and the unit.
nlohmann::json comparable(const fs::path& record) {
  nlohmann::json j = nlohmann::json::parse(slurp(record));
  for (const char* k : {"sensor", "input", "integrity"}) j.erase(k);
  return j;
}

bool has_code(const nlohmann::json& rec, const std::string& code) {
  for (const auto& w : rec.at("warnings"))
    if (w.at("code") == code) return true;
  return false;
}

// Runs `fit` on the single file and `batch` on the batch file with the same
// options and compares the records.
void fit_and_batch_agree(const Csv& c, const std::vector<std::string>& options, int expected_rc) {
  TempDir t;
  const fs::path single = t.path() / "unit.csv", batch = t.path() / "batch.csv";
  write_pair(c, single, batch);
  const fs::path rec = t.path() / "fit.json", out = t.path() / "out";
  std::vector<std::string> fit_args = {single.string(), "-o", rec.string(), "--timestamp", "none"};
  fit_args.insert(fit_args.end(), options.begin(), options.end());
  std::string text;
  BOOST_REQUIRE_MESSAGE(call_main(fit_main, fit_args, &text) == expected_rc, text);
  std::vector<std::string> batch_args = {batch.string(), "--unit",     "unit", "-o",
                                         out.string(),   "-j",         "1",    "--timestamp",
                                         "none",         "--progress", "none"};
  batch_args.insert(batch_args.end(), options.begin(), options.end());
  BOOST_REQUIRE_MESSAGE(call_main(batch_main, batch_args, &text) == expected_rc, text);
  const nlohmann::json a = comparable(rec), b = comparable(out / "records" / "U1.json");
  BOOST_TEST(has_code(a, "hysteresis"));
  BOOST_TEST(a.at("warnings") == b.at("warnings"));
  BOOST_TEST(a == b);  // the whole record but its sensor and input members
  // The summary row carries the same warnings and the record's verdict.
  const std::string summary = slurp(out / "summary.csv");
  BOOST_TEST(summary.find("hysteresis: Hysteresis") != std::string::npos, summary);
  BOOST_TEST(summary.find(a.at("decision").at("verdict").get<std::string>()) != std::string::npos);
}

}  // namespace

BOOST_AUTO_TEST_CASE(a_batch_with_a_direction_column_gives_the_warnings_of_fit_one_input) {
  const Csv c = read_sample(kSamples + "/loadcell-hopper/loadcell-hopper.csv");
  fit_and_batch_agree(
      c, {"--setpoint", "setpoint", "--direction", "direction", "--tol-offset", "0.002"},
      kExitOutOfTolerance);
}

BOOST_AUTO_TEST_CASE(a_batch_with_a_direction_column_gives_the_warnings_of_fit_two_inputs) {
  // Before calibrate(), the batch assessed two-input fits without the data:
  // the hysteresis warning was missing from its record and summary.
  fit_and_batch_agree(
      pressure_with_direction(),
      {"--setpoint", "setpoint", "--aux", "temperature", "--aux-setpoint", "chamber",
       "--aux-degree", "0..2", "--direction", "direction", "--tol-offset", "0.008"},
      kExitOutOfTolerance);
}

BOOST_AUTO_TEST_CASE(calibrate_gives_the_record_that_fit_writes) {
  TempDir t;
  const std::string path = kSamples + "/loadcell-hopper/loadcell-hopper.csv";
  const fs::path rec = t.path() / "fit.json";
  std::string text;
  BOOST_REQUIRE_MESSAGE(call_main(fit_main,
                                  {path, "--setpoint", "setpoint", "--direction", "direction",
                                   "--tol-offset", "0.002", "--sensor", "LC-3", "--timestamp",
                                   "2026-01-01T00:00:00Z", "-o", rec.string()},
                                  &text) == kExitOutOfTolerance,
                        text);
  CsvOptions csv;
  csv.setpoint_column = "setpoint";
  csv.direction_column = "direction";
  CalibrateOptions opt;
  opt.assess.tolerance = ToleranceSpec{};
  opt.assess.tolerance->offset = 0.002;
  opt.sensor.name = "LC-3";
  opt.created_utc = "2026-01-01T00:00:00Z";
  BOOST_REQUIRE(opt.validate().empty());
  const CalibrateResult r = calibrate(read_calibration_csv(path, csv), opt);
  BOOST_REQUIRE(r.status.ok);
  BOOST_TEST(record_text(record_to_json(r.record)) == slurp(rec));
  BOOST_TEST(r.verdict().has_value());
  BOOST_TEST(r.out_of_tolerance());
}

BOOST_AUTO_TEST_CASE(skip_unjudged_assessment_skips_only_without_a_tolerance) {
  const Dataset data =
      test::synthetic_run([](double x) { return 2.0 + 0.5 * x; }, 0.0, 100.0, 12, 3, 0.01, 7);
  CalibrateOptions opt;
  opt.skip_unjudged_assessment = true;
  const CalibrateResult quick = calibrate(data, opt);
  BOOST_REQUIRE(quick.status.ok);
  BOOST_TEST(!quick.record.uncertainty.has_value());
  BOOST_TEST(!quick.verdict().has_value());
  BOOST_TEST(!quick.out_of_tolerance());
  opt.skip_unjudged_assessment = false;
  const CalibrateResult full = calibrate(data, opt);
  BOOST_TEST(full.record.uncertainty.has_value());
  BOOST_TEST(!full.record.decision.has_value());  // no tolerance: not judged
  // The same fit either way.
  BOOST_TEST(record_to_json(quick.record).at("model") == record_to_json(full.record).at("model"));
  opt.skip_unjudged_assessment = true;
  opt.assess.tolerance = ToleranceSpec{};
  opt.assess.tolerance->offset = 1.0;
  const CalibrateResult judged = calibrate(data, opt);
  BOOST_TEST(judged.record.uncertainty.has_value());
  BOOST_REQUIRE(judged.verdict().has_value());
  BOOST_TEST(to_string(*judged.verdict()) == "PASS");
}

BOOST_AUTO_TEST_CASE(a_fit_that_cannot_be_made_is_a_status_not_a_record) {
  // Two setpoints cannot carry a cross-validated selection.
  const Dataset data = test::synthetic_run([](double x) { return x; }, 0.0, 1.0, 2, 3, 0.01, 1);
  CalibrateOptions opt;
  opt.assess.tolerance = ToleranceSpec{};
  opt.assess.tolerance->offset = 1.0;
  const CalibrateResult r = calibrate(data, opt);
  BOOST_TEST(!r.status.ok);
  BOOST_TEST(!r.status.message.empty());
  BOOST_TEST(!r.verdict().has_value());
}

BOOST_AUTO_TEST_CASE(validate_names_the_field) {
  CalibrateOptions opt;
  opt.fit.degrees = {};
  BOOST_TEST(opt.validate().find("degrees") != std::string::npos, opt.validate());
  opt = CalibrateOptions{};
  opt.assess.uncertainty.coverage_k = -1.0;
  BOOST_TEST(opt.validate().find("coverage_k") != std::string::npos, opt.validate());
}
