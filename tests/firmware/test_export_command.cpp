// Tests of `ridgecal export`: parsing (no files) and running (temp directory).
#define BOOST_TEST_MODULE export_command
#include <stdlib.h>
#include <unistd.h>

#include <boost/test/unit_test.hpp>
#include <filesystem>
#include <fstream>
#include <sstream>

#include "cli_common.hpp"
#include "export_command.hpp"
#include "fit_command.hpp"
#include "ridgecal/record.hpp"

namespace fs = std::filesystem;
using namespace ridgecal;
using namespace ridgecal::cli;

namespace {

std::string slurp(const fs::path& p) {
  std::ifstream in(p, std::ios::binary);
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}

// A record made by `ridgecal fit` from the NTC demo sample, once per process.
struct TempDir {
  fs::path dir;
  fs::path record;
  TempDir() {
    // A fresh directory of this test's own (mkdtemp): nothing else is removed.
    std::string t = (fs::temp_directory_path() / "ridgecal-export-test-XXXXXX").string();
    BOOST_REQUIRE(::mkdtemp(t.data()) != nullptr);
    dir = t;
    record = dir / "ntc.json";
    std::ostringstream out, err;
    const int rc = fit_main({std::string(RIDGECAL_SAMPLES_DIR) + "/ntc-coldstore/ntc-coldstore.csv",
                             "-o", record.string(), "--sensor", "cold store NTC", "--reading-unit",
                             "counts", "--reference-unit", "degC", "--timestamp", "none"},
                            out, err);
    BOOST_REQUIRE_MESSAGE(rc == 0, err.str());
  }
  ~TempDir() { fs::remove_all(dir); }
};

TempDir& temp() {
  static TempDir t;
  return t;
}

int run(const std::vector<std::string>& args, std::string* err_text = nullptr) {
  std::ostringstream out, err;
  const int rc = export_main(args, out, err);
  if (err_text) *err_text = err.str();
  return rc;
}

}  // namespace

BOOST_AUTO_TEST_CASE(parse_full_command) {
  const ExportCommand c = parse_export_command(
      {"rec.json", "--prefix", "ntc", "--numeric", "fixed", "-o", "ntc.h", "--raw-min", "100",
       "--raw-max", "4000", "--output-scale", "100", "--tolerance", "0.2"});
  BOOST_TEST(c.record_path == "rec.json");
  BOOST_TEST(c.output_path == "ntc.h");
  BOOST_TEST(c.options.prefix == "ntc");
  BOOST_TEST((c.options.mode == firmware::NumericMode::Fixed));
  BOOST_TEST(*c.options.raw_min == 100);
  BOOST_TEST(*c.options.raw_max == 4000);
  BOOST_TEST(c.options.output_scale == 100.0);
  BOOST_TEST(*c.tolerance == 0.2);
  const ExportCommand d = parse_export_command({"r.json", "--prefix", "p", "-o", "p.h"});
  BOOST_TEST((d.options.mode == firmware::NumericMode::Float));
  BOOST_TEST(d.options.max_deviation_fraction == 0.1);
}

BOOST_AUTO_TEST_CASE(parse_errors_are_usage_errors) {
  const std::vector<std::vector<std::string>> bad = {
      {},                                         // no record
      {"r.json", "--prefix", "p"},                // no output
      {"r.json", "-o", "p.h"},                    // no prefix
      {"r.json", "--prefix", "1p", "-o", "p.h"},  // bad prefix
      {"r.json", "--prefix", "p", "-o", "p.h", "--numeric", "half"},
      {"r.json", "--prefix", "p", "-o", "p.h", "--max-deviation-fraction", "0"},
      {"r.json", "--prefix", "p", "-o", "p.h", "--tolerance", "-1"},
      {"r.json", "--prefix", "p", "-o", "p.h", "--raw-min", "9", "--raw-max", "3"},
      {"a.json", "b.json", "--prefix", "p", "-o", "p.h"},
      {"r.json", "--prefix", "p", "-o", "p.h", "--bogus"},
  };
  for (const auto& args : bad) BOOST_CHECK_THROW(parse_export_command(args), UsageError);
}

