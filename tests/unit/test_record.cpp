// Calibration record: JSON round trip, integrity digest, rejection of bad records.
#define BOOST_TEST_MODULE record
#include <algorithm>
#include <boost/test/unit_test.hpp>
#include <filesystem>

#include "ridgecal/errors.hpp"
#include "ridgecal/record.hpp"
#include "test_support.hpp"

using namespace ridgecal;

namespace {
CalibrationRecord sample_record() {
  const Dataset ds = test::synthetic_run([](double x) { return 1.0 + 0.1 * x + 1e-4 * x * x; }, 0.0,
                                         100.0, 12, 3, 0.01, 5);
  const FitOutcome fit = fit_calibration(ds, FitOptions{});
  BOOST_REQUIRE(fit.status.ok);
  CalibrationRecord rec;
  rec.tool_version = tool_version();
  rec.created_utc = "2026-01-02T03:04:05Z";
  rec.sensor = {"probe \"7\" <b>", "counts", "degC"};
  rec.input = {"synthetic.csv", ds.sha256, ds.rows.size(), CsvOptions{}};
  rec.calibration = fit.calibration;
  return rec;
}
}  // namespace

BOOST_AUTO_TEST_CASE(round_trip_preserves_model_and_metrics) {
  const CalibrationRecord rec = sample_record();
  const nlohmann::json j = record_to_json(rec);
  BOOST_TEST(j["format"] == kRecordFormat);
  BOOST_TEST(record_integrity_ok(j));
  const auto parsed = nlohmann::json::parse(record_text(j));
  BOOST_TEST(record_integrity_ok(parsed));
  const CalibrationRecord back = record_from_json(parsed, "r.json");
  BOOST_TEST(back.calibration.model.coefficients == rec.calibration.model.coefficients);
  BOOST_TEST(back.calibration.lambda == rec.calibration.lambda);
  BOOST_TEST(back.calibration.validation.rmse == rec.calibration.validation.rmse);
  BOOST_TEST(back.calibration.selection.chosen == rec.calibration.selection.chosen);
  BOOST_TEST(back.calibration.points.size() == rec.calibration.points.size());
  BOOST_TEST(back.sensor.name == rec.sensor.name);
  // Serialising the parsed record again gives the same digest.
  BOOST_TEST(record_to_json(back)["integrity"]["sha256"] == j["integrity"]["sha256"]);
}

BOOST_AUTO_TEST_CASE(any_edit_breaks_integrity) {
  nlohmann::json j = record_to_json(sample_record());
  j["model"]["chebyshev_coefficients"][1] =
      j["model"]["chebyshev_coefficients"][1].get<double>() * (1 + 1e-15);
  BOOST_TEST(!record_integrity_ok(j));
  nlohmann::json k = record_to_json(sample_record());
  k.erase("integrity");
  BOOST_TEST(!record_integrity_ok(k));
}

BOOST_AUTO_TEST_CASE(records_carry_the_cautions) {
  const nlohmann::json j = record_to_json(sample_record());
  bool safety = false;
  for (const auto& c : j["cautions"])
    safety |= c.get<std::string>().find("local codes") != std::string::npos;
  BOOST_TEST(safety);
}

BOOST_AUTO_TEST_CASE(invalid_records_are_input_errors) {
  const nlohmann::json good = record_to_json(sample_record());
  auto expect_bad = [](const nlohmann::json& j, const std::string& needle) {
    try {
      record_from_json(j, "r.json");
      BOOST_ERROR("accepted a bad record, expected " << needle);
    } catch (const InputError& e) {
      BOOST_TEST(std::string(e.what()).find(needle) != std::string::npos, e.what());
    }
  };
  nlohmann::json j = good;
  j["format"] = "other";
  expect_bad(j, "format");
  j = good;
  j["format_version"] = 99;
  expect_bad(j, "format_version");
  j = good;
  j["model"]["chebyshev_coefficients"][0] = nullptr;
  expect_bad(j, "chebyshev_coefficients");
  j = good;
  j["model"].erase("scaling");
  expect_bad(j, "model.scaling");
  j = good;
  j["model"]["degree"] = 12;
  expect_bad(j, "model.degree");
  j = good;
  j["model"]["kind"] = "spline";
  expect_bad(j, "model.kind");
  j = good;
  j["selection"]["rule"] = "best";
  expect_bad(j, "selection.rule");
  // One stored model: the layout follows the model, so an extended layout
  // around the plain one-input polynomial is refused, naming the kind.
  CalibrationRecord ext = sample_record();
  ext.calibration.model.transforms.reading = ReadingTransform::Ln;
  BOOST_REQUIRE(is_extended(ext.calibration));
  j = record_to_json(ext);
  BOOST_REQUIRE(j["model"]["kind"] == "surface");
  j["compensation"]["transforms"]["reading"] = "none";
  expect_bad(j, "is 'surface' but the model uses no extension");
  expect_bad(nlohmann::json::array(), "top level");
}

