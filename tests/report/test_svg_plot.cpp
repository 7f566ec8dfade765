#include <boost/test/unit_test.hpp>
#include <cmath>
#include <regex>
#include <set>

#include "markup_check.hpp"
#include "ridgecal/report/svg_plot.hpp"

using namespace ridgecal::report;
using ridgecal::report::test::check_markup;

namespace {
std::size_t count(const std::string& s, const std::string& what) {
  std::size_t n = 0;
  for (std::size_t p = s.find(what); p != std::string::npos; p = s.find(what, p + 1)) ++n;
  return n;
}

SvgPlot sample() {
  SvgPlot p("t1", 600, 300);
  p.x_axis.label = "reading [ohm]";
  p.y_axis.label = "error [°C]";
  Series a;
  a.name = "training";
  a.x = {1, 2, 3, NAN, 5};
  a.y = {0.1, -0.2, 0.05, 1.0, INFINITY};
  a.draw_line = false;
  a.style.marker = Marker::circle;
  Series b = a;
  b.name = "test";
  b.style.marker = Marker::triangle;
  b.x = {1.5, 2.5};
  b.y = {0.0, 0.1};
  p.series = {a, b};
  Band band;
  band.name = "tolerance";
  band.x = {0, 6};
  band.lo = {-0.3, -0.3};
  band.hi = {0.3, 0.3};
  band.hatched = true;
  p.bands.push_back(band);
  return p;
}
}  // namespace

BOOST_AUTO_TEST_SUITE(svg_plot)

BOOST_AUTO_TEST_CASE(output_is_well_formed_and_has_no_non_finite_numbers) {
  const std::string svg = sample().render();
  BOOST_TEST(check_markup(svg) == "");
  BOOST_TEST(svg.rfind("<svg", 0) == 0u);
  BOOST_TEST(svg.find("nan") == std::string::npos);
  BOOST_TEST(svg.find("inf") == std::string::npos);
  BOOST_TEST(svg.find("<script") == std::string::npos);
  BOOST_TEST(svg.find("http") == std::string::npos);
}

BOOST_AUTO_TEST_CASE(series_use_different_marker_shapes) {
  const std::string svg = sample().render();
  // 3 finite training points as circles (+1 legend sample); 2 test triangles (+1).
  BOOST_TEST(count(svg, "<circle") == 4u);
  BOOST_TEST(count(svg, "Z\" fill=\"#1f3b73\"") == 3u);
  BOOST_TEST(svg.find("-hatch0") != std::string::npos);
  BOOST_TEST(svg.find(">training<") != std::string::npos);
  BOOST_TEST(svg.find(">tolerance<") != std::string::npos);
}

BOOST_AUTO_TEST_CASE(markers_are_distinct) {
  std::set<std::string> seen;
  for (Marker m : {Marker::circle, Marker::square, Marker::triangle, Marker::triangle_down,
                   Marker::diamond, Marker::cross, Marker::plus}) {
    const std::string s = svg_marker(m, 10, 10, 8, "#000", true);
    BOOST_TEST(check_markup(s) == "");
    BOOST_TEST(seen.insert(s).second);
  }
  BOOST_TEST(svg_marker(Marker::none, 0, 0, 8, "#000", true).empty());
  BOOST_TEST(svg_marker(Marker::circle, 0, 0, 8, "#000", false).find("fill=\"#ffffff\"") !=
             std::string::npos);
}

BOOST_AUTO_TEST_CASE(labels_and_names_are_escaped) {
  SvgPlot p = sample();
  p.x_axis.label = "<b>x</b> & \"y\"";
  p.series[0].name = "</text><script>";
  const std::string svg = p.render();
  BOOST_TEST(check_markup(svg) == "");
  BOOST_TEST(svg.find("&lt;b&gt;x&lt;/b&gt; &amp; &quot;y&quot;") != std::string::npos);
  BOOST_TEST(svg.find("<script") == std::string::npos);
}

BOOST_AUTO_TEST_CASE(log_axis_puts_zero_at_a_separate_tick) {
  SvgPlot p("t2", 400, 260);
  p.x_axis.scale = Scale::log;
  p.x_axis.zero_slot = true;
  Series s;
  s.name = "degree 2";
  s.x = {0.0, 1e-6, 1e-5, 1e-4};
  s.y = {0.02, 0.019, 0.03, 0.2};
  s.style.marker = Marker::square;
  p.series = {s};
  const std::string svg = p.render();
  BOOST_TEST(check_markup(svg) == "");
  BOOST_TEST(svg.find(">0</text>") != std::string::npos);
  BOOST_TEST(svg.find(">10\u207B\u2076</text>") != std::string::npos);
  // The zero point is plotted (left of the first decade), not dropped.
  const std::regex rect(
      R"~(<rect x="([0-9.]+)" y="[0-9.]+" width="[0-9.]+" height="[0-9.]+" fill="#1f3b73")~");
  std::vector<double> xs;
  for (auto it = std::sregex_iterator(svg.begin(), svg.end(), rect); it != std::sregex_iterator();
       ++it)
    xs.push_back(std::stod((*it)[1]));
  BOOST_REQUIRE(xs.size() == 5u);  // 4 points + legend sample
  BOOST_TEST(xs[0] < xs[1]);
  BOOST_TEST(xs[1] < xs[2]);
}

BOOST_AUTO_TEST_CASE(without_zero_slot_a_log_axis_drops_zero_and_negative) {
  SvgPlot p("t3", 400, 260);
  p.x_axis.scale = Scale::log;
  Series s;
  s.x = {0.0, -1.0, 1e-3};
  s.y = {1, 2, 3};
  s.style.marker = Marker::diamond;
  s.draw_line = false;
  p.series = {s};
  const std::string svg = p.render();
  BOOST_TEST(check_markup(svg) == "");
  BOOST_TEST(count(svg, "Z\" fill=\"#1f3b73\"") == 1u);
}

BOOST_AUTO_TEST_CASE(shared_legend_strip) {
  SvgPlot p = sample();
  p.show_legend = false;
  const std::string svg = p.render();
  BOOST_TEST(svg.find("class=\"legend\"") == std::string::npos);
  const std::string legend = p.render_legend(600);
  BOOST_TEST(check_markup(legend) == "");
  BOOST_TEST(legend.find(">training<") != std::string::npos);
  BOOST_TEST(legend.find("t1-legend-hatch0") != std::string::npos);
}

BOOST_AUTO_TEST_CASE(same_input_renders_identically) {
  BOOST_TEST(sample().render() == sample().render());
}

BOOST_AUTO_TEST_SUITE_END()
