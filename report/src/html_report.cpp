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
#include "ridgecal/surface_model.hpp"
#include "ridgecal/surface_record.hpp"
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
  double aux = kNaN;  // second input of an extended fit
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
    q.aux = num(p, {"aux"}).value_or(kNaN);
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

/// An extended ("surface") record: a second input and/or linearising transforms.
struct SurfaceView {
  bool present = false;   // model.kind == "surface"
  bool has_aux = false;   // the record names a second input (compensation.inputs[1])
  std::optional<SurfaceModel> model;  // when the record's members are complete and valid
  std::string aux_name;   // column of the second input, as recorded
  std::string chain;      // compensation.transforms.description
  bool identity = true;   // no transform: the fitted output is the reference itself
};

SurfaceView read_surface(const Json& rec) {
  SurfaceView v;
  v.present = str_or(rec, {"model", "kind"}, "") == "surface";
  if (!v.present) return v;
  v.has_aux = arr(rec, {"compensation", "inputs"}).size() >= 2;
  v.aux_name = str_or(rec, {"input", "columns", "aux"}, "");
  if (v.aux_name.empty()) v.aux_name = "aux";
  v.chain = str_or(rec, {"compensation", "transforms", "description"}, "");
  v.identity = str_or(rec, {"compensation", "transforms", "reading"}, "none") == "none" &&
               str_or(rec, {"compensation", "transforms", "reference"}, "none") == "none" &&
               !find(rec, {"compensation", "transforms", "divider"});
  // The fitter's own reader validates every member; the report only needs the
  // model, so a record it cannot read still renders, without the curve.
  if (find(rec, {"input", "columns"}) && find(rec, {"input", "columns"})->is_object() && find(rec, {"selection"}) &&
      find(rec, {"selection"})->is_object()) {
    try {
      CalibrationRecord r;
      read_surface_members(rec, r, "record");
      if (r.calibration.surface) v.model = *r.calibration.surface;
    } catch (const std::exception&) {
      v.model.reset();
    }
  }
  return v;
}

struct Tolerance {
  bool present = false;
  // limit(r) = offset + proportional*|r| + percent_of_span/100*span: the
  // record's formula. A plain number (older or hand-made records) is an offset.
  bool readable = false;
  double offset = 0, proportional = 0, percent_of_span = 0, span = 0;
  std::string text;  // HTML, as shown to the reviewer
  double limit(double r) const { return offset + proportional * std::fabs(r) + percent_of_span / 100.0 * span; }
  bool constant() const { return proportional == 0.0; }
};

Tolerance read_tolerance(const Json& rec, const Units& u) {
  Tolerance t;
  const Json* j = find(rec, {"tolerance"});
  if (!j) return t;
  t.present = true;
  std::string unit = u.reference;
  std::string note;
  if (j->is_number()) {
    if (auto v = num(j)) t.offset = std::fabs(*v), t.readable = true;
  } else if (j->is_object()) {
    if (auto v = num(find_any(*j, {"value", "abs", "absolute", "plus_minus", "offset"})))
      t.offset = std::fabs(*v), t.readable = true;
    if (auto v = num(find_any(*j, {"proportional"}))) t.proportional = std::fabs(*v), t.readable = true;
    if (auto v = num(find_any(*j, {"percent_of_span"}))) {
      t.percent_of_span = std::fabs(*v);
      const auto lo = num(find_any(*j, {"span_low"})), hi = num(find_any(*j, {"span_high"}));
      if (lo && hi) t.span = std::fabs(*hi - *lo);
      else if (t.percent_of_span > 0) t.readable = false;  // cannot evaluate without the span
    }
    if (auto s = str(find_any(*j, {"unit"}))) unit = *s;
    if (auto s = str(find_any(*j, {"description"}))) note = *s;
    if (auto s = str(find_any(*j, {"source"})); s && !s->empty() && *s != "user") note += (note.empty() ? "" : "; ") + ("source: " + *s);
  } else if (auto s = str(j)) {
    note = *s;
  }
  if (t.readable && t.offset == 0 && t.proportional == 0 && t.percent_of_span == 0) t.readable = false;
  const std::string us = unit.empty() ? "" : " " + unit;
  std::vector<std::string> parts;
  if (t.offset > 0) parts.push_back(format_sig(t.offset, 4) + us);
  if (t.proportional > 0) parts.push_back(format_sig(100.0 * t.proportional, 3) + " % of |reference|");
  if (t.percent_of_span > 0)
    parts.push_back(format_sig(t.percent_of_span, 3) + " % of the span (" + format_sig(t.span, 4) + us + ")");
  std::string formula;
  for (std::size_t i = 0; i < parts.size(); ++i) formula += (i ? " + " : "") + parts[i];
  if (t.readable) t.text = esc(parts.size() == 1 ? "\u00B1" + formula : "\u00B1(" + formula + ")");
  if (!note.empty()) t.text += (t.text.empty() ? "" : " \u2014 ") + esc(note);
  if (t.text.empty()) t.text = "given, but without a readable value";
  return t;
}