BOOST_AUTO_TEST_CASE(nan_metrics_become_null) {
  CalibrationRecord rec = sample_record();
  rec.calibration.test = compute_metrics({}, {}, 1);
  const nlohmann::json j = record_to_json(rec);
  BOOST_TEST(j["metrics"]["test"]["rmse"].is_null());
  BOOST_TEST(record_text(j).find("NaN") == std::string::npos);
}

BOOST_AUTO_TEST_CASE(assessment_members_round_trip_and_are_read_strictly) {
  CalibrationRecord rec = sample_record();
  ToleranceSpec tol;
  tol.offset = 0.05;
  rec.tolerance = tol;
  Decision d;
  d.rule = DecisionRule::GuardedAcceptance;
  d.verdict = Verdict::Fail;
  d.statement = "one point out";
  d.sets.push_back(SetJudgement{"test", 3, 1, 0.07, 1.4, true, Verdict::Fail});
  d.points.push_back(PointJudgement{7, "test", 20.0, 0.07, 0.05, 0.01, 0.04, false});
  rec.decision = d;
  UncertaintyBudget u;
  u.combined = 0.01;
  u.expanded = 0.02;
  u.band.push_back(BandPoint{1.0, 1.1, 0.001, 0.01, 0.02});
  rec.uncertainty = u;
  Warning w;
  w.code = DiagnosticCode::CoverageGap;
  w.message = "gap";
  w.lines = {4, 5};
  rec.warnings = {w};
  const nlohmann::json j = record_to_json(rec);
  const CalibrationRecord back = record_from_json(j, "r.json");
  BOOST_REQUIRE(back.tolerance);
  BOOST_TEST(back.tolerance->offset == 0.05);
  BOOST_REQUIRE(back.decision);
  BOOST_TEST(!back.decision->pass());
  BOOST_TEST((back.decision->rule == DecisionRule::GuardedAcceptance));
  BOOST_TEST(back.decision->points.size() == 1u);
  BOOST_TEST(back.decision->points[0].acceptance_limit == 0.04);
  BOOST_REQUIRE(back.uncertainty);
  BOOST_TEST(back.uncertainty->band.size() == 1u);
  BOOST_TEST(back.warnings.size() == 1u);
  BOOST_TEST(back.warnings[0].lines.size() == 2u);
  // The seal: stored and recomputed digests.
  BOOST_TEST(record_seal(j).intact());
  nlohmann::json edited = j;
  edited["decision"]["verdict"] = "PASS";
  BOOST_TEST(!record_seal(edited).intact());
  BOOST_TEST(record_seal(edited).stored == j["integrity"]["sha256"].get<std::string>());
  // A member in another layout is an error naming it, not a silently missing verdict.
  for (const char* member : {"tolerance", "decision", "uncertainty", "warnings"}) {
    nlohmann::json bad = j;
    bad[member] = "PASS";
    try {
      record_from_json(bad, "bad.json");
      BOOST_ERROR(member << " in another layout was accepted");
    } catch (const InputError& e) {
      BOOST_TEST(e.message().find(std::string("record member '") + member) != std::string::npos,
                 e.message());
    }
  }
  nlohmann::json bad = j;
  bad["decision"].erase("verdict");
  BOOST_CHECK_THROW(record_from_json(bad, "bad.json"), InputError);
}

// Every golden record (tests/golden/outputs: one-input and extended, fit and
// batch) read and written again gives the same bytes: the one reader and the
// one writer agree on every member of both layouts.
BOOST_AUTO_TEST_CASE(golden_records_read_and_write_back_byte_identical) {
  namespace fs = std::filesystem;
  const fs::path dir = fs::path(RIDGECAL_TEST_DATA_DIR) / ".." / "golden" / "outputs";
  std::vector<fs::path> files;
  for (const auto& e : fs::recursive_directory_iterator(dir))
    if (e.is_regular_file() && e.path().extension() == ".json") files.push_back(e.path());
  std::sort(files.begin(), files.end());
  std::size_t records = 0, extended = 0;
  std::string first;
  for (const fs::path& p : files) {
    const std::string text = test::slurp(p);
    const nlohmann::json j = parse_record_json(text, p.string());
    if (j.value("format", "") != kRecordFormat) continue;  // batch summaries
    ++records;
    if (j["model"]["kind"] == "surface") ++extended;
    if (first.empty()) first = text;
    const std::string again = record_text(record_to_json(record_from_json(j, p.string())));
    BOOST_TEST((again == text), p.filename().string() << " does not read back byte-identical");
  }
  // 14 records, 4 of them extended, when this test was written.
  BOOST_TEST(records >= 14u);
  BOOST_TEST(extended >= 4u);
  // The comparison sees a member the writer would not write back.
  BOOST_REQUIRE(!first.empty());
  nlohmann::json edited = nlohmann::json::parse(first);
  edited["model"]["unknown_member"] = 1;
  edited["integrity"]["sha256"] = record_digest(edited);
  BOOST_TEST(record_text(record_to_json(record_from_json(edited, "edited.json"))) !=
             record_text(edited));
}