BOOST_AUTO_TEST_CASE(export_writes_header_exit_0) {
  for (const char* mode : {"float", "double", "fixed"}) {
    const fs::path h = temp().dir / (std::string("ok_") + mode + ".h");
    std::string err;
    BOOST_TEST(run({temp().record.string(), "--prefix", "ntc", "--numeric", mode,
                    "--allow-unpassed", "-o", h.string()},
                   &err) == kExitOk,
               err);
    const std::string text = slurp(h);
    BOOST_TEST(text.find("#define NTC_FORMAT_VERSION 2") != std::string::npos);
    BOOST_TEST(text.find("#define NTC_VERDICT NTC_VERDICT_NOT_JUDGED\n") != std::string::npos);
    BOOST_TEST(text.find("cold store NTC") != std::string::npos);
    // the record's integrity digest is the SHA-256 in the QA block
    const std::string digest = record_digest(read_record_json(temp().record.string()));
    BOOST_TEST(text.find(digest) != std::string::npos);
  }
}

BOOST_AUTO_TEST_CASE(refused_export_exit_1_keeps_existing_file) {
  const fs::path h = temp().dir / "keep.h";
  std::ofstream(h) << "previous header\n";
  std::string err;
  // tolerance 1e-6: even binary32 rounding exceeds 0.1 x 1e-6
  BOOST_TEST(run({temp().record.string(), "--prefix", "ntc", "--numeric", "float", "--tolerance",
                  "1e-6", "--allow-unpassed", "-o", h.string()},
                 &err) == kExitOutOfTolerance);
  BOOST_TEST(err.find("refused") != std::string::npos, err);
  BOOST_TEST(slurp(h) == "previous header\n");
  // no temporary files left behind
  int files = 0;
  for (const auto& e : fs::directory_iterator(temp().dir))
    files += e.path().filename().string().rfind("keep", 0) == 0;
  BOOST_TEST(files == 1);
}

// Issue 14: a record that did not pass never becomes a header by accident.
// Without --allow-unpassed a record that is not judged (no tolerance) or FAIL
// is refused with exit 1, nothing written and an existing file kept; a PASS
// record needs no flag and says PASS to the compiler.
BOOST_AUTO_TEST_CASE(unpassed_record_refused_without_allow_unpassed) {
  const fs::path h = temp().dir / "unpassed.h";
  std::ofstream(h) << "previous header\n";
  std::string err;
  BOOST_TEST(run({temp().record.string(), "--prefix", "ntc", "-o", h.string()}, &err) ==
             kExitOutOfTolerance);
  BOOST_TEST(err.find("refused: it has no verdict (no tolerance was given when it was fitted); "
                      "nothing written") != std::string::npos,
             err);
  BOOST_TEST(err.find("--allow-unpassed") != std::string::npos, err);
  BOOST_TEST(slurp(h) == "previous header\n");

  const fs::path failed = temp().dir / "failed.json";
  {
    std::ostringstream out, e;
    const int rc =
        fit_main({std::string(RIDGECAL_SAMPLES_DIR) + "/ntc-coldstore/ntc-coldstore.csv", "-o",
                  failed.string(), "--timestamp", "2026-05-06T07:08:09Z", "--tol-offset", "1e-5"},
                 out, e);
    BOOST_REQUIRE_MESSAGE(rc == kExitOutOfTolerance, e.str());
  }
  // (--tolerance 1: the refusal rule of the header arithmetic must not be what refuses)
  BOOST_TEST(run({failed.string(), "--prefix", "ntc", "--tolerance", "1", "-o", h.string()},
                 &err) == kExitOutOfTolerance);
  BOOST_TEST(err.find("refused: its verdict is FAIL; nothing written") != std::string::npos, err);
  BOOST_TEST(slurp(h) == "previous header\n");
  BOOST_TEST(run({failed.string(), "--prefix", "ntc", "--tolerance", "1", "--allow-unpassed", "-o",
                  h.string()},
                 &err) == kExitOk,
             err);
  const std::string text = slurp(h);
  BOOST_TEST(text.find("#define NTC_VERDICT NTC_VERDICT_FAIL\n") != std::string::npos);
  BOOST_TEST(text.find("#define NTC_CALIBRATION_DATE \"2026-05-06T07:08:09Z\"") !=
             std::string::npos);
  const std::string digest = record_digest(read_record_json(failed.string()));
  BOOST_TEST(text.find("#define NTC_RECORD_SHA256 \"" + digest + "\"") != std::string::npos);
}

BOOST_AUTO_TEST_CASE(bad_input_exit_2_writes_nothing) {
  const fs::path h = temp().dir / "never.h";
  BOOST_TEST(run({(temp().dir / "missing.json").string(), "--prefix", "p", "-o", h.string()}) ==
             kExitBadInput);
  BOOST_TEST(run({temp().record.string(), "--prefix", "_P", "-o", h.string()}) == kExitBadInput);
  // a record edited after it was written fails its integrity check
  std::string text = slurp(temp().record);
  const auto pos = text.find("\"reading_unit\": \"counts\"");
  BOOST_REQUIRE(pos != std::string::npos);
  text.replace(pos, 24, "\"reading_unit\": \"COUNTS\"");
  const fs::path edited = temp().dir / "edited.json";
  std::ofstream(edited) << text;
  std::string err;
  BOOST_TEST(run({edited.string(), "--prefix", "p", "-o", h.string()}, &err) == kExitBadInput);
  BOOST_TEST(err.find("integrity") != std::string::npos, err);
  BOOST_TEST(!fs::exists(h));
}

