#include <stdlib.h>

#include <boost/test/unit_test.hpp>
#include <filesystem>
#include <fstream>
#include <regex>
#include <sstream>

#include "markup_check.hpp"
#include "ridgecal/errors.hpp"
#include "ridgecal/record.hpp"
#include "ridgecal/report/html_report.hpp"

using namespace ridgecal::report;
using nlohmann::json;
using ridgecal::CalibrationRecord;
using ridgecal::InputError;
using ridgecal::record_from_json;
using ridgecal::record_seal;
using ridgecal::report::test::check_markup;

namespace {
const std::string kDir = RIDGECAL_REPORT_TEST_DIR;

std::string read_text(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  BOOST_REQUIRE_MESSAGE(in, "cannot read " + path);
  std::ostringstream ss;
  ss << in.rdbuf();
  return ss.str();
}

json fixture(const std::string& name) {
  return json::parse(read_text(kDir + "/fixtures/record_" + name + ".json"));
}

/// The same record sealed with its own digest: the hostile fixture is
/// unsealed on purpose, and a record that fails its digest shows no verdict
/// (issue 14 item 9), so tests of the verdict box seal it first.
json resealed(json j) {
  j["integrity"]["sha256"] = ridgecal::record_digest(j);
  return j;
}

/// The report of record JSON, read as every consumer reads it (record_from_json).
std::string render(const json& j, const ReportOptions& o = {}) {
  return render_html_report(record_from_json(j, "fixture.json"), record_seal(j), o);
}

ReportOptions fixed_options() {
  ReportOptions o;
  o.date = "2026-12-02 09:00 UTC";
  o.generator_version = "golden";
  return o;
}

/// Positions of the markers in the document, in the order given; -1 when absent.
std::vector<long> positions(const std::string& html, const std::vector<std::string>& markers) {
  std::vector<long> pos;
  for (const auto& m : markers) {
    const auto p = html.find(m);
    pos.push_back(p == std::string::npos ? -1 : static_cast<long>(p));
  }
  return pos;
}

void check_self_contained(const std::string& html) {
  BOOST_TEST(html.find("<script") == std::string::npos);
  BOOST_TEST(html.find("<SCRIPT") == std::string::npos);
  // No attribute may point anywhere: no src/href at all, no url() other than
  // in-document fragment references (#id), no @import.
  // (Inside tags only: escaped user text such as "&lt;img src=x&gt;" is text, not markup.)
  BOOST_TEST(!std::regex_search(
      html, std::regex(R"(<[^>]*\s(src|href|xlink:href)\s*=[^>]*>)", std::regex::icase)));
  BOOST_TEST(
      !std::regex_search(html, std::regex(R"(<[^>]*url\(\s*[^#\s][^>]*>)", std::regex::icase)));
  const auto style_end = html.find("</style>");
  BOOST_TEST(!std::regex_search(html.substr(0, style_end),
                                std::regex(R"(url\(\s*[^#\s])", std::regex::icase)));
  BOOST_TEST(html.find("@import") == std::string::npos);
  BOOST_TEST(html.find("<iframe") == std::string::npos);
  BOOST_TEST(html.find("<img") == std::string::npos);
  BOOST_TEST(html.find("<link") == std::string::npos);
  // Never NaN or infinities as text.
  BOOST_TEST(!std::regex_search(
      html, std::regex(R"([>\s(=-](nan|inf|infinity)[<\s),])", std::regex::icase)));
}
}  // namespace

BOOST_AUTO_TEST_SUITE(html_report)

BOOST_AUTO_TEST_CASE(sections_come_in_reading_order) {
  const std::string html = render(fixture("full"), fixed_options());
  const std::vector<std::string> order = {"<header id=\"header\"",
                                          "id=\"verdict\"",
                                          "id=\"plots\"",
                                          "id=\"fig-fit\"",
                                          "id=\"fig-errors\"",
                                          "id=\"fig-validation-cv\"",
                                          "id=\"fig-validation-train\"",
                                          "id=\"metrics\"",
                                          "id=\"warnings\"",
                                          "id=\"model\"",
                                          "id=\"split\"",
                                          "id=\"cautions\"",
                                          "id=\"sign-off\"",
                                          "<footer>"};
  const auto pos = positions(html, order);
  for (std::size_t i = 0; i < order.size(); ++i) {
    BOOST_TEST_CONTEXT(order[i]) {
      BOOST_TEST(pos[i] >= 0);
      if (i > 0) BOOST_TEST(pos[i] > pos[i - 1]);
    }
  }
}

