// The report of extended ("surface") records: a second input and transforms.
// Fixtures (made by the real fitter, see fixtures/README.md):
//   record_surface_aux.json  pressure transmitter, reading x temperature, 9 terms, guarded decision
//   record_surface_ntc.json  thermistor through a divider, ln and 1/T, powers {0,1,3}
#include <boost/test/unit_test.hpp>
#include <cmath>
#include <fstream>
#include <sstream>

#include "markup_check.hpp"
#include "ridgecal/errors.hpp"
#include "ridgecal/record.hpp"
#include "ridgecal/report/html_report.hpp"
#include "ridgecal/report/number_format.hpp"

using namespace ridgecal::report;
using nlohmann::json;
using ridgecal::report::test::check_markup;

namespace {
const std::string kDir = RIDGECAL_REPORT_TEST_DIR;

json fixture(const std::string& name) {
  std::ifstream in(kDir + "/fixtures/record_" + name + ".json", std::ios::binary);
  BOOST_REQUIRE_MESSAGE(in, "cannot read fixture " + name);
  std::ostringstream ss;
  ss << in.rdbuf();
  return json::parse(ss.str());
}

/// The report of record JSON, read as every consumer reads it (record_from_json).
std::string render(const json& j, const ReportOptions& o) {
  return render_html_report(ridgecal::record_from_json(j, "fixture.json"), ridgecal::record_seal(j),
                            o);
}

ReportOptions fixed_options() {
  ReportOptions o;
  o.date = "2026-12-02 09:00 UTC";
  o.generator_version = "test";
  return o;
}

/// The <svg> element with the given id.
std::string svg_by_id(const std::string& html, const std::string& id) {
  const auto at = html.find("id=\"" + id + "\"");
  if (at == std::string::npos) return {};
  const auto start = html.rfind("<svg", at);
  const auto end = html.find("</svg>", at);
  return html.substr(start, end + 6 - start);
}

std::size_t count(const std::string& s, const std::string& what) {
  std::size_t n = 0;
  for (auto p = s.find(what); p != std::string::npos; p = s.find(what, p + what.size())) ++n;
  return n;
}

/// Section between id="ID" and the next </section>.
std::string section(const std::string& html, const std::string& id) {
  const auto at = html.find("<section id=\"" + id + "\"");
  if (at == std::string::npos) return {};
  return html.substr(at, html.find("</section>", at) - at);
}
}  // namespace

BOOST_AUTO_TEST_SUITE(surface_report)

BOOST_AUTO_TEST_CASE(two_input_record_shows_every_view_in_order) {
  const std::string html = render(fixture("surface_aux"), fixed_options());
  BOOST_TEST(check_markup(html) == "");
  const std::vector<std::string> order = {
      "id=\"fig-fit\"",       "id=\"fig-errors\"",    "id=\"fig-resid-reading\"",
      "id=\"fig-resid-aux\"", "id=\"fig-resid-map\"", "id=\"fig-validation-cv\"",
      "id=\"metrics\"",       "id=\"model\"",         "id=\"split\""};
  long last = -1;
  for (const auto& m : order) {
    const auto p = html.find(m);
    BOOST_TEST_CONTEXT(m) {
      BOOST_REQUIRE(p != std::string::npos);
      BOOST_TEST(static_cast<long>(p) > last);
    }
    last = static_cast<long>(p);
  }
  // Figures are numbered in order: the validation curve comes after the three residual views.
  BOOST_TEST(
      html.find("<b>Figure 3.</b> Error (predicted \u2212 reference) against the reading (left)") !=
      std::string::npos);
  BOOST_TEST(html.find("<b>Figure 4.</b> Residual map") != std::string::npos);
  BOOST_TEST(html.find("<b>Figure 5.</b> Validation curve") != std::string::npos);
  // Roles as in the 1-D report: training, validation (held-out fold) and test series.
  for (const char* id : {"fig-resid-reading-legend"}) {
    const std::string svg = svg_by_id(html, id);
    BOOST_TEST(svg.find(">training (in-fit)<") != std::string::npos);
    BOOST_TEST(svg.find(">validation (held-out fold)<") != std::string::npos);
    BOOST_TEST(svg.find(">test<") != std::string::npos);
  }
  BOOST_TEST(svg_by_id(html, "fig-resid-aux").find(">temperature (second input)<") !=
             std::string::npos);
  // The fit figure draws the surface at three temperatures.
  const std::string fit = svg_by_id(html, "fig-fit");
  BOOST_TEST(fit.find(">temperature = -20.53<") != std::string::npos);
  BOOST_TEST(fit.find(">temperature = 79.87<") != std::string::npos);
}