BOOST_AUTO_TEST_CASE(help_exits_0) {
  std::ostringstream out, err;
  BOOST_TEST(export_main({"--help"}, out, err) == kExitOk);
  BOOST_TEST(out.str().find("--numeric") != std::string::npos);
}

BOOST_AUTO_TEST_CASE(record_tolerance_and_decision_are_used) {
  // A record assessed by `ridgecal fit` against +-(0.05 + 0.001*|reference|):
  // the refusal rule takes the strictest limit over the range, the QA block
  // shows the formula and the record's verdict.
  const fs::path rec = temp().dir / "assessed.json";
  {
    std::ostringstream out, err;
    const int rc =
        fit_main({std::string(RIDGECAL_SAMPLES_DIR) + "/ntc-coldstore/ntc-coldstore.csv", "-o",
                  rec.string(), "--reading-unit", "counts", "--reference-unit", "degC",
                  "--timestamp", "none", "--tol-offset", "0.05", "--tol-proportional", "0.001"},
                 out, err);
    BOOST_REQUIRE_MESSAGE(rc == 0, err.str());
  }
  const fs::path h = temp().dir / "assessed.h";
  std::string err;
  BOOST_TEST(run({rec.string(), "--prefix", "ntc", "-o", h.string()}, &err) == kExitOk, err);
  const std::string text = slurp(h);
  BOOST_TEST(text.find("+-(0.05 + 0.001*|reference|) (user)") != std::string::npos);
  BOOST_TEST(text.find("result:              PASS: ") != std::string::npos);
  BOOST_TEST(text.find("#define NTC_VERDICT NTC_VERDICT_PASS\n") != std::string::npos);
  BOOST_TEST(text.find("(record tolerance)") != std::string::npos);
  // strictest limit is at the reference value closest to 0: >= 0.05
  const auto pos = text.find("tolerance used:");
  BOOST_REQUIRE(pos != std::string::npos);
  const double used = std::stod(text.substr(pos + 15));
  BOOST_TEST(used >= 0.05);
  BOOST_TEST(used < 0.06);
  // fixed mode: 1/1000 degC rounding (5e-4) is within 0.1 x 0.05
  BOOST_TEST(run({rec.string(), "--prefix", "ntc", "--numeric", "fixed", "-o", h.string()}) ==
             kExitOk);
  // an explicit --tolerance wins over the record's
  BOOST_TEST(run({rec.string(), "--prefix", "ntc", "--numeric", "fixed", "--tolerance", "0.001",
                  "-o", h.string()}) == kExitOutOfTolerance);
}

// ---- extended (surface) records -------------------------------------------------

namespace {

// Fits a demo with the extended options (docs/compensation-and-transforms.md).
fs::path fit_extended(const std::string& name, std::vector<std::string> args) {
  const fs::path rec = temp().dir / (name + ".json");
  args.insert(args.end(), {"-o", rec.string(), "--timestamp", "none"});
  std::ostringstream out, err;
  const int rc = fit_main(args, out, err);
  BOOST_REQUIRE_MESSAGE(rc == 0, err.str());
  return rec;
}

fs::path pressure_record() {
  static const fs::path rec = fit_extended(
      "pt7",
      {std::string(RIDGECAL_SAMPLES_DIR) + "/pressure-tempco/pressure-tempco.csv", "--setpoint",
       "setpoint", "--aux", "temperature", "--aux-setpoint", "chamber", "--aux-degree", "0..3",
       "--sensor", "test rig PT-7", "--reading-unit", "counts", "--reference-unit", "bar"});
  return rec;
}

fs::path thermistor_record() {
  static const fs::path rec = fit_extended(
      "ntc-sh", {std::string(RIDGECAL_SAMPLES_DIR) + "/ntc-coldstore/ntc-coldstore.csv",
                 "--setpoint",
                 "setpoint",
                 "--divider-resistor",
                 "47000",
                 "--divider-full-scale",
                 "4095",
                 "--divider-position",
                 "sensor-low",
                 "--reading-transform",
                 "ln",
                 "--reference-transform",
                 "reciprocal-kelvin",
                 "--powers",
                 "0,1,3",
                 "--degree",
                 "3",
                 "--lambda",
                 "0",
                 "--reading-unit",
                 "counts",
                 "--reference-unit",
                 "degC"});
  return rec;
}

}  // namespace

