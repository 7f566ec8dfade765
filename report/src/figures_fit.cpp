// ridgecal report (internal): figure 1 (data and fitted curve) and figure 2
// (errors with the tolerance, uncertainty and acceptance bands).
#include <algorithm>
#include <cmath>
#include <utility>

#include "report_data.hpp"
#include "ridgecal/report/number_format.hpp"

namespace ridgecal::report::detail {

void fit_figure(Builder& b, const ReportData& d) {
  const ModelView& m = d.model;
  const Units& u = d.units;
  SvgPlot p("fig-fit", 680, 225);
  p.description = "Calibration data and fitted curve";
  p.x_axis.label = "reading" + (u.reading.empty() ? "" : " [" + u.reading + "]");
  p.y_axis.label = "reference" + (u.reference.empty() ? "" : " [" + u.reference + "]");
  double lo = kNaN, hi = kNaN;
  for (const Point& q : d.points)
    if (std::isfinite(q.reading)) {
      lo = std::isfinite(lo) ? std::min(lo, q.reading) : q.reading;
      hi = std::isfinite(hi) ? std::max(hi, q.reading) : q.reading;
    }
  const int n = 160;
  std::string curve_text;
  if (!m.extended) {
    lo = std::isfinite(lo) ? std::min(lo, m.reading.min) : m.reading.min;
    hi = std::isfinite(hi) ? std::max(hi, m.reading.max) : m.reading.max;
    Series curve;
    curve.name = fmt::format("fitted polynomial (degree {})", m.degree);
    curve.style = SeriesStyle{"#222222", 1.8, "", Marker::none, true, 0};
    for (int i = 0; i <= n; ++i) {
      const double x = lo + (hi - lo) * i / n;
      curve.x.push_back(x);
      curve.y.push_back(model_value(m, x, 0.0));
    }
    p.series.push_back(curve);
  } else if (std::isfinite(lo) && hi > lo) {
    // The extended model in reference units, through the whole transform chain,
    // over the readings of the record (the transforms' domain holds there).
    std::vector<std::pair<double, std::string>> levels;
    if (!m.has_aux) {
      levels.push_back(
          {0.0, m.identity ? "fitted curve" : "fitted curve (through the transforms)"});
      curve_text =
          m.identity
              ? " with the fitted calibration curve"
              : " with the fitted calibration curve in reference units (transforms applied: " +
                    esc(m.chain) + ")";
    } else {
      for (double a : {m.aux.min, 0.5 * (m.aux.min + m.aux.max), m.aux.max})
        levels.push_back({a, d.aux_name + " = " + format_sig(a, 4)});
      curve_text = " with the fitted surface at the lowest, middle and highest calibrated " +
                   esc(d.aux_name) + " (curves; the points lie at their own " + esc(d.aux_name) +
                   ")";
    }
    for (std::size_t k = 0; k < levels.size(); ++k) {
      Series curve;
      curve.name = levels[k].second;
      curve.style = SeriesStyle{levels.size() == 1 ? "#222222" : kDegreeColors[(k + 2) % 8],
                                1.6,
                                kDegreeDashes[k % 8],
                                Marker::none,
                                true,
                                0};
      for (int i = 0; i <= n; ++i) {
        const double x = lo + (hi - lo) * i / n;
        const double y = model_value(m, x, levels[k].first);
        if (!std::isfinite(y)) continue;
        curve.x.push_back(x);
        curve.y.push_back(y);
      }
      p.series.push_back(curve);
    }
  }
  Series train, test;
  train.name = "training points";
  train.draw_line = false;
  train.style = kTrainStyle;
  test.name = "test points";
  test.draw_line = false;
  test.style = kTestStyle;
  for (const Point& q : d.points) {
    Series& s = q.role == "test" ? test : train;
    s.x.push_back(q.reading);
    s.y.push_back(q.reference);
  }
  p.series.push_back(train);
  if (!test.x.empty()) p.series.push_back(test);
  b.o += "<figure id=\"fig-fit-figure\">\n" + p.render() +
         "\n<figcaption><b>Figure 1.</b> Reference against reading";
  b.o += m.extended ? curve_text : std::string(" with the fitted calibration polynomial");
  b.o +=
      ". Filled circles: training points; filled triangles: test points, never used in the "
      "fit.</figcaption>\n</figure>\n";
}

void error_figure(Builder& b, const ReportData& d) {
  const Units& u = d.units;
  const ToleranceView& tol = d.tolerance;
  const UncertaintyView& unc = d.uncertainty;
  const DecisionView& dec = d.decision;
  SvgPlot p("fig-errors", 680, 250);
  p.description = "Errors of the calibrated value against the reference";
  p.x_axis.label = "reference" + (u.reference.empty() ? "" : " [" + u.reference + "]");
  p.y_axis.label =
      "error: predicted \u2212 reference" + (u.reference.empty() ? "" : " [" + u.reference + "]");
  double lo = kNaN, hi = kNaN;
  for (const Point& q : d.points)
    if (std::isfinite(q.reference)) {
      lo = std::isfinite(lo) ? std::min(lo, q.reference) : q.reference;
      hi = std::isfinite(hi) ? std::max(hi, q.reference) : q.reference;
    }
  if (std::isfinite(lo) && hi > lo) {
    const double pad = 0.02 * (hi - lo);
    lo -= pad, hi += pad;
  }
  if (tol.readable && std::isfinite(lo)) {
    Band t;
    t.name = tol.constant() ? "tolerance \u00B1" + format_sig(tol.limit(0.0), 3) + u.reference_sfx()
                            : "tolerance";
    const int n = tol.constant() ? 1 : 80;
    for (int i = 0; i <= n; ++i) {
      const double x = lo + (hi - lo) * i / n;
      t.x.push_back(x);
      t.lo.push_back(-tol.limit(x));
      t.hi.push_back(tol.limit(x));
    }
    t.fill = "#e4e4e4";
    t.edge_color = "#555555";
    t.edge_dash = "6 3";
    p.bands.push_back(t);
  }
  if (unc.present && std::isfinite(lo)) {
    Band ub;
    ub.fill = "#7a7a7a";
    ub.hatched = true;
    ub.opacity = 0.55;
    if (!unc.band_x.empty()) {
      std::vector<std::size_t> idx(unc.band_x.size());
      for (std::size_t i = 0; i < idx.size(); ++i) idx[i] = i;
      std::sort(idx.begin(), idx.end(),
                [&](auto a, auto c) { return unc.band_x[a] < unc.band_x[c]; });
      for (std::size_t i : idx) {
        ub.x.push_back(unc.band_x[i]);
        ub.lo.push_back(-unc.band_u[i]);
        ub.hi.push_back(unc.band_u[i]);
      }
      ub.name = "expanded uncertainty \u00B1U";
    } else if (std::isfinite(unc.expanded)) {
      ub.x = {lo, hi};
      ub.lo = {-unc.expanded, -unc.expanded};
      ub.hi = {unc.expanded, unc.expanded};
      ub.name = "expanded uncertainty \u00B1" + format_sig(unc.expanded, 3) + u.reference_sfx();
    }
    if (std::isfinite(unc.k)) ub.name += " (k=" + format_sig(unc.k, 2) + ")";
    if (!ub.x.empty()) p.bands.push_back(ub);
  }
  p.hlines.push_back(HLine{0.0, "#333333", 1.0, ""});
  Series train, val, test;
  train.name = "training (in-fit)";
  val.name = "validation (held-out fold)";
  test.name = "test";
  train.style = kTrainStyle;
  val.style = kValidationStyle;
  test.style = kTestStyle;
  train.draw_line = val.draw_line = test.draw_line = false;
  for (const Point& q : d.points) {
    if (q.role == "test") {
      test.x.push_back(q.reference);
      test.y.push_back(q.predicted - q.reference);
    } else {
      train.x.push_back(q.reference);
      train.y.push_back(q.predicted - q.reference);
      if (std::isfinite(q.cv_predicted)) {
        val.x.push_back(q.reference);
        val.y.push_back(q.cv_predicted - q.reference);
      }
    }
  }
  p.series.push_back(train);
  if (!val.x.empty()) p.series.push_back(val);
  if (!test.x.empty()) p.series.push_back(test);
  if (!dec.acc_ref.empty()) {
    // Guarded rule: the acceptance limit (tolerance minus U) at each judged point.
    std::vector<std::size_t> idx(dec.acc_ref.size());
    for (std::size_t i = 0; i < idx.size(); ++i) idx[i] = i;
    std::sort(idx.begin(), idx.end(),
              [&](auto a, auto c) { return dec.acc_ref[a] < dec.acc_ref[c]; });
    Series up, down;
    up.name = "acceptance limit (tolerance \u2212 U)";
    up.style = SeriesStyle{"#222222", 1.2, "2 2", Marker::none, true, 0};
    down.style = up.style;
    for (std::size_t i : idx) {
      up.x.push_back(dec.acc_ref[i]);
      up.y.push_back(std::max(0.0, dec.acc_limit[i]));
      down.x.push_back(dec.acc_ref[i]);
      down.y.push_back(-std::max(0.0, dec.acc_limit[i]));
    }
    p.series.push_back(up);
    p.series.push_back(down);
  }
  if (!dec.fail_ref.empty()) {
    Series bad;
    bad.name = "does not conform";
    bad.draw_line = false;
    bad.style = SeriesStyle{"#000000", 0, "", Marker::cross, true, 13.0};
    bad.x = dec.fail_ref;
    bad.y = dec.fail_err;
    p.series.push_back(bad);
  }
  p.y_axis.include_zero = true;
  b.o += "<figure id=\"fig-errors-figure\">\n" + p.render() +
         "\n<figcaption><b>Figure 2.</b> Error of the calibrated value (predicted \u2212 "
         "reference) against the reference. "
         "Filled circles: training points predicted by the final fit";
  if (!val.x.empty())
    b.o +=
        "; open squares: the same points predicted by the model fitted without their "
        "cross-validation fold";
  else
    b.o += "; held-out (validation) predictions are not in the record";
  b.o += "; triangles: test points.";
  if (tol.readable)
    b.o += " Grey band with dashed edges: tolerance.";
  else
    b.o += " No tolerance band: the record gives no tolerance.";
  if (!dec.acc_ref.empty()) b.o += " Dotted lines: acceptance limits of the guarded rule.";
  if (!dec.fail_ref.empty()) b.o += " Crosses: points that do not conform.";
  if (unc.present) b.o += " Hatched band: expanded uncertainty.";
  b.o += "</figcaption>\n</figure>\n";
}

}  // namespace ridgecal::report::detail