BOOST_AUTO_TEST_CASE(model_section_states_terms_transforms_and_both_ranges) {
  const json rec = fixture("surface_aux");
  const std::string model = section(render(rec, fixed_options()), "model");
  BOOST_TEST(model.find("9 terms") != std::string::npos);
  BOOST_TEST(model.find("tensor Chebyshev") != std::string::npos);
  BOOST_TEST(model.find("<dt>Transforms</dt><dd>none") != std::string::npos);
  for (int k = 0; k < 2; ++k) {
    const json& sc = rec["compensation"]["inputs"][k]["scaling"];
    const std::string range = format_sig(sc["min"].get<double>(), 8) + " \u2026 " +
                              format_sig(sc["max"].get<double>(), 8);
    BOOST_TEST(model.find(range) != std::string::npos, "input " << k << " range " << range);
    BOOST_TEST(model.find(format_sig(sc["half_width"].get<double>(), 8)) != std::string::npos);
  }
  // Every term's coefficient at full precision, with its (i, j).
  for (const json& t : rec["compensation"]["terms"])
    BOOST_TEST(model.find(format_exact(t["coefficient"].get<double>())) != std::string::npos);
  BOOST_TEST(count(model, "<td class=\"num mono\">") == rec["compensation"]["terms"].size());
  BOOST_TEST(model.find("The record holds no coefficients") == std::string::npos);
  // The split lists the temperature of each group; the cautions name both inputs.
  const std::string html = render(rec, fixed_options());
  BOOST_TEST(section(html, "split").find("<th class=\"num\">temperature</th>") !=
             std::string::npos);
  BOOST_TEST(section(html, "cautions").find("<b>both</b> inputs") != std::string::npos);
  // The budget and the guarded rule of the record are shown.
  const std::string metrics = section(html, "metrics");
  for (const json& c : rec["uncertainty"]["components"])
    BOOST_TEST(metrics.find(">" + format_sig(c["standard"].get<double>(), 3) + "<") !=
               std::string::npos);
  BOOST_TEST(metrics.find("<b>" + format_sig(rec["uncertainty"]["expanded"].get<double>(), 3) +
                          "</b>") != std::string::npos);
}

BOOST_AUTO_TEST_CASE(residual_map_bins_every_point_by_its_error) {
  const json rec = fixture("surface_aux");
  const std::string map = svg_by_id(render(rec, fixed_options()), "fig-resid-map");
  BOOST_REQUIRE(!map.empty());
  // Largest |error| of this record is 0.00369 bar: bins of 0.002 bar, edges -0.006 ... 0.006.
  double worst = 0;
  for (const json& p : rec["points"])
    worst = std::max(worst, std::fabs(p["predicted"].get<double>() - p["reference"].get<double>()));
  BOOST_REQUIRE(worst > 0.003 && worst < 0.006);
  const double edges[] = {-0.006, -0.004, -0.002, 0.0, 0.002, 0.004, 0.006};
  const char* colors[] = {"#2166ac", "#4393c3", "#92c5de", "#f4a582", "#d6604d", "#b2182b"};
  std::size_t expected[6] = {};
  std::size_t tests = 0;
  for (const json& p : rec["points"]) {
    const double e = p["predicted"].get<double>() - p["reference"].get<double>();
    int k = 0;
    while (k < 5 && e >= edges[k + 1]) ++k;
    ++expected[k];
    tests += p["role"].get<std::string>() == "test";
  }
  for (int k = 0; k < 6; ++k) {
    BOOST_TEST_CONTEXT("bin " << k) {
      // One marker per point, plus the bin's legend entry.
      BOOST_TEST(count(map, std::string("fill=\"") + colors[k] + "\"") == expected[k] + 1);
      const std::string label =
          ">" + format_sig(edges[k], 3) + " \u2026 " + format_sig(edges[k + 1], 3) + " bar<";
      BOOST_TEST(map.find(label) != std::string::npos, label);
    }
  }
  BOOST_TEST(tests > 0u);
  BOOST_TEST(map.find(">triangle: test point<") != std::string::npos);
  BOOST_TEST(map.find(">temperature (second input)<") != std::string::npos);
}