BOOST_AUTO_TEST_CASE(pressure_tempco_record_exports_in_every_mode) {
  const fs::path rec = pressure_record();
  for (const char* mode : {"float", "double", "fixed"}) {
    const fs::path h = temp().dir / (std::string("pt7_") + mode + ".h");
    std::ostringstream out, err;
    std::vector<std::string> args = {rec.string(), "--prefix",         "pt7", "--numeric",
                                     mode,         "--allow-unpassed", "-o",  h.string()};
    if (std::string(mode) == "fixed")
      args.insert(args.end(), {"--aux-scale", "100", "--output-scale", "100000"});
    BOOST_TEST(export_main(args, out, err) == kExitOk, mode << ": " << err.str());
    BOOST_TEST(out.str().find("extended model") != std::string::npos, out.str());
    const std::string text = slurp(h);
    BOOST_TEST(text.find("#define PT7_HAS_AUX 1") != std::string::npos);
    BOOST_TEST(text.find("test rig PT-7") != std::string::npos);
    BOOST_TEST(text.find("aux unit:            temperature units") != std::string::npos);
    BOOST_TEST(text.find("#include <math.h>") == std::string::npos);
    if (std::string(mode) == "fixed")
      BOOST_TEST(text.find("pt7_eval_fixed(int32_t raw, int32_t raw_aux)") != std::string::npos);
    else
      BOOST_TEST(text.find(std::string("pt7_eval(") + mode + " x, " + mode + " aux)") !=
                 std::string::npos);
    const std::string digest = record_digest(read_record_json(rec.string()));
    BOOST_TEST(text.find(digest) != std::string::npos);
  }
  // the refusal rule applies as in 1-D: float rounding cannot meet 0.1 x 1e-7
  const fs::path h = temp().dir / "pt7_refused.h";
  std::ostringstream out, err;
  BOOST_TEST(export_main({rec.string(), "--prefix", "pt7", "--tolerance", "1e-7",
                          "--allow-unpassed", "-o", h.string()},
                         out, err) == kExitOutOfTolerance);
  BOOST_TEST(err.str().find("max deviation") != std::string::npos, err.str());
  BOOST_TEST(!fs::exists(h));
}

BOOST_AUTO_TEST_CASE(thermistor_record_exports_float_and_double_refuses_fixed) {
  const fs::path rec = thermistor_record();
  for (const char* mode : {"float", "double"}) {
    const fs::path h = temp().dir / (std::string("sh_") + mode + ".h");
    std::ostringstream out, err;
    BOOST_TEST(export_main({rec.string(), "--prefix", "ntc", "--numeric", mode, "--allow-unpassed",
                            "-o", h.string()},
                           out, err) == kExitOk,
               err.str());
    const std::string text = slurp(h);
    BOOST_TEST(text.find("#include <math.h>") != std::string::npos);
    BOOST_TEST(text.find("needs log()/logf() from the C library (libm;") != std::string::npos);
    BOOST_TEST(text.find("NTC_DIVIDER_R 47000") != std::string::npos);
  }
  const fs::path h = temp().dir / "sh_fixed.h";
  std::ostringstream out, err;
  BOOST_TEST(export_main({rec.string(), "--prefix", "ntc", "--numeric", "fixed", "-o", h.string()},
                         out, err) == kExitBadInput);
  BOOST_TEST(err.str().find("use --numeric float or --numeric double") != std::string::npos,
             err.str());
  BOOST_TEST(!fs::exists(h));
}

BOOST_AUTO_TEST_CASE(parse_aux_options) {
  const ExportCommand c = parse_export_command({"rec.json", "--prefix", "p", "--numeric", "fixed",
                                                "-o", "p.h", "--aux-scale", "100", "--aux-raw-min",
                                                "-2000", "--aux-raw-max", "8000"});
  BOOST_TEST(c.options.aux_input_scale == 100.0);
  BOOST_TEST(*c.options.aux_raw_min == -2000);
  BOOST_TEST(*c.options.aux_raw_max == 8000);
  BOOST_CHECK_THROW(
      parse_export_command({"rec.json", "--prefix", "p", "-o", "p.h", "--aux-scale", "0"}),
      UsageError);
  BOOST_CHECK_THROW(parse_export_command({"rec.json", "--prefix", "p", "-o", "p.h", "--aux-raw-min",
                                          "5", "--aux-raw-max", "4"}),
                    UsageError);
}
