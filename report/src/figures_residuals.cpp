// ridgecal report (internal): the residual views of extended records: the
// errors against each input and the residual map over the two inputs.
#include <algorithm>
#include <cmath>

#include "report_data.hpp"
#include "ridgecal/report/number_format.hpp"

namespace ridgecal::report::detail {

namespace {

/// Residuals (predicted - reference) against one input, by role: training
/// (final fit), validation (held-out fold prediction), test.
SvgPlot residual_plot(const std::string& id, const std::vector<Point>& pts, bool against_aux,
                      const std::string& x_label, const Units& u, const ToleranceView& tol,
                      double width = 680) {
  SvgPlot p(id, width, 235);
  p.description =
      against_aux ? "Residuals against the second input" : "Residuals against the reading";
  p.x_axis.label = x_label;
  p.y_axis.label =
      "error: predicted \u2212 reference" + (u.reference.empty() ? "" : " [" + u.reference + "]");
  p.y_axis.include_zero = true;
  Series train, val, test;
  train.name = "training (in-fit)";
  val.name = "validation (held-out fold)";
  test.name = "test";
  train.style = kTrainStyle;
  val.style = kValidationStyle;
  test.style = kTestStyle;
  train.draw_line = val.draw_line = test.draw_line = false;
  double lo = kNaN, hi = kNaN;
  for (const Point& q : pts) {
    const double x = against_aux ? q.aux : q.reading;
    if (!std::isfinite(x)) continue;
    lo = std::isfinite(lo) ? std::min(lo, x) : x;
    hi = std::isfinite(hi) ? std::max(hi, x) : x;
    Series& s = q.role == "test" ? test : train;
    s.x.push_back(x);
    s.y.push_back(q.predicted - q.reference);
    if (q.role != "test" && std::isfinite(q.cv_predicted)) {
      val.x.push_back(x);
      val.y.push_back(q.cv_predicted - q.reference);
    }
  }
  if (tol.readable && tol.constant() && std::isfinite(lo) && hi > lo) {
    // A constant tolerance does not depend on the reference: draw it against any input.
    Band t;
    t.name = "tolerance \u00B1" + format_sig(tol.limit(0.0), 3) + u.reference_sfx();
    const double pad = 0.02 * (hi - lo);
    t.x = {lo - pad, hi + pad};
    t.lo = {-tol.limit(0.0), -tol.limit(0.0)};
    t.hi = {tol.limit(0.0), tol.limit(0.0)};
    t.fill = "#e4e4e4";
    t.edge_color = "#555555";
    t.edge_dash = "6 3";
    p.bands.push_back(t);
  }
  p.hlines.push_back(HLine{0.0, "#333333", 1.0, ""});
  p.series.push_back(train);
  if (!val.x.empty()) p.series.push_back(val);
  if (!test.x.empty()) p.series.push_back(test);
  return p;
}

std::vector<double> residual_scale_edges(double max_abs) {
  // Symmetric bins around 0 with a 1-2-5 step: |r| in [0, s), [s, 2s), [2s, 3s]
  // on each side, 3s >= max_abs.
  if (!(std::isfinite(max_abs) && max_abs > 0.0)) max_abs = 1.0;
  const double raw = max_abs / 3.0;
  const double e = std::pow(10.0, std::floor(std::log10(raw)));
  double step = 10.0 * e;
  for (double m : {1.0, 2.0, 2.5, 5.0, 10.0})
    if (m * e >= raw * (1.0 - 1e-12)) {
      step = m * e;
      break;
    }
  return {-3 * step, -2 * step, -step, 0.0, step, 2 * step, 3 * step};
}

/// Colours of the six residual bins, negative (blue) to positive (red); the
/// marker size grows with |residual| so a grey print keeps the order.
const char* const kResidualColors[] = {"#2166ac", "#4393c3", "#92c5de",
                                       "#f4a582", "#d6604d", "#b2182b"};
const double kResidualSizes[] = {11.5, 8.5, 6.0, 6.0, 8.5, 11.5};

/// The residual map: training and test points in the (reading, aux) plane,
/// each coloured and sized by its residual (final model) in six bins.
SvgPlot residual_map(const std::vector<Point>& pts, const std::string& x_label,
                     const std::string& y_label, const Units& u, double* scale_step) {
  SvgPlot p("fig-resid-map", 680, 330);
  p.description = "Residual map over the two inputs";
  p.x_axis.label = x_label;
  p.y_axis.label = y_label;
  p.legend_columns = 3;  // rows: negative bins, positive bins, shapes
  double max_abs = 0.0;
  for (const Point& q : pts) {
    const double e = q.predicted - q.reference;
    if (std::isfinite(e) && std::isfinite(q.reading) && std::isfinite(q.aux))
      max_abs = std::max(max_abs, std::fabs(e));
  }
  const std::vector<double> edges = residual_scale_edges(max_abs);
  *scale_step = edges[4];
  Series bins[6], test_bins[6];
  for (int k = 0; k < 6; ++k) {
    bins[k].draw_line = test_bins[k].draw_line = false;
    bins[k].style = SeriesStyle{kResidualColors[k], 0, "", Marker::circle, true, kResidualSizes[k]};
    test_bins[k].style =
        SeriesStyle{kResidualColors[k], 0, "", Marker::triangle, true, kResidualSizes[k] + 1.5};
    const std::string a = format_sig(edges[static_cast<std::size_t>(k)], 3);
    const std::string c = format_sig(edges[static_cast<std::size_t>(k) + 1], 3);
    bins[k].name = a + " \u2026 " + c + u.reference_sfx();
  }
  for (const Point& q : pts) {
    const double e = q.predicted - q.reference;
    if (!(std::isfinite(e) && std::isfinite(q.reading) && std::isfinite(q.aux))) continue;
    int k = 0;
    while (k < 5 && e >= edges[static_cast<std::size_t>(k) + 1]) ++k;
    // Exactly 0 belongs to the first positive bin; negative values below edges[3].
    Series& s = q.role == "test" ? test_bins[k] : bins[k];
    s.x.push_back(q.reading);
    s.y.push_back(q.aux);
  }
  // Every bin gets a legend entry, so the colour scale is complete even where
  // a bin holds no point (an empty series draws nothing but its legend entry).
  for (auto& s : bins) p.series.push_back(s);
  for (auto& s : test_bins) p.series.push_back(s);
  Series shape;
  shape.name = "triangle: test point";
  shape.draw_line = false;
  shape.style = SeriesStyle{"#444444", 0, "", Marker::triangle, false, 9.0};
  p.series.push_back(shape);
  Series circ = shape;
  circ.name = "circle: training point";
  circ.style.marker = Marker::circle;
  p.series.push_back(circ);
  return p;
}

}  // namespace

int surface_figures(Builder& b, const ReportData& d, int fig) {
  const ModelView& sv = d.model;
  const std::vector<Point>& pts = d.points;
  const Units& u = d.units;
  const ToleranceView& tol = d.tolerance;
  if (!sv.extended) return fig;
  const std::string reading_label = "reading" + (u.reading.empty() ? "" : " [" + u.reading + "]");
  const std::string aux_label = d.aux_name + " (second input)";
  const std::string roles =
      " Filled circles: training points (final fit); open squares: the same points predicted by "
      "the model fitted "
      "without their cross-validation fold; triangles: test points.";
  const std::string tol_note =
      tol.readable && tol.constant() ? " Grey band with dashed edges: tolerance." : "";
  if (!sv.has_aux) {
    b.o += "<figure id=\"fig-resid-reading-figure\">\n" +
           residual_plot("fig-resid-reading", pts, false, reading_label, u, tol).render() +
           fmt::format(
               "\n<figcaption><b>Figure {}.</b> Error (predicted \u2212 reference) against the "
               "reading.",
               fig++) +
           roles + tol_note + "</figcaption>\n</figure>\n";
    return fig;
  }
  bool any_aux = false;
  for (const Point& q : pts) any_aux = any_aux || std::isfinite(q.aux);
  if (!any_aux) {
    b.o += "<figure id=\"fig-resid-reading-figure\">\n" +
           residual_plot("fig-resid-reading", pts, false, reading_label, u, tol).render() +
           fmt::format(
               "\n<figcaption><b>Figure {}.</b> Error (predicted \u2212 reference) against the "
               "reading.",
               fig++) +
           roles + tol_note + "</figcaption>\n</figure>\n";
    b.o +=
        "<p class=\"missing\">The record's points carry no value of the second input: the "
        "residuals against it "
        "and the residual map cannot be drawn.</p>\n";
    return fig;
  }
  // Against each input, side by side with one shared legend (as the validation curve).
  SvgPlot by_reading = residual_plot("fig-resid-reading", pts, false, reading_label, u, tol, 340);
  SvgPlot by_aux = residual_plot("fig-resid-aux", pts, true, aux_label, u, tol, 340);
  by_reading.show_legend = by_aux.show_legend = false;
  b.o += "<figure id=\"fig-resid-inputs-figure\">\n" + by_reading.render_legend(680) +
         "\n<div class=\"panels\">\n" + by_reading.render() + "\n" + by_aux.render() +
         "\n</div>\n" +
         fmt::format(
             "<figcaption><b>Figure {}.</b> Error (predicted \u2212 reference) against the reading "
             "(left) and "
             "against the second input, ",
             fig++) +
         esc(d.aux_name) + " (right)." + roles + tol_note + "</figcaption>\n</figure>\n";
  double step = 0.0;
  const SvgPlot map = residual_map(pts, reading_label, aux_label, u, &step);
  const std::string range =
      " The calibrated region is reading " + esc(format_sig(sv.reading.min, 6)) + " \u2026 " +
      esc(format_sig(sv.reading.max, 6)) + (sv.identity ? "" : " (transformed)") + ", " +
      esc(d.aux_name) + " " + esc(format_sig(sv.aux.min, 6)) + " \u2026 " +
      esc(format_sig(sv.aux.max, 6)) + ".";
  b.o += "<figure id=\"fig-resid-map-figure\">\n" + map.render() +
         fmt::format(
             "\n<figcaption><b>Figure {}.</b> Residual map: every training point (circle) and test "
             "point "
             "(triangle) at its reading and ",
             fig++) +
         esc(d.aux_name) +
         ", coloured by its error under the final model: blue below zero, red above, in bins of " +
         esc(format_sig(step, 3) + u.reference_sfx()) +
         "; larger markers for larger |error|. A systematic pattern (one colour in a corner or "
         "along an edge) shows "
         "what the model misses." +
         range + "</figcaption>\n</figure>\n";
  return fig;
}

}  // namespace ridgecal::report::detail