BOOST_AUTO_TEST_CASE(markup_is_well_formed_and_self_contained) {
  for (const char* name : {"basic", "full", "hostile", "surface_aux", "surface_ntc"}) {
    BOOST_TEST_CONTEXT(name) {
      const std::string html = render(fixture(name), fixed_options());
      BOOST_TEST(html.rfind("<!DOCTYPE html>", 0) == 0u);
      BOOST_TEST(check_markup(html) == "");
      check_self_contained(html);
      BOOST_TEST(html.find("@page") != std::string::npos);
      BOOST_TEST(html.find("break-inside: avoid") != std::string::npos);
    }
  }
}

BOOST_AUTO_TEST_CASE(the_checks_can_fail) {
  // The structural checks above must reject a broken document.
  BOOST_TEST(check_markup("<div><span></div></span>") != "");
  BOOST_TEST(check_markup("<p>a < b</p>") != "");
  BOOST_TEST(check_markup("<p>a & b</p>") != "");
  BOOST_TEST(check_markup("<svg><g></svg>") != "");
  BOOST_TEST(check_markup(read_text(kDir + "/fixtures/broken_report.html")) ==
             "");  // well formed ...
  const std::string broken = read_text(kDir + "/fixtures/broken_report.html");
  BOOST_TEST(std::regex_search(
      broken, std::regex(R"(<[^>]*\s(src|href)\s*=[^>]*>)")));  // ... but not self-contained
}

BOOST_AUTO_TEST_CASE(hostile_strings_are_shown_literally) {
  const json rec = resealed(fixture("hostile"));  // the statement shows in the verdict box
  const std::string html = render(rec, fixed_options());
  BOOST_TEST(html.find("<script>alert") == std::string::npos);
  BOOST_TEST(html.find("&lt;script&gt;alert(&#39;x&#39;)&lt;/script&gt; &amp; "
                       "&quot;probe&quot;\u21B5line2 Ω–µ") != std::string::npos);
  BOOST_TEST(html.find("C:\\data\\&lt;img src=x onerror=alert(1)&gt;.csv") != std::string::npos);
  BOOST_TEST(html.find("&lt;iframe src=&quot;https://example.invalid/&quot;&gt;&lt;/iframe&gt;") !=
             std::string::npos);
  BOOST_TEST(html.find("&lt;/div&gt;&lt;script&gt;x()&lt;/script&gt;") != std::string::npos);
  BOOST_TEST(html.find("sp&lt;/td&gt;") != std::string::npos);
  BOOST_TEST(html.find("a &amp; b &lt; c\u21E5tab") != std::string::npos);
  BOOST_TEST(html.find("S01&lt;&amp;&gt;") != std::string::npos);
  // Units go into the SVG axis labels too.
  BOOST_TEST(html.find("reference [°C &amp; &quot;K&quot;]") != std::string::npos);
  BOOST_TEST(html.find("<b>ohm</b>") == std::string::npos);
}

BOOST_AUTO_TEST_CASE(missing_numbers_show_as_not_available) {
  const std::string html = render(fixture("hostile"), fixed_options());
  // test RMSE and R² are null in the hostile record (NaN written by the fitter).
  const auto metrics = html.substr(html.find("id=\"metrics\""), 3000);
  BOOST_TEST(metrics.find(">n/a<") != std::string::npos);
}

BOOST_AUTO_TEST_CASE(verdict_without_tolerance_says_no_decision) {
  const std::string html = render(fixture("basic"), fixed_options());
  BOOST_TEST(html.find("class=\"verdict none\"") != std::string::npos);
  BOOST_TEST(html.find("No tolerance given \u2014 no decision") != std::string::npos);
  BOOST_TEST(html.find(">PASS<") == std::string::npos);
}