BOOST_AUTO_TEST_CASE(validation_curves_are_per_degree_and_aux_degree) {
  json rec = fixture("surface_aux");
  const std::string html = render(rec, fixed_options());
  BOOST_TEST(html.find(">chosen: degree 2, aux degree 2, \u03BB = 0<") != std::string::npos);
  BOOST_TEST(html.find("Chosen: degree 2, aux degree 2, \u03BB = 0 (CV RMSE") != std::string::npos);
}

BOOST_AUTO_TEST_CASE(transformed_one_input_record_draws_the_curve_in_reference_units) {
  const json rec = fixture("surface_ntc");
  const std::string html = render(rec, fixed_options());
  BOOST_TEST(check_markup(html) == "");
  const std::string fit = svg_by_id(html, "fig-fit");
  BOOST_TEST(fit.find(">fitted curve (through the transforms)<") != std::string::npos);
  BOOST_TEST(
      html.find(
          "in reference units (transforms applied: reading -&gt; divider(sensor-low, 47000 ohm") !=
      std::string::npos);
  BOOST_TEST(html.find("id=\"fig-resid-reading\"") != std::string::npos);
  BOOST_TEST(html.find("id=\"fig-resid-aux\"") == std::string::npos);  // no second input
  BOOST_TEST(html.find("id=\"fig-resid-map\"") == std::string::npos);
  const std::string model = section(html, "model");
  BOOST_TEST(model.find("plain powers t<sup>i</sup>") != std::string::npos);
  BOOST_TEST(model.find("(after the transforms)") != std::string::npos);
  BOOST_TEST(model.find("inverse reference transform") != std::string::npos);
  // The drawn curve spans the reference values of the points: its y range
  // equals the y axis the points are plotted on (no NaN, no runaway extrapolation).
  BOOST_TEST(fit.find("NaN") == std::string::npos);
  BOOST_TEST(fit.find("nan") == std::string::npos);
}

BOOST_AUTO_TEST_CASE(hostile_aux_name_is_shown_literally) {
  json rec = fixture("surface_aux");
  const std::string evil = "<script>alert(1)</script>&\"'";
  rec["input"]["columns"]["aux"] = evil;
  rec["compensation"]["inputs"][1]["column"] = evil;
  const std::string html = render(rec, fixed_options());
  BOOST_TEST(check_markup(html) == "");
  BOOST_TEST(html.find("<script") == std::string::npos);
  BOOST_TEST(html.find("&lt;script&gt;alert(1)&lt;/script&gt;&amp;&quot;&#39;") !=
             std::string::npos);
  BOOST_TEST(html.find("DOES NOT MATCH") != std::string::npos);  // edited after sealing
}

BOOST_AUTO_TEST_CASE(incomplete_surface_record_is_refused_or_stated) {
  // The record module refuses a surface record without its terms, naming the member.
  json rec = fixture("surface_aux");
  rec["compensation"].erase("terms");
  try {
    ridgecal::record_from_json(rec, "r.json");
    BOOST_ERROR("a surface record without terms was accepted");
  } catch (const ridgecal::InputError& e) {
    BOOST_TEST(e.message().find("compensation.terms") != std::string::npos, e.message());
  }
  // A library caller's record whose points carry no aux value: the views
  // that need it are stated as missing.
  const json full = fixture("surface_aux");
  ridgecal::CalibrationRecord r = ridgecal::record_from_json(full, "r.json");
  for (auto& p : r.calibration.points) p.aux = std::nan("");
  const std::string html = render_html_report(r, ridgecal::record_seal(full), fixed_options());
  BOOST_TEST(check_markup(html) == "");
  BOOST_TEST(html.find("points carry no value of the second input") != std::string::npos);
  BOOST_TEST(html.find("id=\"fig-resid-map\"") == std::string::npos);
}

BOOST_AUTO_TEST_SUITE_END()
