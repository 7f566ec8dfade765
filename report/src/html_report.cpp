#include "ridgecal/report/html_report.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cctype>
#include <cmath>
#include <limits>
#include <map>
#include <set>

#include "record_view.hpp"
#include "ridgecal/poly_model.hpp"
#include "ridgecal/record.hpp"
#include "ridgecal/report/html_escape.hpp"
#include "ridgecal/report/number_format.hpp"
#include "ridgecal/report/svg_plot.hpp"

#ifndef RIDGECAL_VERSION_STRING
#define RIDGECAL_VERSION_STRING "unknown"
#endif

namespace ridgecal::report {
namespace {

using detail::arr;
using detail::find;
using detail::find_any;
using detail::Json;
using detail::num;
using detail::str;
using detail::str_or;

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

std::string esc(const std::string& s) { return html_escape(s); }

// Series styles. Shapes and fills differ, so grey print keeps them apart.
const SeriesStyle kTrainStyle{"#1f4e9a", 0, "", Marker::circle, true, 7.5};
const SeriesStyle kValidationStyle{"#b35900", 0, "", Marker::square, false, 7.5};
const SeriesStyle kTestStyle{"#a0001c", 0, "", Marker::triangle, true, 9.0};

const char* const kDegreeColors[] = {"#1f4e9a", "#b35900", "#2e7d32", "#6a1b9a",
                                     "#4e342e", "#00707a", "#ad1457", "#555555"};
const Marker kDegreeMarkers[] = {Marker::circle,  Marker::square,        Marker::triangle,
                                 Marker::diamond, Marker::triangle_down, Marker::cross,
                                 Marker::plus,    Marker::circle};
const char* const kDegreeDashes[] = {"", "7 3", "2 3", "9 3 2 3", "4 4", "1 2", "12 4", "6 2 2 2"};

std::string lower(std::string s) {
  for (char& c : s) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  return s;
}

std::string upper(std::string s) {
  for (char& c : s) c = static_cast<char>(std::toupper(static_cast<unsigned char>(c)));
  return s;
}

// ---------------------------------------------------------------- record parts

struct Units {
  std::string reading, reference;
  std::string reading_sfx() const { return reading.empty() ? "" : " " + reading; }
  std::string reference_sfx() const { return reference.empty() ? "" : " " + reference; }
};

struct Point {
  double reading = kNaN, reference = kNaN, predicted = kNaN, cv_predicted = kNaN;
  std::string role;  // "train", "test", other
};

std::string normalise_role(std::string r) {
  r = upper(r);
  if (r == "TRAIN" || r == "TRAINING") return "train";
  if (r == "TEST" || r == "HOLDOUT" || r == "HELD-OUT") return "test";
  if (r == "VALIDATION") return "validation";
  return r.empty() ? "train" : r;
}

std::vector<Point> read_points(const Json& rec) {
  std::vector<Point> pts;
  for (const Json& p : arr(rec, {"points"})) {
    Point q;
    q.reading = num(p, {"reading"}).value_or(kNaN);
    q.reference = num(p, {"reference"}).value_or(kNaN);
    q.predicted = num(p, {"predicted"}).value_or(kNaN);
    // Held-out prediction of a training point by the model fitted without its fold.
    q.cv_predicted = num(find_any(p, {"cv_predicted", "validation_predicted", "heldout_predicted"}))
                         .value_or(kNaN);
    q.role = normalise_role(str_or(p, {"role"}, "train"));
    pts.push_back(q);
  }
  return pts;
}

std::optional<PolyModel> read_model(const Json& rec) {
  auto x_min = num(rec, {"model", "scaling", "x_min"});
  auto x_max = num(rec, {"model", "scaling", "x_max"});
  const auto cheb = detail::num_array(arr(rec, {"model", "chebyshev_coefficients"}));
  if (!x_min || !x_max || !(*x_max > *x_min) || cheb.empty()) return std::nullopt;
  for (double c : cheb)
    if (!std::isfinite(c)) return std::nullopt;
  PolyModel m;
  m.scaling = Scaling{*x_min, *x_max};
  m.cheb = cheb;
  return m;
}

struct Tolerance {
  bool present = false;
  std::optional<double> value;  // symmetric limit on |predicted - reference|
  std::string text;             // as shown to the reviewer
};

Tolerance read_tolerance(const Json& rec, const Units& u) {
  Tolerance t;
  const Json* j = find(rec, {"tolerance"});
  if (!j) return t;
  t.present = true;
  std::string unit = u.reference;
  std::string note;
  if (j->is_number()) {
    t.value = num(j);
  } else if (j->is_object()) {
    t.value = num(find_any(*j, {"value", "abs", "absolute", "limit", "plus_minus", "max_abs_error"}));
    if (auto s = str(find_any(*j, {"unit"}))) unit = *s;
    if (auto s = str(find_any(*j, {"description", "text", "basis", "source"}))) note = *s;
  } else if (auto s = str(j)) {
    note = *s;
  }
  if (t.value) t.value = std::fabs(*t.value);
  t.text = t.value ? esc("\u00B1" + format_sig(*t.value, 4) + (unit.empty() ? "" : " " + unit))
                   : std::string();
  if (!note.empty()) t.text += (t.text.empty() ? "" : " — ") + esc(note);
  if (t.text.empty()) t.text = "given, but without a readable value";
  return t;
}

struct Decision {
  bool present = false;
  std::string verdict;  // upper case, e.g. PASS / FAIL
  std::string rule, detail;
};

Decision read_decision(const Json& rec) {
  Decision d;
  const Json* j = find(rec, {"decision"});
  if (!j) return d;
  d.present = true;
  if (j->is_object()) {
    const Json* v = find_any(*j, {"verdict", "result", "outcome", "status"});
    if (v && v->is_boolean()) d.verdict = v->get<bool>() ? "PASS" : "FAIL";
    else if (auto s = str(v)) d.verdict = upper(*s);
    if (const Json* p = find_any(*j, {"pass", "passed"}); p && p->is_boolean() && d.verdict.empty())
      d.verdict = p->get<bool>() ? "PASS" : "FAIL";
    if (auto s = str(find_any(*j, {"rule", "decision_rule"}))) d.rule = *s;
    if (auto s = str(find_any(*j, {"reason", "explanation", "detail", "message"}))) d.detail = *s;
  } else if (j->is_boolean()) {
    d.verdict = j->get<bool>() ? "PASS" : "FAIL";
  } else if (auto s = str(j)) {
    d.verdict = upper(*s);
  }
  if (auto s = str(rec, {"decision_rule"}); s && d.rule.empty()) d.rule = *s;
  return d;
}

struct Uncertainty {
  bool present = false;
  std::optional<double> expanded, k;
  std::string unit;
  // Band of half-widths along the reference axis; empty = constant +-expanded.
  std::vector<double> band_x, band_u;
};

Uncertainty read_uncertainty(const Json& rec, const Units& u) {
  Uncertainty out;
  const Json* j = find(rec, {"uncertainty"});
  if (!j) return out;
  out.present = true;
  out.unit = u.reference;
  if (j->is_number()) {
    out.expanded = num(j);
    return out;
  }
  if (!j->is_object()) return out;
  out.expanded = num(find_any(*j, {"expanded", "U", "expanded_uncertainty", "value"}));
  out.k = num(find_any(*j, {"k", "coverage_factor"}));
  if (auto s = str(find_any(*j, {"unit"}))) out.unit = *s;
  const Json* band = find_any(*j, {"band"});
  if (band && band->is_array()) {
    for (const Json& b : *band) {
      auto x = num(find_any(b, {"reference", "x", "at"}));
      auto h = num(find_any(b, {"U", "expanded", "half_width", "u"}));
      if (x && h) out.band_x.push_back(*x), out.band_u.push_back(std::fabs(*h));
    }
  } else if (band && band->is_object()) {
    const Json* xs = find_any(*band, {"reference", "x"});
    const Json* hs = find_any(*band, {"U", "expanded", "half_width"});
    if (xs && hs) {
      const auto xv = detail::num_array(*xs), hv = detail::num_array(*hs);
      for (std::size_t i = 0; i < std::min(xv.size(), hv.size()); ++i)
        if (std::isfinite(xv[i]) && std::isfinite(hv[i]))
          out.band_x.push_back(xv[i]), out.band_u.push_back(std::fabs(hv[i]));
    }
  }
  return out;
}

struct GridCell {
  int degree = 0;
  double lambda = kNaN, cv_rmse = kNaN, cv_se = kNaN, train_rmse = kNaN;
};

std::vector<GridCell> read_grid(const Json& rec) {
  std::vector<GridCell> g;
  for (const Json& c : arr(rec, {"selection", "grid"})) {
    auto d = num(c, {"degree"});
    if (!d) continue;
    GridCell cell;
    cell.degree = static_cast<int>(std::lround(*d));
    cell.lambda = num(c, {"lambda"}).value_or(kNaN);
    cell.cv_rmse = num(c, {"cv_rmse"}).value_or(kNaN);
    cell.cv_se = num(c, {"cv_se"}).value_or(kNaN);
    cell.train_rmse = num(c, {"train_rmse"}).value_or(kNaN);
    g.push_back(cell);
  }
  return g;
}

bool same_lambda(double a, double b) {
  if (a == b) return true;
  return std::fabs(a - b) <= 1e-9 * std::max(std::fabs(a), std::fabs(b));
}

// ---------------------------------------------------------------- HTML pieces

const char* const kCss = R"CSS(
:root { color-scheme: light; }
* { box-sizing: border-box; }
html { -webkit-print-color-adjust: exact; print-color-adjust: exact; }
body { font-family: "DejaVu Sans", "Liberation Sans", Arial, sans-serif; font-size: 10pt;
  line-height: 1.35; color: #111; background: #fff; max-width: 188mm; margin: 8mm auto; padding: 0 5mm; }
h1 { font-size: 16pt; margin: 0 0 1.5mm; }
h2 { font-size: 12pt; margin: 4mm 0 1.5mm; padding-bottom: 0.6mm; border-bottom: 1.5px solid #444;
  break-after: avoid; page-break-after: avoid; }
h3 { font-size: 10.5pt; margin: 3mm 0 1mm; break-after: avoid; page-break-after: avoid; }
p { margin: 1mm 0 2mm; }
figure, table, .verdict, .signoff, .keep { break-inside: avoid; page-break-inside: avoid; }
figure { margin: 0 0 3mm; }
figcaption { font-size: 9pt; color: #333; margin-top: 0.5mm; }
figcaption b { color: #111; }
table { border-collapse: collapse; font-size: 9pt; margin: 1mm 0 2mm; }
th, td { border: 1px solid #9a9a9a; padding: 0.8mm 1.8mm; text-align: left; vertical-align: top; }
th { background: #eeeeee; font-weight: bold; }
td.num, th.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
.mono { font-family: "DejaVu Sans Mono", "Liberation Mono", monospace; font-size: 8.5pt; word-break: break-all; }
.meta { display: grid; grid-template-columns: max-content 1fr; column-gap: 4mm; row-gap: 0.4mm;
  font-size: 9.5pt; margin: 0; }
.meta.two { grid-template-columns: max-content 1fr max-content 1fr; }
.meta .wide { grid-column: 2 / -1; }
.meta .wide-key { grid-column: 1; }
.meta dt { font-weight: bold; color: #333; }
.meta dd { margin: 0; min-width: 0; overflow-wrap: anywhere; }
.verdict { display: flex; align-items: center; gap: 6mm; padding: 1.5mm 4mm; margin: 2mm 0 1mm;
  border: 2px dashed #666; }
.verdict .word { font-size: 22pt; font-weight: bold; letter-spacing: 0.06em; min-width: 30mm; }
.verdict .why { font-size: 9.5pt; }
.verdict .why div { margin: 0.3mm 0; }
.verdict.pass { border: 3px solid #1b5e20; }
.verdict.pass .word { color: #1b5e20; }
.verdict.fail { border: 5px double #a0001c; }
.verdict.fail .word { color: #a0001c; }
.verdict.none .word { color: #444; font-size: 14pt; }
svg.plot { display: block; max-width: 100%; height: auto; }
figure > svg.plot, figure > .panels { max-width: 170mm; }
.panels { display: flex; gap: 1mm; }
.panels > svg { flex: 1 1 0; min-width: 0; }
.cols { display: grid; grid-template-columns: 1fr 1fr; column-gap: 4mm; align-items: start; }
.cols > table { width: 100%; margin-top: 0; font-size: 8.5pt; }
.note { color: #444; font-size: 9pt; }
.missing { color: #555; font-style: italic; }
.alert { color: #a0001c; }
ul.cautions { margin: 1mm 0 2mm 5mm; padding: 0; }
ul.cautions li { margin: 0.6mm 0; }
.signoff table { width: 100%; }
.signoff td { height: 13mm; }
.signoff th { width: 28mm; }
footer { margin-top: 4mm; font-size: 8pt; color: #555; border-top: 1px solid #bbb; padding-top: 1mm; }
@page { margin: 11mm 12mm 13mm 12mm;
  @bottom-left { content: "ridgecal QA calibration report"; font: 8pt "DejaVu Sans", sans-serif; color: #555; }
  @bottom-right { content: "page " counter(page) " of " counter(pages); font: 8pt "DejaVu Sans", sans-serif; color: #555; } }
@media print {
  body { max-width: none; margin: 0; padding: 0; }
  figure > svg.plot, figure > .panels { max-width: 162mm; }
}
)CSS";

/// Generic rendering of a JSON value for parts of the record whose layout
/// this version does not know in detail (as-found results, extra fields).
std::string json_value_html(const Json& v, int depth = 0);

std::string json_scalar_html(const Json& v) {
  if (v.is_null()) return kNotAvailable;
  if (v.is_number_float()) return esc(format_sig(v.get<double>(), 6));
  if (auto s = str(&v)) return esc(*s);
  return esc(v.dump());
}

std::string json_value_html(const Json& v, int depth) {
  if (depth > 4) return esc(v.dump());
  if (v.is_array()) {
    if (v.empty()) return "<span class=\"missing\">none</span>";
    const bool all_objects = std::all_of(v.begin(), v.end(), [](const Json& e) { return e.is_object(); });
    if (all_objects) {
      std::vector<std::string> keys;
      for (const Json& e : v)
        for (auto it = e.begin(); it != e.end(); ++it)
          if (std::find(keys.begin(), keys.end(), it.key()) == keys.end()) keys.push_back(it.key());
      std::string o = "<table><tr>";
      for (const auto& k : keys) o += "<th>" + esc(k) + "</th>";
      o += "</tr>";
      for (const Json& e : v) {
        o += "<tr>";
        for (const auto& k : keys) {
          auto it = e.find(k);
          const bool numeric = it != e.end() && it->is_number();
          o += numeric ? "<td class=\"num\">" : "<td>";
          o += it == e.end() ? std::string() : json_value_html(*it, depth + 1);
          o += "</td>";
        }
        o += "</tr>";
      }
      return o + "</table>";
    }
    std::string o;
    for (std::size_t i = 0; i < v.size(); ++i) o += (i ? ", " : "") + json_value_html(v[i], depth + 1);
    return o;
  }
  if (v.is_object()) {
    if (v.empty()) return "<span class=\"missing\">empty</span>";
    std::string o = "<table>";
    for (auto it = v.begin(); it != v.end(); ++it)
      o += "<tr><th>" + esc(it.key()) + "</th><td>" + json_value_html(it.value(), depth + 1) + "</td></tr>";
    return o + "</table>";
  }
  return json_scalar_html(v);
}

struct Builder {
  std::string o;
  void open_section(const char* id, const std::string& title) {
    o += fmt::format("<section id=\"{}\">\n<h2>{}</h2>\n", id, title);
  }
  void close_section() { o += "</section>\n"; }
};

// ---------------------------------------------------------------- sections

void header_section(Builder& b, const Json& rec, const Units& u, const ReportOptions& opt) {
  const std::string sensor = str_or(rec, {"sensor", "name"}, "");
  b.o += "<header id=\"header\">\n";
  b.o += "<h1>Calibration report: " + (sensor.empty() ? "<span class=\"missing\">unnamed sensor</span>" : esc(sensor)) + "</h1>\n";
  b.o += "<dl class=\"meta two\">\n";
  auto row = [&](const std::string& k, const std::string& html, bool wide = false) {
    b.o += std::string(wide ? "<dt class=\"wide-key\">" : "<dt>") + k + "</dt><dd" + (wide ? " class=\"wide\"" : "") +
           ">" + html + "</dd>\n";
  };
  auto or_missing = [](const std::optional<std::string>& s, const char* what = "not recorded") {
    return s ? esc(*s) : std::string("<span class=\"missing\">") + what + "</span>";
  };
  row("Sensor", sensor.empty() ? "<span class=\"missing\">not named</span>" : esc(sensor), true);
  row("Units", "reading in " + or_missing(str(rec, {"sensor", "reading_unit"}), "(no unit)") +
                   ", reference in " + or_missing(str(rec, {"sensor", "reference_unit"}), "(no unit)"), true);

  const std::optional<std::string> created = str(rec, {"created_utc"});
  row("Report date", or_missing(opt.date ? opt.date : created));
  row("Record created (UTC)", or_missing(created));
  row("Fitted with", "ridgecal " + or_missing(str(rec, {"tool_version"}), "version not recorded"), true);
  std::string input = or_missing(str(rec, {"input", "file"}), "no file name");
  if (auto rows = str(rec, {"input", "rows"})) input += ", " + esc(*rows) + " rows";
  row("Input data", input, true);
  row("Input SHA-256", "<span class=\"mono\">" + or_missing(str(rec, {"input", "sha256"})) + "</span>", true);
  std::string integrity = "<span class=\"mono\">" + or_missing(str(rec, {"integrity", "sha256"})) + "</span>";
  if (str(rec, {"integrity", "sha256"}))
    integrity += record_integrity_ok(rec)
                     ? " <b>(verified)</b>"
                     : " <b class=\"alert\">(DOES NOT MATCH the record content: the record was changed after it "
                       "was written)</b>";
  row("Record SHA-256", integrity, true);
  row("Columns", "reading = " + or_missing(str(rec, {"input", "columns", "reading"}), "?") +
                     "; reference = " + or_missing(str(rec, {"input", "columns", "reference"}), "?") +
                     "; setpoint = " + or_missing(str(rec, {"input", "columns", "setpoint"}), "none"), true);
  b.o += "</dl>\n</header>\n";
  (void)u;
}

double max_abs_error(const std::vector<Point>& pts, const char* role, bool cv) {
  double m = kNaN;
  for (const Point& p : pts) {
    if (p.role != role) continue;
    const double e = (cv ? p.cv_predicted : p.predicted) - p.reference;
    if (std::isfinite(e)) m = std::isfinite(m) ? std::max(m, std::fabs(e)) : std::fabs(e);
  }
  return m;
}

void verdict_section(Builder& b, const Json& rec, const Units& u, const std::vector<Point>& pts,
                     const Tolerance& tol, const Decision& dec, const Uncertainty& unc) {
  b.o += "<section id=\"verdict-section\">\n<h2>Verdict</h2>\n";
  std::string cls = "none", word;
  if (dec.present && !dec.verdict.empty()) {
    word = esc(dec.verdict);
    if (dec.verdict == "PASS") cls = "pass";
    else if (dec.verdict == "FAIL") cls = "fail";
  } else if (dec.present) {
    word = "UNREADABLE DECISION";
  } else {
    word = "NO DECISION";
  }
  b.o += fmt::format("<div class=\"verdict {}\" id=\"verdict\">\n<div class=\"word\">{}</div>\n<div class=\"why\">\n", cls, word);
  if (!tol.present) {
    b.o += "<div><b>No tolerance given \u2014 no decision.</b> The record states no acceptance "
           "tolerance, so this report does not judge the fit.</div>\n";
  } else {
    b.o += "<div><b>Tolerance:</b> " + tol.text + " on the error (predicted \u2212 reference)</div>\n";
    if (!dec.present) b.o += "<div><b>The record holds no decision</b> for this tolerance.</div>\n";
  }
  if (dec.present)
    b.o += "<div><b>Decision rule:</b> " +
           (dec.rule.empty() ? std::string("<span class=\"missing\">not stated in the record</span>") : esc(dec.rule)) +
           "</div>\n";
  if (!dec.detail.empty()) b.o += "<div>" + esc(dec.detail) + "</div>\n";
  if (unc.present)
    b.o += "<div><b>Expanded uncertainty:</b> U = " + esc(format_sig(unc.expanded, 3)) +
           (unc.unit.empty() ? "" : " " + esc(unc.unit)) +
           (unc.k ? " (k = " + esc(format_sig(*unc.k, 3)) + ")" : std::string()) +
           (unc.band_x.empty() ? "" : ", varying along the range (see the error plot)") + "</div>\n";
  const double mt = max_abs_error(pts, "test", false), mv = max_abs_error(pts, "train", true);
  const double mtr = max_abs_error(pts, "train", false);
  b.o += "<div><b>Largest |error|:</b> test " + esc(format_sig(mt, 3)) + ", validation (held-out) " +
         esc(format_sig(mv, 3)) + ", training " + esc(format_sig(mtr, 3)) + esc(u.reference_sfx()) + "</div>\n";
  b.o += "</div>\n</div>\n";
  (void)rec;
  b.o += "</section>\n";
}

void fit_figure(Builder& b, const std::vector<Point>& pts, const std::optional<PolyModel>& model, const Units& u) {
  SvgPlot p("fig-fit", 680, 225);
  p.description = "Calibration data and fitted curve";
  p.x_axis.label = "reading" + (u.reading.empty() ? "" : " [" + u.reading + "]");
  p.y_axis.label = "reference" + (u.reference.empty() ? "" : " [" + u.reference + "]");
  double lo = kNaN, hi = kNaN;
  for (const Point& q : pts)
    if (std::isfinite(q.reading)) {
      lo = std::isfinite(lo) ? std::min(lo, q.reading) : q.reading;
      hi = std::isfinite(hi) ? std::max(hi, q.reading) : q.reading;
    }
  if (model) {
    lo = std::isfinite(lo) ? std::min(lo, model->scaling.x_min) : model->scaling.x_min;
    hi = std::isfinite(hi) ? std::max(hi, model->scaling.x_max) : model->scaling.x_max;
    Series curve;
    curve.name = fmt::format("fitted polynomial (degree {})", model->degree());
    curve.style = SeriesStyle{"#222222", 1.8, "", Marker::none, true, 0};
    const int n = 160;
    for (int i = 0; i <= n; ++i) {
      const double x = lo + (hi - lo) * i / n;
      curve.x.push_back(x);
      curve.y.push_back(model->eval(x));
    }
    p.series.push_back(curve);
  }
  Series train, test;
  train.name = "training points";
  train.draw_line = false;
  train.style = kTrainStyle;
  test.name = "test points";
  test.draw_line = false;
  test.style = kTestStyle;
  for (const Point& q : pts) {
    Series& s = q.role == "test" ? test : train;
    s.x.push_back(q.reading);
    s.y.push_back(q.reference);
  }
  p.series.push_back(train);
  if (!test.x.empty()) p.series.push_back(test);
  b.o += "<figure id=\"fig-fit-figure\">\n" + p.render() + "\n<figcaption><b>Figure 1.</b> Reference against reading with the fitted calibration polynomial";
  if (!model) b.o += " <span class=\"missing\">(no usable model in the record: curve not drawn)</span>";
  b.o += ". Filled circles: training points; filled triangles: test points, never used in the fit.</figcaption>\n</figure>\n";
}

void error_figure(Builder& b, const std::vector<Point>& pts, const Units& u, const Tolerance& tol,
                  const Uncertainty& unc) {
  SvgPlot p("fig-errors", 680, 250);
  p.description = "Errors of the calibrated value against the reference";
  p.x_axis.label = "reference" + (u.reference.empty() ? "" : " [" + u.reference + "]");
  p.y_axis.label = "error: predicted \u2212 reference" + (u.reference.empty() ? "" : " [" + u.reference + "]");
  double lo = kNaN, hi = kNaN;
  for (const Point& q : pts)
    if (std::isfinite(q.reference)) {
      lo = std::isfinite(lo) ? std::min(lo, q.reference) : q.reference;
      hi = std::isfinite(hi) ? std::max(hi, q.reference) : q.reference;
    }
  if (std::isfinite(lo) && hi > lo) {
    const double pad = 0.02 * (hi - lo);
    lo -= pad, hi += pad;
  }
  if (tol.value && std::isfinite(lo)) {
    Band t;
    t.name = "tolerance \u00B1" + format_sig(*tol.value, 3) + u.reference_sfx();
    t.x = {lo, hi};
    t.lo = {-*tol.value, -*tol.value};
    t.hi = {*tol.value, *tol.value};
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
      std::sort(idx.begin(), idx.end(), [&](auto a, auto c) { return unc.band_x[a] < unc.band_x[c]; });
      for (std::size_t i : idx) {
        ub.x.push_back(unc.band_x[i]);
        ub.lo.push_back(-unc.band_u[i]);
        ub.hi.push_back(unc.band_u[i]);
      }
      ub.name = "expanded uncertainty \u00B1U";
    } else if (unc.expanded) {
      ub.x = {lo, hi};
      ub.lo = {-*unc.expanded, -*unc.expanded};
      ub.hi = {*unc.expanded, *unc.expanded};
      ub.name = "expanded uncertainty \u00B1" + format_sig(*unc.expanded, 3) + u.reference_sfx();
    }
    if (unc.k) ub.name += " (k=" + format_sig(*unc.k, 2) + ")";
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
  for (const Point& q : pts) {
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
  p.y_axis.include_zero = true;
  b.o += "<figure id=\"fig-errors-figure\">\n" + p.render() +
         "\n<figcaption><b>Figure 2.</b> Error of the calibrated value (predicted \u2212 reference) against the reference. "
         "Filled circles: training points predicted by the final fit";
  if (!val.x.empty()) b.o += "; open squares: the same points predicted by the model fitted without their cross-validation fold";
  else b.o += "; held-out (validation) predictions are not in the record";
  b.o += "; triangles: test points.";
  if (tol.value) b.o += " Grey band with dashed edges: tolerance.";
  else b.o += " No tolerance band: the record gives no tolerance.";
  if (unc.present) b.o += " Hatched band: expanded uncertainty.";
  b.o += "</figcaption>\n</figure>\n";
}

void validation_figure(Builder& b, const Json& rec, const Units& u) {
  const std::vector<GridCell> grid = read_grid(rec);
  const std::string mode = str_or(rec, {"selection", "mode"}, "");
  b.o += "<figure id=\"fig-validation-figure\">\n";
  if (grid.empty()) {
    b.o += "<p class=\"missing\">No cross-validation grid in the record";
    if (!mode.empty()) b.o += " (selection mode: " + esc(mode) + ")";
    b.o += ": the validation curve cannot be drawn.</p>\n";
    b.o += "<figcaption><b>Figure 3.</b> Validation curve: not available.</figcaption>\n</figure>\n";
    return;
  }
  std::optional<double> chosen_deg = num(rec, {"selection", "chosen", "degree"});
  if (!chosen_deg) chosen_deg = num(rec, {"model", "degree"});
  std::optional<double> chosen_lam = num(rec, {"selection", "chosen", "lambda"});
  if (!chosen_lam) chosen_lam = num(rec, {"model", "lambda"});

  std::map<int, std::vector<GridCell>> by_degree;
  double ymin = kNaN, ymax = kNaN;
  for (const GridCell& c : grid) {
    by_degree[c.degree].push_back(c);
    for (double v : {c.cv_rmse, c.train_rmse, c.cv_rmse - c.cv_se, c.cv_rmse + c.cv_se})
      if (std::isfinite(v) && v > 0) {
        ymin = std::isfinite(ymin) ? std::min(ymin, v) : v;
        ymax = std::isfinite(ymax) ? std::max(ymax, v) : v;
      }
  }
  const bool log_y = std::isfinite(ymin) && ymax / ymin > 30.0;
  SvgPlot cv("fig-validation-cv", 340, 250), tr("fig-validation-train", 340, 250);
  cv.description = "Cross-validated RMSE against the ridge penalty, per degree";
  tr.description = "Training RMSE against the ridge penalty, per degree";
  for (SvgPlot* p : {&cv, &tr}) {
    p->x_axis.label = "ridge penalty \u03BB (log; 0 = none)";
    p->x_axis.scale = Scale::log;
    p->x_axis.zero_slot = true;
    p->y_axis.scale = log_y ? Scale::log : Scale::linear;
    if (std::isfinite(ymin)) {
      p->y_axis.min = log_y ? ymin : std::min(0.0, ymin);
      p->y_axis.max = ymax * (log_y ? 1.0 : 1.04);
      if (!log_y) p->y_axis.min.reset(), p->y_axis.include_zero = true;
    }
    p->show_legend = false;
  }
  cv.y_axis.label = "CV RMSE" + (u.reference.empty() ? "" : " [" + u.reference + "]");
  tr.y_axis.label = "training RMSE" + (u.reference.empty() ? "" : " [" + u.reference + "]");
  std::size_t k = 0;
  for (auto& [deg, cells] : by_degree) {
    std::sort(cells.begin(), cells.end(), [](const GridCell& a, const GridCell& c) { return a.lambda < c.lambda; });
    Series s;
    s.name = fmt::format("degree {}", deg);
    const bool dense = cells.size() > 12;  // many lambdas: smaller markers, thinner lines
    s.style = SeriesStyle{kDegreeColors[k % 8], dense ? 1.2 : 1.6, kDegreeDashes[k % 8], kDegreeMarkers[k % 8],
                          k % 2 == 0, dense ? 4.5 : 7.0};
    Series t = s;
    for (const GridCell& c : cells) {
      s.x.push_back(c.lambda);
      s.y.push_back(c.cv_rmse);
      s.y_err.push_back(c.cv_se);
      t.x.push_back(c.lambda);
      t.y.push_back(c.train_rmse);
    }
    cv.series.push_back(s);
    tr.series.push_back(t);
    ++k;
  }
  std::string chosen_text = "not identified";
  if (chosen_deg && chosen_lam) {
    for (const GridCell& c : grid) {
      if (c.degree == static_cast<int>(std::lround(*chosen_deg)) && same_lambda(c.lambda, *chosen_lam)) {
        Series ring;
        ring.name = fmt::format("chosen: degree {}, \u03BB = {}", c.degree, format_lambda(c.lambda));
        ring.draw_line = false;
        ring.style = SeriesStyle{"#000000", 1.0, "", Marker::circle, false, 19.0};
        ring.x = {c.lambda};
        ring.y = {c.cv_rmse};
        // A hollow ring drawn over the chosen grid point (the point stays visible inside).
        cv.series.push_back(ring);
        ring.y = {c.train_rmse};
        tr.series.push_back(ring);
        chosen_text = fmt::format("degree {}, \u03BB = {} (CV RMSE {} \u00B1 {}, training RMSE {}{})", c.degree,
                                  format_lambda(c.lambda), format_sig(c.cv_rmse, 3), format_sig(c.cv_se, 2),
                                  format_sig(c.train_rmse, 3), u.reference_sfx());
        break;
      }
    }
  }
  b.o += cv.render_legend(680) + "\n<div class=\"panels\">\n" + cv.render() + "\n" + tr.render() + "\n</div>\n";
  b.o += "<figcaption><b>Figure 3.</b> Validation curve. Left: cross-validated RMSE (bars: \u00B1 one standard error "
         "over folds); right: training RMSE of the same candidates, on the same scale. "
         "\u03BB = 0 (no penalty) is drawn at the separate \u201C0\u201D position left of the break. Chosen: " +
         esc(chosen_text) + ".</figcaption>\n</figure>\n";
}

void metrics_section(Builder& b, const Json& rec, const Units& u) {
  b.open_section("metrics", "Metrics");
  const Json* m = find(rec, {"metrics"});
  if (!m || !m->is_object() || m->empty()) {
    b.o += "<p class=\"missing\">The record holds no metrics.</p>\n";
    b.close_section();
    return;
  }
  std::vector<std::string> cols;
  for (const char* k : {"training", "validation", "test"})
    if (m->contains(k)) cols.push_back(k);
  for (auto it = m->begin(); it != m->end(); ++it)
    if (std::find(cols.begin(), cols.end(), it.key()) == cols.end() && it->is_object()) cols.push_back(it.key());
  const std::string ru = u.reference.empty() ? "" : " [" + esc(u.reference) + "]";
  struct Row { const char* key; std::string label; int kind; };  // 0 count, 1 error, 2 r2
  const Row rows[] = {{"n", "points n", 0},           {"predictors", "predictors p", 0},
                      {"rmse", "RMSE" + ru, 1},        {"max_abs_error", "max |error|" + ru, 1},
                      {"bias", "bias (mean error)" + ru, 1}, {"r2", "R\u00B2", 2},
                      {"adj_r2", "adjusted R\u00B2", 2}};
  b.o += "<table class=\"metrics\"><tr><th></th>";
  for (const auto& c : cols) {
    std::string head = c == "validation" ? "validation (cross-validated)" : c == "test" ? "test (held out)" : c;
    b.o += "<th class=\"num\">" + esc(head) + "</th>";
  }
  b.o += "</tr>\n";
  for (const Row& r : rows) {
    b.o += "<tr><th>" + r.label + "</th>";
    for (const auto& c : cols) {
      const Json& col = (*m)[c];
      std::string cell;
      if (r.kind == 0) cell = str_or(col, {r.key}, kNotAvailable);
      else if (r.kind == 1) cell = format_sig(num(col, {r.key}), 3);
      else cell = format_fixed(num(col, {r.key}), 8);
      b.o += "<td class=\"num\">" + esc(cell) + "</td>";
    }
    b.o += "</tr>\n";
  }
  b.o += "</table>\n<p class=\"note\">Error = predicted \u2212 reference. Validation: each training point predicted by "
         "the model fitted without its fold. Test: setpoints held out of fitting and of model selection.</p>\n";
  b.close_section();
}

void warnings_section(Builder& b, const Json& rec) {
  b.open_section("warnings", "Warnings");
  const Json& w = arr(rec, {"warnings"});
  if (!find(rec, {"warnings"})) {
    b.o += "<p class=\"missing\">The record has no warnings list.</p>\n";
  } else if (w.empty()) {
    b.o += "<p>None.</p>\n";
  } else {
    b.o += "<table class=\"warnings\"><tr><th>code</th><th>message</th></tr>\n";
    for (const Json& e : w) {
      if (e.is_object())
        b.o += "<tr><td class=\"mono\">" + esc(str_or(e, {"code"}, "")) + "</td><td>" + esc(str_or(e, {"message"}, "")) + "</td></tr>\n";
      else
        b.o += "<tr><td></td><td>" + json_scalar_html(e) + "</td></tr>\n";
    }
    b.o += "</table>\n";
  }
  b.close_section();
}

void as_found_section(Builder& b, const Json& rec) {
  const Json* a = find(rec, {"as_found"});
  if (!a) return;
  b.open_section("as-found", "As-found results");
  b.o += "<p class=\"note\">Errors of the instrument before this calibration, as stored in the record.</p>\n";
  b.o += "<div class=\"keep\">" + json_value_html(*a) + "</div>\n";
  b.close_section();
}

void model_section(Builder& b, const Json& rec, const Units& u, const std::optional<PolyModel>& model) {
  b.open_section("model", "Model, selection and coefficients");
  const std::string mode = str_or(rec, {"selection", "mode"}, "");
  std::string sel;
  if (mode == "cv") {
    sel = "chosen by grouped cross-validation over setpoints (" +
          esc(str_or(rec, {"selection", "fold_scheme"}, "folds")) + ", " +
          esc(str_or(rec, {"selection", "folds"}, "?")) + " folds), rule \u201C" +
          esc(str_or(rec, {"selection", "rule"}, "not recorded")) + "\u201D";
    std::string degs, lams;
    for (const Json& d : arr(rec, {"selection", "degrees"})) degs += (degs.empty() ? "" : ", ") + json_scalar_html(d);
    const auto lam_values = detail::num_array(arr(rec, {"selection", "lambdas"}));
    if (lam_values.size() > 8) {
      // A long log-spaced grid: say how many, and the range.
      double lo = kNaN, hi = kNaN;
      bool zero = false;
      for (double v : lam_values) {
        if (v == 0.0) zero = true;
        else if (std::isfinite(v)) lo = std::isfinite(lo) ? std::min(lo, v) : v, hi = std::isfinite(hi) ? std::max(hi, v) : v;
      }
      lams = esc(fmt::format("{} values: {}{} \u2026 {}", lam_values.size(), zero ? "0 and " : "", format_lambda(lo),
                             format_lambda(hi)));
    } else {
      for (double v : lam_values) lams += (lams.empty() ? "" : ", ") + esc(format_lambda(v));
    }
    if (!degs.empty()) sel += "; degrees tried: " + degs;
    if (!lams.empty()) sel += "; \u03BB tried: " + lams;
  } else if (mode == "fixed") {
    sel = "fixed by the operator (no model selection)";
  } else {
    sel = mode.empty() ? "<span class=\"missing\">not recorded</span>" : esc(mode);
  }
  const auto lam = num(rec, {"model", "lambda"});
  b.o += "<dl class=\"meta\">\n";
  b.o += "<dt>Polynomial</dt><dd>degree " + esc(str_or(rec, {"model", "degree"}, kNotAvailable)) +
         ", ridge penalty \u03BB = " + esc(lam ? format_lambda(*lam) : std::string(kNotAvailable)) + "</dd>\n";
  b.o += "<dt>Selection</dt><dd>" + sel + "</dd>\n";
  std::string notes;
  for (const Json& n : arr(rec, {"selection", "notes"})) notes += "<div>" + json_scalar_html(n) + "</div>";
  if (!notes.empty()) b.o += "<dt>Selection notes</dt><dd>" + notes + "</dd>\n";
  if (const Json* ic = find(rec, {"model", "intercept"}); ic && ic->is_boolean() && !ic->get<bool>())
    b.o += "<dt>Intercept</dt><dd>none: the curve is forced through reading 0 \u2192 reference 0</dd>\n";
  if (const Json* cn = find(rec, {"model", "condition_number"}))
    b.o += "<dt>Condition number</dt><dd>" + esc(format_sig(num(cn), 3)) +
           " (of the scaled Chebyshev design matrix)</dd>\n";
  if (model) {
    b.o += "<dt>Scaled variable</dt><dd>t = (x \u2212 " + esc(format_sig(model->scaling.center(), 8)) + ") / " +
           esc(format_sig(model->scaling.half_width(), 8)) + ", x = reading" + esc(u.reading_sfx()) +
           "; calibrated range " + esc(format_sig(model->scaling.x_min, 8)) + " \u2026 " +
           esc(format_sig(model->scaling.x_max, 8)) + esc(u.reading_sfx()) + "</dd>\n";
  }
  b.o += "</dl>\n";
  const auto cheb = detail::num_array(arr(rec, {"model", "chebyshev_coefficients"}));
  const auto power = detail::num_array(arr(rec, {"model", "power_coefficients"}));
  const std::size_t n = std::max(cheb.size(), power.size());
  if (n == 0) {
    b.o += "<p class=\"missing\">The record holds no coefficients.</p>\n";
  } else {
    b.o += "<table class=\"coefficients\"><tr><th class=\"num\">k</th><th class=\"num\">Chebyshev c<sub>k</sub> "
           "(of T<sub>k</sub>(t))</th><th class=\"num\">power a<sub>k</sub> (of x<sup>k</sup>)</th></tr>\n";
    for (std::size_t i = 0; i < n; ++i) {
      b.o += fmt::format("<tr><td class=\"num\">{}</td><td class=\"num mono\">{}</td><td class=\"num mono\">{}</td></tr>\n", i,
                         esc(i < cheb.size() ? format_exact(cheb[i]) : std::string()),
                         esc(i < power.size() ? format_exact(power[i]) : std::string()));
    }
    b.o += "</table>\n<p class=\"note\">p(x) = \u03A3 c<sub>k</sub> T<sub>k</sub>(t) = \u03A3 a<sub>k</sub> x<sup>k</sup>, in "
           "reference units. The Chebyshev form is the one that was fitted; the power form is derived from it and "
           "can lose digits when evaluated far from zero.</p>\n";
  }
  b.close_section();
}

/// Fold number, or a dash for none (test setpoints carry -1 or null).
std::string fold_text(const Json& s) {
  const auto f = num(s, {"fold"});
  if (!f || *f < 0) return "\u2014";
  return str_or(s, {"fold"}, "\u2014");
}

void split_section(Builder& b, const Json& rec, const Units& u) {
  b.open_section("split", "Split of setpoints");
  b.o += "<p>Seed " + esc(str_or(rec, {"split", "seed"}, kNotAvailable)) + ", test fraction " +
         esc(format_sig(num(rec, {"split", "test_fraction"}), 3)) +
         ". Whole setpoints are assigned to the test set or to a cross-validation fold, so repeated readings at one "
         "setpoint never sit on both sides.</p>\n";
  const Json& sp = arr(rec, {"split", "setpoints"});
  if (sp.empty()) {
    b.o += "<p class=\"missing\">The record lists no setpoints.</p>\n";
    b.close_section();
    return;
  }
  const std::size_t per_table = sp.size() > 6 ? (sp.size() + 1) / 2 : sp.size();
  b.o += "<div class=\"cols\">\n";
  for (std::size_t start = 0; start < sp.size(); start += per_table) {
    b.o += "<table class=\"setpoints\"><tr><th>setpoint</th><th class=\"num\">reference" +
           (u.reference.empty() ? "" : "<br/>[" + esc(u.reference) + "]") + "</th><th class=\"num\">reading" +
           (u.reading.empty() ? "" : "<br/>[" + esc(u.reading) + "]") + "</th><th>role</th><th class=\"num\">fold</th></tr>\n";
    for (std::size_t i = start; i < std::min(sp.size(), start + per_table); ++i) {
      const Json& s = sp[i];
      const std::string role = str_or(s, {"role"}, "");
      b.o += "<tr><td>" + esc(str_or(s, {"id"}, "")) + "</td><td class=\"num\">" +
             esc(format_sig(num(s, {"reference"}), 6)) + "</td><td class=\"num\">" +
             esc(format_sig(num(s, {"reading"}), 6)) + "</td><td>" +
             (normalise_role(role) == "test" ? "<b>" + esc(role) + "</b>" : esc(role)) + "</td><td class=\"num\">" +
             esc(fold_text(s)) + "</td></tr>\n";
    }
    b.o += "</table>\n";
  }
  b.o += "</div>\n<p class=\"note\">Fold \u2014: the setpoint is in no cross-validation fold (test setpoints, and "
         "training setpoints that no fold holds out).</p>\n";
  b.close_section();
}

void cautions_section(Builder& b, const Json& rec) {
  b.open_section("cautions", "Cautions");
  b.o += "<ul class=\"cautions\">\n";
  // The record's own cautions first; the report's standard ones only where the
  // record does not already say the same (no duplicated lines for the reviewer).
  std::string all_lower;
  for (const Json& c : arr(rec, {"cautions"})) {
    b.o += "<li>" + json_scalar_html(c) + "</li>\n";
    if (auto t = str(&c)) all_lower += lower(*t) + "\n";
  }
  if (all_lower.find("local code") == std::string::npos)
    b.o += "<li>Calibration of safety-relevant instruments follows the local codes and the certified procedures "
           "that apply to them; this fit does not replace them.</li>\n";
  if (all_lower.find("accredited") == std::string::npos)
    b.o += "<li>This report documents a software fit for quality review. It does not replace a calibration "
           "certificate from an accredited laboratory.</li>\n";
  if (all_lower.find("extrapolat") == std::string::npos)
    b.o += "<li>The polynomial is valid only inside the calibrated range of readings; outside it the values are "
           "extrapolated.</li>\n";
  b.o += "</ul>\n";
  b.close_section();
}

void signoff_section(Builder& b) {
  b.o += "<section id=\"sign-off\" class=\"signoff\">\n<h2>Sign-off</h2>\n"
         "<table><tr><th></th><th>Name</th><th>Signature</th><th style=\"width:32mm\">Date</th></tr>\n"
         "<tr><th>Performed by</th><td></td><td></td><td></td></tr>\n"
         "<tr><th>Reviewed by</th><td></td><td></td><td></td></tr>\n"
         "</table>\n</section>\n";
}

}  // namespace

std::string render_html_report(const nlohmann::json& rec, const ReportOptions& opt) {
  if (!rec.is_object()) throw ReportInputError("the calibration record is not a JSON object");
  if (const Json* f = find(rec, {"format"}); f && (!f->is_string() || f->get<std::string>() != "ridgecal-record"))
    throw ReportInputError("not a ridgecal calibration record (\"format\" is " + f->dump() + ")");

  Units u;
  u.reading = str_or(rec, {"sensor", "reading_unit"}, "");
  u.reference = str_or(rec, {"sensor", "reference_unit"}, "");
  const std::vector<Point> pts = read_points(rec);
  const std::optional<PolyModel> model = read_model(rec);
  const Tolerance tol = read_tolerance(rec, u);
  const Decision dec = read_decision(rec);
  const Uncertainty unc = read_uncertainty(rec, u);
  const std::string sensor = str_or(rec, {"sensor", "name"}, "unnamed sensor");

  Builder b;
  b.o += "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\"/>\n";
  b.o += "<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\"/>\n";
  b.o += "<title>Calibration report: " + esc(sensor) + "</title>\n<style>" + std::string(kCss) + "</style>\n</head>\n<body>\n";
  header_section(b, rec, u, opt);
  verdict_section(b, rec, u, pts, tol, dec, unc);
  b.o += "<section id=\"plots\">\n<h2>Plots</h2>\n";
  fit_figure(b, pts, model, u);
  error_figure(b, pts, u, tol, unc);
  validation_figure(b, rec, u);
  b.o += "</section>\n";
  metrics_section(b, rec, u);
  warnings_section(b, rec);
  as_found_section(b, rec);
  model_section(b, rec, u, model);
  split_section(b, rec, u);
  cautions_section(b, rec);
  signoff_section(b);
  const std::string gen = opt.generator_version.empty() ? RIDGECAL_VERSION_STRING : opt.generator_version;
  b.o += "<footer>Report generated by ridgecal " + esc(gen) + " from a calibration record (format " +
         esc(str_or(rec, {"format"}, "not stated")) + ", version " + esc(str_or(rec, {"format_version"}, "?")) +
         "). Record SHA-256: <span class=\"mono\">" + esc(str_or(rec, {"integrity", "sha256"}, kNotAvailable)) +
         "</span></footer>\n";
  b.o += "</body>\n</html>\n";
  return b.o;
}

}  // namespace ridgecal::report