BOOST_AUTO_TEST_CASE(verdict_shows_decision_tolerance_and_rule) {
  const std::string pass = render(fixture("full"), fixed_options());
  BOOST_TEST(pass.find("class=\"verdict pass\"") != std::string::npos);
  BOOST_TEST(pass.find(">PASS<") != std::string::npos);
  BOOST_TEST(pass.find("\u00B10.1 °C") != std::string::npos);
  BOOST_TEST(pass.find("Decision rule:") != std::string::npos);
  BOOST_TEST(pass.find("U = 0.035 °C (k = 2)") != std::string::npos);
  const std::string fail = render(resealed(fixture("hostile")), fixed_options());
  BOOST_TEST(fail.find("class=\"verdict fail\"") != std::string::npos);

  // A library caller's record with a tolerance but no decision.
  const json basic = fixture("basic");
  CalibrationRecord rec = record_from_json(basic, "basic.json");
  rec.tolerance = ridgecal::ToleranceSpec{};
  rec.tolerance->offset = 0.05;
  const std::string tol_only = render_html_report(rec, record_seal(basic), fixed_options());
  BOOST_TEST(tol_only.find("The record holds no decision") != std::string::npos);
  BOOST_TEST(tol_only.find("class=\"verdict none\"") != std::string::npos);
}

BOOST_AUTO_TEST_CASE(plots_mark_train_validation_and_test_distinctly) {
  const std::string full = render(fixture("full"), fixed_options());
  BOOST_TEST(full.find(">validation (held-out fold)<") != std::string::npos);
  BOOST_TEST(full.find(">tolerance \u00B10.1 °C<") != std::string::npos);
  BOOST_TEST(full.find("expanded uncertainty") != std::string::npos);
  BOOST_TEST(full.find(">chosen: degree 2, \u03BB = 10\u207B\u2076<") != std::string::npos);
  // Without held-out predictions in the record there is no validation series.
  const std::string basic = render(fixture("basic"), fixed_options());
  BOOST_TEST(basic.find(">validation (held-out fold)<") == std::string::npos);
  BOOST_TEST(basic.find("held-out (validation) predictions are not in the record") !=
             std::string::npos);
}

BOOST_AUTO_TEST_CASE(date_is_injectable_and_defaults_to_the_record) {
  const json rec = fixture("basic");
  BOOST_TEST(render(rec, fixed_options()).find("<dd>2026-12-02 09:00 UTC</dd>") !=
             std::string::npos);
  const std::string dflt = render(rec);
  BOOST_TEST(dflt.find("<dt>Report date</dt><dd>2026-12-01T14:32:05Z</dd>") != std::string::npos);
  json no_date = rec;
  no_date.erase("created_utc");
  BOOST_TEST(render(no_date).find("<dt>Report date</dt><dd><span class=\"missing\">not recorded") !=
             std::string::npos);
}

BOOST_AUTO_TEST_CASE(sparse_records_still_render) {
  // A record of a fixed fit without a grid, without points and without an
  // assessment: every part it lacks is stated as missing.
  CalibrationRecord rec;
  rec.calibration.model = ridgecal::one_input_model(ridgecal::PolyModel{{0.0, 1.0}, {0.5, 1.0}});
  rec.calibration.selection.mode = ridgecal::SelectionMode::Fixed;
  rec.cautions.clear();
  const json j = ridgecal::record_to_json(rec);
  const std::string html = render(j, fixed_options());
  BOOST_TEST(check_markup(html) == "");
  check_self_contained(html);
  BOOST_TEST(html.find("No cross-validation grid in the record (selection mode: fixed)") !=
             std::string::npos);
  BOOST_TEST(html.find("The record lists no setpoints.") != std::string::npos);
  BOOST_TEST(html.find("The record has no warnings list.") != std::string::npos);
  BOOST_TEST(html.find("id=\"sign-off\"") != std::string::npos);
}

BOOST_AUTO_TEST_CASE(only_records_the_fitter_writes_are_read) {
  // The report never sees raw JSON: the record module reads it strictly.
  BOOST_CHECK_THROW(render(json::array()), InputError);
  BOOST_CHECK_THROW(render(json{{"format", "something-else"}}), InputError);
  // An assessment member in a layout the fitter never writes is an error
  // naming the member, not a guess (older reports read "tolerance": 0.05).
  for (const char* member : {"tolerance", "decision", "uncertainty", "warnings"}) {
    BOOST_TEST_CONTEXT(member) {
      json rec = fixture("full");
      rec[member] = 0.05;
      try {
        render(rec);
        BOOST_ERROR("accepted");
      } catch (const InputError& e) {
        BOOST_TEST(e.message().find(std::string("'") + member) != std::string::npos, e.message());
      }
    }
  }
}