struct Decision {
  bool present = false;
  std::string verdict;  // upper case, e.g. PASS / FAIL
  std::string rule, detail;
  bool rule_known = false;  // simple or guarded: described by the report itself
  std::vector<std::string> set_lines;  // one line per judged set
  std::vector<double> fail_ref, fail_err;  // points that do not conform
  std::vector<double> acc_ref, acc_limit;  // guarded rule: acceptance limit per point
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
    if (auto s = str(find_any(*j, {"rule", "decision_rule"}))) {
      d.rule_known = *s == "simple" || *s == "guarded";
      if (*s == "simple") d.rule = "simple acceptance: a point conforms when |error| \u2264 tolerance";
      else if (*s == "guarded")
        d.rule = "guarded acceptance: a point conforms when |error| \u2264 tolerance \u2212 U at that point";
      else d.rule = *s;
    }
    if (auto s = str(find_any(*j, {"statement", "reason", "explanation", "detail", "message"}))) d.detail = *s;
    for (const Json& set : arr(*j, {"sets"})) {
      const std::string name = str_or(set, {"name"}, "?");
      const auto n = num(set, {"n"}), failed = num(set, {"failed"});
      std::string line = name + ": ";
      if (n && failed) line += fmt::format("{} of {} points conform", static_cast<long>(*n - *failed), static_cast<long>(*n));
      line += ", max |error| " + format_sig(num(set, {"max_abs_error"}), 3);
      if (auto w = num(set, {"worst_ratio"})) line += ", worst " + format_fixed(100.0 * *w, 0) + " % of the limit";
      line += " \u2014 " + str_or(set, {"verdict"}, "?");
      if (const Json* c = find(set, {"counts"}); c && c->is_boolean() && !c->get<bool>())
        line += " (for information, does not decide)";
      d.set_lines.push_back(line);
    }
    for (const Json& p : arr(*j, {"points"})) {
      const auto r = num(p, {"reference"}), e = num(p, {"error"});
      if (const Json* ok = find(p, {"pass"}); ok && ok->is_boolean() && !ok->get<bool>() && r && e)
        d.fail_ref.push_back(*r), d.fail_err.push_back(*e);
      if (auto a = num(p, {"acceptance_limit"}); a && r && str_or(p, {"set"}, "") != "validation")
        d.acc_ref.push_back(*r), d.acc_limit.push_back(*a);
    }
  } else if (j->is_boolean()) {
    d.verdict = j->get<bool>() ? "PASS" : "FAIL";
  } else if (auto s = str(j)) {
    d.verdict = upper(*s);
  }
  if (str_or(rec, {"decision", "rule"}, "") != "guarded") d.acc_ref.clear(), d.acc_limit.clear();
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
      auto x = num(find_any(b, {"reference", "x", "at", "predicted"}));
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
  int aux_degree = -1;  // extended fits with separate limits; -1: none
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
    if (auto a = num(c, {"aux_degree"})) cell.aux_degree = static_cast<int>(std::lround(*a));
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
.verdict .why div.set { font-size: 8.5pt; margin: 0 0 0 3mm; }
.verdict.pass { border: 3px solid #1b5e20; }
.verdict.pass .word { color: #1b5e20; }
.verdict.fail { border: 5px double #a0001c; }
.verdict.fail .word { color: #a0001c; }
.verdict.none .word { color: #444; font-size: 14pt; }
svg.plot { display: block; max-width: 100%; height: auto; }
figure > svg.plot, figure > .panels { max-width: 170mm; }
.panels { display: flex; gap: 1mm; }
.panels > svg { flex: 1 1 0; min-width: 0; }
.side { display: flex; gap: 4mm; align-items: flex-start; flex-wrap: wrap; }
.side > table { font-size: 8.5pt; margin-bottom: 0; }
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
  figure > svg.plot, figure > .panels { max-width: 150mm; }
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
                     "; setpoint = " + or_missing(str(rec, {"input", "columns", "setpoint"}), "none") +
                     (find(rec, {"input", "columns", "aux"})
                          ? "; second input (aux) = " + or_missing(str(rec, {"input", "columns", "aux"}), "?") +
                                (find(rec, {"input", "columns", "aux_setpoint"})
                                     ? "; aux setpoint = " + or_missing(str(rec, {"input", "columns", "aux_setpoint"}), "?")
                                     : std::string())
                          : std::string()),
      true);
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
  // The record's statement repeats the rule and the counts; show it only when
  // the rule or the per-set counts are not otherwise known.
  if (!dec.detail.empty() && (!dec.rule_known || dec.set_lines.empty())) b.o += "<div>" + esc(dec.detail) + "</div>\n";
  for (const std::string& line : dec.set_lines) b.o += "<div class=\"set\">" + esc(line) + "</div>\n";
  if (unc.present)
    b.o += "<div><b>Expanded uncertainty:</b> U = " + esc(format_sig(unc.expanded, 3)) +
           (unc.unit.empty() ? "" : " " + esc(unc.unit)) +
           (unc.k ? " (k = " + esc(format_sig(*unc.k, 3)) + ")" : std::string()) +
           (unc.band_x.empty() ? "" : ", varying along the range (hatched band in figure 2)") + "</div>\n";
  if (dec.set_lines.empty()) {
    const double mt = max_abs_error(pts, "test", false), mv = max_abs_error(pts, "train", true);
  const double mtr = max_abs_error(pts, "train", false);
  b.o += "<div><b>Largest |error|:</b> test " + esc(format_sig(mt, 3)) + ", validation (held-out) " +
         esc(format_sig(mv, 3)) + ", training " + esc(format_sig(mtr, 3)) + esc(u.reference_sfx()) + "</div>\n";
  }
  b.o += "</div>\n</div>\n";
  (void)rec;
  b.o += "</section>\n";
}

void fit_figure(Builder& b, const std::vector<Point>& pts, const std::optional<PolyModel>& model,
                const SurfaceView& sv, const Units& u) {
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
  std::string curve_text;
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
  } else if (sv.model && std::isfinite(lo) && hi > lo) {
    // The extended model in reference units, through the whole transform chain,
    // over the readings of the record (the transforms' domain holds there).
    const SurfaceModel& m = *sv.model;
    std::vector<std::pair<double, std::string>> levels;
    if (!m.has_aux) {
      levels.push_back({0.0, sv.identity ? "fitted curve" : "fitted curve (through the transforms)"});
      curve_text = sv.identity ? " with the fitted calibration curve"
                               : " with the fitted calibration curve in reference units (transforms applied: " +
                                     esc(sv.chain) + ")";
    } else {
      for (double a : {m.aux.min, 0.5 * (m.aux.min + m.aux.max), m.aux.max})
        levels.push_back({a, sv.aux_name + " = " + format_sig(a, 4)});
      curve_text = " with the fitted surface at the lowest, middle and highest calibrated " + esc(sv.aux_name) +
                   " (curves; the points lie at their own " + esc(sv.aux_name) + ")";
    }
    const int n = 160;
    for (std::size_t k = 0; k < levels.size(); ++k) {
      Series curve;
      curve.name = levels[k].second;
      curve.style = SeriesStyle{levels.size() == 1 ? "#222222" : kDegreeColors[(k + 2) % 8], 1.6,
                                kDegreeDashes[k % 8], Marker::none, true, 0};
      for (int i = 0; i <= n; ++i) {
        const double x = lo + (hi - lo) * i / n;
        const double y = m.eval(x, levels[k].first);
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
  for (const Point& q : pts) {
    Series& s = q.role == "test" ? test : train;
    s.x.push_back(q.reading);
    s.y.push_back(q.reference);
  }
  p.series.push_back(train);
  if (!test.x.empty()) p.series.push_back(test);
  if (sv.present) {
    b.o += "<figure id=\"fig-fit-figure\">\n" + p.render() + "\n<figcaption><b>Figure 1.</b> Reference against reading";
    if (sv.model) b.o += curve_text;
    else b.o += " <span class=\"missing\">(the record's extended model could not be read: curve not drawn)</span>";
  } else {
    b.o += "<figure id=\"fig-fit-figure\">\n" + p.render() + "\n<figcaption><b>Figure 1.</b> Reference against reading with the fitted calibration polynomial";
    if (!model) b.o += " <span class=\"missing\">(no usable model in the record: curve not drawn)</span>";
  }
  b.o += ". Filled circles: training points; filled triangles: test points, never used in the fit.</figcaption>\n</figure>\n";
}

void error_figure(Builder& b, const std::vector<Point>& pts, const Units& u, const Tolerance& tol,
                  const Uncertainty& unc, const Decision& dec) {
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
  if (tol.readable && std::isfinite(lo)) {
    Band t;
    t.name = tol.constant() ? "tolerance \u00B1" + format_sig(tol.limit(0.0), 3) + u.reference_sfx() : "tolerance";
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
  if (!dec.acc_ref.empty()) {
    // Guarded rule: the acceptance limit (tolerance minus U) at each judged point.
    std::vector<std::size_t> idx(dec.acc_ref.size());
    for (std::size_t i = 0; i < idx.size(); ++i) idx[i] = i;
    std::sort(idx.begin(), idx.end(), [&](auto a, auto c) { return dec.acc_ref[a] < dec.acc_ref[c]; });
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
         "\n<figcaption><b>Figure 2.</b> Error of the calibrated value (predicted \u2212 reference) against the reference. "
         "Filled circles: training points predicted by the final fit";
  if (!val.x.empty()) b.o += "; open squares: the same points predicted by the model fitted without their cross-validation fold";
  else b.o += "; held-out (validation) predictions are not in the record";
  b.o += "; triangles: test points.";
  if (tol.readable) b.o += " Grey band with dashed edges: tolerance.";
  else b.o += " No tolerance band: the record gives no tolerance.";
  if (!dec.acc_ref.empty()) b.o += " Dotted lines: acceptance limits of the guarded rule.";
  if (!dec.fail_ref.empty()) b.o += " Crosses: points that do not conform.";
  if (unc.present) b.o += " Hatched band: expanded uncertainty.";
  b.o += "</figcaption>\n</figure>\n";
}

// ---------------------------------------------------------------- extended records

/// Residuals (predicted - reference) against one input, by role: training
/// (final fit), validation (held-out fold prediction), test.
SvgPlot residual_plot(const std::string& id, const std::vector<Point>& pts, bool against_aux, const std::string& x_label,
                      const Units& u, const Tolerance& tol, double width = 680) {
  SvgPlot p(id, width, 235);
  p.description = against_aux ? "Residuals against the second input" : "Residuals against the reading";
  p.x_axis.label = x_label;
  p.y_axis.label = "error: predicted \u2212 reference" + (u.reference.empty() ? "" : " [" + u.reference + "]");
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
const char* const kResidualColors[] = {"#2166ac", "#4393c3", "#92c5de", "#f4a582", "#d6604d", "#b2182b"};
const double kResidualSizes[] = {11.5, 8.5, 6.0, 6.0, 8.5, 11.5};

/// The residual map: training and test points in the (reading, aux) plane,
/// each coloured and sized by its residual (final model) in six bins.
SvgPlot residual_map(const std::vector<Point>& pts, const std::string& x_label, const std::string& y_label,
                     const Units& u, double* scale_step) {
  SvgPlot p("fig-resid-map", 680, 330);
  p.description = "Residual map over the two inputs";
  p.x_axis.label = x_label;
  p.y_axis.label = y_label;
  p.legend_columns = 3;  // rows: negative bins, positive bins, shapes
  double max_abs = 0.0;
  for (const Point& q : pts) {
    const double e = q.predicted - q.reference;
    if (std::isfinite(e) && std::isfinite(q.reading) && std::isfinite(q.aux)) max_abs = std::max(max_abs, std::fabs(e));
  }
  const std::vector<double> edges = residual_scale_edges(max_abs);
  *scale_step = edges[4];
  Series bins[6], test_bins[6];
  for (int k = 0; k < 6; ++k) {
    bins[k].draw_line = test_bins[k].draw_line = false;
    bins[k].style = SeriesStyle{kResidualColors[k], 0, "", Marker::circle, true, kResidualSizes[k]};
    test_bins[k].style = SeriesStyle{kResidualColors[k], 0, "", Marker::triangle, true, kResidualSizes[k] + 1.5};
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

int surface_figures(Builder& b, const std::vector<Point>& pts, const SurfaceView& sv, const Units& u,
                    const Tolerance& tol, int fig) {
  if (!sv.present) return fig;
  const std::string reading_label = "reading" + (u.reading.empty() ? "" : " [" + u.reading + "]");
  const std::string aux_label = sv.aux_name + " (second input)";
  const std::string roles =
      " Filled circles: training points (final fit); open squares: the same points predicted by the model fitted "
      "without their cross-validation fold; triangles: test points.";
  const std::string tol_note = tol.readable && tol.constant() ? " Grey band with dashed edges: tolerance." : "";
  if (!sv.has_aux) {
    b.o += "<figure id=\"fig-resid-reading-figure\">\n" +
           residual_plot("fig-resid-reading", pts, false, reading_label, u, tol).render() +
           fmt::format("\n<figcaption><b>Figure {}.</b> Error (predicted \u2212 reference) against the reading.", fig++) +
           roles + tol_note + "</figcaption>\n</figure>\n";
    return fig;
  }
  bool any_aux = false;
  for (const Point& q : pts) any_aux = any_aux || std::isfinite(q.aux);
  if (!any_aux) {
    b.o += "<figure id=\"fig-resid-reading-figure\">\n" +
           residual_plot("fig-resid-reading", pts, false, reading_label, u, tol).render() +
           fmt::format("\n<figcaption><b>Figure {}.</b> Error (predicted \u2212 reference) against the reading.", fig++) +
           roles + tol_note + "</figcaption>\n</figure>\n";
    b.o += "<p class=\"missing\">The record's points carry no value of the second input: the residuals against it "
           "and the residual map cannot be drawn.</p>\n";
    return fig;
  }
  // Against each input, side by side with one shared legend (as the validation curve).
  SvgPlot by_reading = residual_plot("fig-resid-reading", pts, false, reading_label, u, tol, 340);
  SvgPlot by_aux = residual_plot("fig-resid-aux", pts, true, aux_label, u, tol, 340);
  by_reading.show_legend = by_aux.show_legend = false;
  b.o += "<figure id=\"fig-resid-inputs-figure\">\n" + by_reading.render_legend(680) + "\n<div class=\"panels\">\n" +
         by_reading.render() + "\n" + by_aux.render() + "\n</div>\n" +
         fmt::format("<figcaption><b>Figure {}.</b> Error (predicted \u2212 reference) against the reading (left) and "
                     "against the second input, ",
                     fig++) +
         esc(sv.aux_name) + " (right)." + roles + tol_note + "</figcaption>\n</figure>\n";
  double step = 0.0;
  const SvgPlot map = residual_map(pts, reading_label, aux_label, u, &step);
  std::string range;
  if (sv.model)
    range = " The calibrated region is reading " + esc(format_sig(sv.model->input.min, 6)) + " \u2026 " +
            esc(format_sig(sv.model->input.max, 6)) + (sv.identity ? "" : " (transformed)") + ", " + esc(sv.aux_name) +
            " " + esc(format_sig(sv.model->aux.min, 6)) + " \u2026 " + esc(format_sig(sv.model->aux.max, 6)) + ".";
  b.o += "<figure id=\"fig-resid-map-figure\">\n" + map.render() +
         fmt::format("\n<figcaption><b>Figure {}.</b> Residual map: every training point (circle) and test point "
                     "(triangle) at its reading and ",
                     fig++) +
         esc(sv.aux_name) +
         ", coloured by its error under the final model: blue below zero, red above, in bins of " +
         esc(format_sig(step, 3) + u.reference_sfx()) +
         "; larger markers for larger |error|. A systematic pattern (one colour in a corner or along an edge) shows "
         "what the model misses." +
         range + "</figcaption>\n</figure>\n";
  return fig;
}

void validation_figure(Builder& b, const Json& rec, const Units& u, int fig = 3) {
  const std::vector<GridCell> grid = read_grid(rec);
  const std::string mode = str_or(rec, {"selection", "mode"}, "");
  b.o += "<figure id=\"fig-validation-figure\">\n";
  if (grid.empty()) {
    b.o += "<p class=\"missing\">No cross-validation grid in the record";
    if (!mode.empty()) b.o += " (selection mode: " + esc(mode) + ")";
    b.o += ": the validation curve cannot be drawn.</p>\n";
    b.o += fmt::format("<figcaption><b>Figure {}.</b> Validation curve: not available.</figcaption>\n</figure>\n", fig);
    return;
  }
  std::optional<double> chosen_deg = num(rec, {"selection", "chosen", "degree"});
  if (!chosen_deg) chosen_deg = num(rec, {"model", "degree"});
  std::optional<double> chosen_lam = num(rec, {"selection", "chosen", "lambda"});
  if (!chosen_lam) chosen_lam = num(rec, {"model", "lambda"});
  const int chosen_aux =
      static_cast<int>(std::lround(num(rec, {"selection", "chosen", "aux_degree"}).value_or(-1.0)));

  // One curve per candidate term set: the degree, and for extended fits with
  // separate limits the aux degree too.
  std::map<std::pair<int, int>, std::vector<GridCell>> by_degree;
  double ymin = kNaN, ymax = kNaN;
  for (const GridCell& c : grid) {
    by_degree[{c.degree, c.aux_degree}].push_back(c);
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
  for (auto& [key, cells] : by_degree) {
    std::sort(cells.begin(), cells.end(), [](const GridCell& a, const GridCell& c) { return a.lambda < c.lambda; });
    Series s;
    s.name = key.second >= 0 ? fmt::format("degree {}, aux {}", key.first, key.second) : fmt::format("degree {}", key.first);
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
      if (c.degree == static_cast<int>(std::lround(*chosen_deg)) && same_lambda(c.lambda, *chosen_lam) &&
          c.aux_degree == chosen_aux) {
        const std::string aux_text = c.aux_degree >= 0 ? fmt::format(", aux degree {}", c.aux_degree) : "";
        Series ring;
        ring.name = fmt::format("chosen: degree {}{}, \u03BB = {}", c.degree, aux_text, format_lambda(c.lambda));
        ring.draw_line = false;
        ring.style = SeriesStyle{"#000000", 1.0, "", Marker::circle, false, 19.0};
        ring.x = {c.lambda};
        ring.y = {c.cv_rmse};
        // A hollow ring drawn over the chosen grid point (the point stays visible inside).
        cv.series.push_back(ring);
        ring.y = {c.train_rmse};
        tr.series.push_back(ring);
        chosen_text = fmt::format("degree {}{}, \u03BB = {} (CV RMSE {} \u00B1 {}, training RMSE {}{})", c.degree,
                                  aux_text, format_lambda(c.lambda), format_sig(c.cv_rmse, 3), format_sig(c.cv_se, 2),
                                  format_sig(c.train_rmse, 3), u.reference_sfx());
        break;
      }
    }
  }
  b.o += cv.render_legend(680) + "\n<div class=\"panels\">\n" + cv.render() + "\n" + tr.render() + "\n</div>\n";
  b.o += fmt::format("<figcaption><b>Figure {}.</b> Validation curve. Left", fig) + ": cross-validated RMSE (bars: \u00B1 one standard error "
         "over folds); right: training RMSE of the same candidates, on the same scale. "
         "\u03BB = 0 (no penalty) is drawn at the separate \u201C0\u201D position left of the break. Chosen: " +
         esc(chosen_text) + ".</figcaption>\n</figure>\n";
}

void uncertainty_table(Builder& b, const Json& rec, const Units& u);

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
  const Row rows[] = {{"n", "points", 0},           {"predictors", "predictors", 0},
                      {"rmse", "RMSE" + ru, 1},        {"max_abs_error", "max |error|" + ru, 1},
                      {"bias", "bias" + ru, 1}, {"r2", "R\u00B2", 2},
                      {"adj_r2", "adjusted R\u00B2", 2}};
  b.o += "<div class=\"side\">\n<table class=\"metrics\"><tr><th></th>";
  for (const auto& c : cols) {
    std::string head = c == "validation" ? "validation" : c;
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
  b.o += "</table>\n";
  uncertainty_table(b, rec, u);
  b.o += "</div>\n<p class=\"note\">Error = predicted \u2212 reference; bias = mean error. Validation: each training "
         "point predicted by the model fitted without its fold (cross-validation). Test: setpoints held out of fitting "
         "and of model selection.</p>\n";
  b.close_section();
}

void uncertainty_table(Builder& b, const Json& rec, const Units& u) {
  const Json& comps = arr(rec, {"uncertainty", "components"});
  if (comps.empty()) return;
  const std::string ru = u.reference.empty() ? "" : " [" + esc(u.reference) + "]";
  b.o += "<table class=\"budget\"><tr><th>uncertainty component</th><th>type</th>"
         "<th class=\"num\">u" + ru + "</th></tr>\n";
  for (const Json& c : comps) {
    std::string type = str_or(c, {"type"}, "");
    if (auto d = str(c, {"distribution"})) type += (type.empty() ? "" : ", ") + *d;
    b.o += "<tr><td>" + esc(str_or(c, {"name"}, "?")) + "</td><td>" + esc(type) + "</td><td class=\"num\">" +
           esc(format_sig(num(c, {"standard"}), 3)) + "</td></tr>\n";
  }
  b.o += "<tr><th colspan=\"2\">combined u<sub>c</sub></th><td class=\"num\">" +
         esc(format_sig(num(rec, {"uncertainty", "combined"}), 3)) + "</td></tr>\n";
  b.o += "<tr><th colspan=\"2\">expanded U = k\u00B7u<sub>c</sub>, k = " + esc(format_sig(num(rec, {"uncertainty", "k"}), 3)) +
         "</th><td class=\"num\"><b>" + esc(format_sig(num(rec, {"uncertainty", "expanded"}), 3)) + "</b></td></tr>\n";
  b.o += "</table>\n";
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

void surface_model_rows(Builder& b, const Json& rec, const Units& u, const SurfaceView& sv);
void surface_coefficients(Builder& b, const Json& rec, const SurfaceView& sv);

void model_section(Builder& b, const Json& rec, const Units& u, const std::optional<PolyModel>& model,
                   const SurfaceView& sv) {
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
  if (sv.present) surface_model_rows(b, rec, u, sv);
  else
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
           (sv.present ? " (of the centred design matrix of the scaled basis)" : " (of the scaled Chebyshev design matrix)") +
           "</dd>\n";
  if (model) {
    b.o += "<dt>Scaled variable</dt><dd>t = (x \u2212 " + esc(format_sig(model->scaling.center(), 8)) + ") / " +
           esc(format_sig(model->scaling.half_width(), 8)) + ", x = reading" + esc(u.reading_sfx()) +
           "; calibrated range " + esc(format_sig(model->scaling.x_min, 8)) + " \u2026 " +
           esc(format_sig(model->scaling.x_max, 8)) + esc(u.reading_sfx()) + "</dd>\n";
  }
  b.o += "</dl>\n";
  if (sv.present) {
    surface_coefficients(b, rec, sv);
    b.close_section();
    return;
  }
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

void surface_model_rows(Builder& b, const Json& rec, const Units& u, const SurfaceView& sv) {
  const auto lam = num(rec, {"model", "lambda"});
  const std::size_t nterms = arr(rec, {"compensation", "terms"}).size();
  const std::string basis = str_or(rec, {"model", "basis"}, "");
  std::string shape = "reading degree " + esc(str_or(rec, {"model", "reading_degree"}, kNotAvailable));
  if (sv.has_aux)
    shape += ", " + esc(sv.aux_name) + " degree " + esc(str_or(rec, {"model", "aux_degree"}, kNotAvailable)) +
             ", total degree " + esc(str_or(rec, {"model", "degree"}, kNotAvailable));
  b.o += "<dt>Model</dt><dd>extended calibration model" +
         std::string(sv.has_aux ? " in two inputs (reading and " + esc(sv.aux_name) + ")" : " in the reading") +
         ": " + shape + fmt::format(", {} terms", nterms) + ", ridge penalty \u03BB = " +
         esc(lam ? format_lambda(*lam) : std::string(kNotAvailable)) + "</dd>\n";
  std::string basis_text = basis == "power" ? "plain powers t<sup>i</sup>" : "Chebyshev T<sub>i</sub>(t)";
  if (sv.has_aux)
    basis_text = basis == "power" ? "plain powers t<sup>i</sup>\u00B7s<sup>j</sup>"
                                  : "tensor Chebyshev T<sub>i</sub>(t)\u00B7T<sub>j</sub>(s)";
  if (basis != "power" && basis != "chebyshev") basis_text = basis.empty() ? "not recorded" : esc(basis);
  b.o += "<dt>Basis</dt><dd>" + basis_text + " of the scaled input" + (sv.has_aux ? "s" : "") + "; terms " +
         esc(str_or(rec, {"compensation", "term_rule"}, "not recorded")) + "</dd>\n";
  if (sv.identity)
    b.o += "<dt>Transforms</dt><dd>none: the polynomial gives the reference directly from the reading</dd>\n";
  else
    b.o += "<dt>Transforms</dt><dd>" +
           (sv.chain.empty() ? std::string("<span class=\"missing\">not recorded</span>") : esc(sv.chain)) +
           " (the polynomial maps the transformed reading u to the transformed reference v; the reported value is "
           "the inverse reference transform of v)</dd>\n";
  const Json& inputs = arr(rec, {"compensation", "inputs"});
  for (std::size_t k = 0; k < inputs.size() && k < 2; ++k) {
    const Json& in = inputs[k];
    const bool reading = k == 0;
    const std::string var = reading ? "t" : "s";
    const std::string what = reading ? (sv.identity ? "u = reading" : "u = transformed reading") : "a = " + sv.aux_name;
    const std::string unit = reading ? (sv.identity ? u.reading_sfx() : std::string()) : std::string();
    b.o += "<dt>" + std::string(reading ? "Input 1 (reading)" : "Input 2 (" + esc(sv.aux_name) + ")") + "</dt><dd>column " +
           esc(str_or(in, {"column"}, "?")) + "; calibrated range " +
           esc(format_sig(num(in, {"scaling", "min"}), 8)) + " \u2026 " + esc(format_sig(num(in, {"scaling", "max"}), 8)) +
           esc(unit) + (reading && !sv.identity ? " (after the transforms)" : "") + "; " + var + " = (" +
           esc(what.substr(0, 1)) + " \u2212 " + esc(format_sig(num(in, {"scaling", "center"}), 8)) + ") / " +
           esc(format_sig(num(in, {"scaling", "half_width"}), 8)) + ", " + esc(what) + "</dd>\n";
  }
  if (sv.has_aux) {
    b.o += "<dt>" + esc(sv.aux_name) + " levels</dt><dd>" +
           esc(str_or(rec, {"compensation", "aux_grouping"}, "not recorded")) + "</dd>\n";
  }
  b.o += "<dt>Boundary rule</dt><dd>" + esc(str_or(rec, {"compensation", "boundary_rule"}, "not recorded")) + "</dd>\n";
}

void surface_coefficients(Builder& b, const Json& rec, const SurfaceView& sv) {
  const Json& terms = arr(rec, {"compensation", "terms"});
  if (terms.empty()) {
    b.o += "<p class=\"missing\">The record holds no terms.</p>\n";
    return;
  }
  const bool power = str_or(rec, {"model", "basis"}, "") == "power";
  const std::string bi = power ? "t<sup>i</sup>" : "T<sub>i</sub>(t)";
  const std::string bj = power ? "s<sup>j</sup>" : "T<sub>j</sub>(s)";
  b.o += "<table class=\"coefficients\"><tr><th class=\"num\">i (reading)</th>";
  if (sv.has_aux) b.o += "<th class=\"num\">j (" + esc(sv.aux_name) + ")</th>";
  b.o += "<th class=\"num\">coefficient c<sub>m</sub> of " + bi + (sv.has_aux ? "\u00B7" + bj : std::string()) +
         "</th></tr>\n";
  for (const Json& t : terms) {
    b.o += "<tr><td class=\"num\">" + esc(str_or(t, {"i"}, "?")) + "</td>";
    if (sv.has_aux) b.o += "<td class=\"num\">" + esc(str_or(t, {"j"}, "?")) + "</td>";
    b.o += "<td class=\"num mono\">" + esc(format_exact(num(t, {"coefficient"}))) + "</td></tr>\n";
  }
  b.o += "</table>\n<p class=\"note\">v = \u03A3<sub>m</sub> c<sub>m</sub> " + bi +
         (sv.has_aux ? "\u00B7" + bj : std::string()) +
         (sv.identity ? ", in reference units." : ", in the transformed output; the reference is the inverse reference "
                                                  "transform of v.") +
         " The terms are the form that was fitted; the record also holds the same polynomial in powers of the scaled "
         "inputs (<span class=\"mono\">compensation.monomial_coefficients</span>, for a nested Horner scheme) and "
         "of the unscaled inputs (documentation only).</p>\n";
}

/// Fold number, or a dash for none (test setpoints carry -1 or null).
std::string fold_text(const Json& s) {
  const auto f = num(s, {"fold"});
  if (!f || *f < 0) return "\u2014";
  return str_or(s, {"fold"}, "\u2014");
}

void split_section(Builder& b, const Json& rec, const Units& u, const SurfaceView& sv) {
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
           (u.reading.empty() ? "" : "<br/>[" + esc(u.reading) + "]") + "</th>" +
           (sv.has_aux ? "<th class=\"num\">" + esc(sv.aux_name) + "</th>" : std::string()) +
           "<th>role</th><th class=\"num\">fold</th></tr>\n";
    for (std::size_t i = start; i < std::min(sp.size(), start + per_table); ++i) {
      const Json& s = sp[i];
      const std::string role = str_or(s, {"role"}, "");
      b.o += "<tr><td>" + esc(str_or(s, {"id"}, "")) + "</td><td class=\"num\">" +
             esc(format_sig(num(s, {"reference"}), 6)) + "</td><td class=\"num\">" +
             esc(format_sig(num(s, {"reading"}), 6)) + "</td>" +
             (sv.has_aux ? "<td class=\"num\">" + esc(format_sig(num(s, {"aux"}), 6)) + "</td>" : std::string()) + "<td>" +
             (normalise_role(role) == "test" ? "<b>" + esc(role) + "</b>" : esc(role)) + "</td><td class=\"num\">" +
             esc(fold_text(s)) + "</td></tr>\n";
    }
    b.o += "</table>\n";
  }
  b.o += "</div>\n<p class=\"note\">Fold \u2014: the setpoint is in no cross-validation fold (test setpoints, and "
         "training setpoints that no fold holds out).</p>\n";
  b.close_section();
}

void cautions_section(Builder& b, const Json& rec, const SurfaceView& sv) {
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
  if (sv.has_aux)
    b.o += "<li>The compensated model is valid only inside the calibrated region of <b>both</b> inputs (the ranges "
           "in the model section); outside it, in the reading or in " + esc(sv.aux_name) +
           ", the values are extrapolated.</li>\n";
  else if (all_lower.find("extrapolat") == std::string::npos)
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
  const SurfaceView sv = read_surface(rec);
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
  fit_figure(b, pts, model, sv, u);
  error_figure(b, pts, u, tol, unc, dec);
  const int next_fig = surface_figures(b, pts, sv, u, tol, 3);
  validation_figure(b, rec, u, next_fig);
  b.o += "</section>\n";
  metrics_section(b, rec, u);
  warnings_section(b, rec);
  as_found_section(b, rec);
  model_section(b, rec, u, model, sv);
  split_section(b, rec, u, sv);
  cautions_section(b, rec, sv);
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