BOOST_AUTO_TEST_CASE(cautions_and_sign_off_are_present) {
  // The record's cautions are shown; the report adds its own only where the
  // record does not already say the same.
  const std::string html = render(fixture("full"), fixed_options());
  const auto cautions = html.substr(html.find("id=\"cautions\""));
  BOOST_TEST(cautions.find("local codes and certified procedures") != std::string::npos);
  BOOST_TEST(cautions.find("accredited calibration laboratory") != std::string::npos);
  BOOST_TEST(cautions.find("Readings outside 92.1") != std::string::npos);
  BOOST_TEST(cautions.find("the local codes and the certified procedures") ==
             std::string::npos);  // no duplicate
  BOOST_TEST(html.find("<th>Performed by</th>") != std::string::npos);
  BOOST_TEST(html.find("<th>Reviewed by</th>") != std::string::npos);

  json bare = fixture("basic");
  bare["cautions"] = json::array();
  const std::string own = render(bare, fixed_options());
  BOOST_TEST(own.find("the local codes and the certified procedures") != std::string::npos);
  BOOST_TEST(own.find("does not replace a calibration certificate from an accredited laboratory") !=
             std::string::npos);
  BOOST_TEST(own.find("outside it the values are extrapolated") != std::string::npos);
}

BOOST_AUTO_TEST_CASE(rendering_is_deterministic) {
  const json rec = fixture("full");
  BOOST_TEST(render(rec, fixed_options()) == render(rec, fixed_options()));
}

// Golden file: the full fixture with a fixed date. After an intended change of
// the report, look at the difference, then refresh it from the build directory:
//   tests/report/render_record ../tests/report/fixtures/record_full.json
//       ../tests/report/golden/report_full.html --date "2026-12-02 09:00 UTC" --generator golden
// (one command line; see docs/report.md).
BOOST_AUTO_TEST_CASE(golden_file) {
  const std::string actual = render(fixture("full"), fixed_options());
  const std::string expected = read_text(kDir + "/golden/report_full.html");
  if (actual != expected) {
    // Kept for inspection in a fresh directory of its own (never the working
    // directory, so that `ctest -j` stays safe).
    std::string dir =
        (std::filesystem::temp_directory_path() / "ridgecal-report-golden-XXXXXX").string();
    const std::string out =
        ::mkdtemp(dir.data()) ? dir + "/report_full.actual.html" : std::string();
    if (!out.empty()) std::ofstream(out, std::ios::binary) << actual;
    std::istringstream a(actual), e(expected);
    std::string la, le;
    int line = 1;
    while (std::getline(a, la) && std::getline(e, le) && la == le) ++line;
    BOOST_ERROR("report differs from golden/report_full.html at line "
                << line << "; actual written to "
                << (out.empty() ? "(nowhere: mkdtemp failed)" : out)
                << "\n  expected: " << le.substr(0, 200) << "\n  actual:   " << la.substr(0, 200));
  }
}

BOOST_AUTO_TEST_SUITE_END()

BOOST_AUTO_TEST_SUITE(html_report_integrity)

BOOST_AUTO_TEST_CASE(header_states_whether_the_digest_matches) {
  BOOST_TEST(render(fixture("full")).find("<b>(verified)</b>") != std::string::npos);
  const std::string hostile = render(fixture("hostile"));
  BOOST_TEST(hostile.find("DOES NOT MATCH the record content") != std::string::npos);
  // Issue 14 item 9: no PASS/FAIL from the stored data, metrics marked.
  BOOST_TEST(hostile.find("class=\"verdict modified\"") != std::string::npos);
  BOOST_TEST(hostile.find("<div class=\"word\">FAIL") == std::string::npos);
  BOOST_TEST(hostile.find("not trustworthy") != std::string::npos);
  json edited = fixture("basic");
  edited["model"]["lambda"] = 0.5;  // any change after sealing
  BOOST_TEST(render(edited).find("DOES NOT MATCH") != std::string::npos);
}

BOOST_AUTO_TEST_SUITE_END()
