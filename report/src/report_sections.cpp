// ridgecal report (internal): the text sections of the report: header,
// verdict, metrics with the uncertainty budget, warnings, split of setpoints,
// cautions and sign-off. (The model section is in model_section.cpp.)
#include <algorithm>
#include <cmath>
#include <optional>

#include "report_data.hpp"
#include "ridgecal/report/number_format.hpp"

namespace ridgecal::report::detail {

namespace {

std::string missing(const char* what) {
  return std::string("<span class=\"missing\">") + what + "</span>";
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

void uncertainty_table(Builder& b, const ReportData& d) {
  if (!d.rec.uncertainty || d.rec.uncertainty->components.empty()) return;
  const UncertaintyBudget& u = *d.rec.uncertainty;
  const std::string ru = d.units.reference.empty() ? "" : " [" + esc(d.units.reference) + "]";
  b.o +=
      "<table class=\"budget\"><tr><th>uncertainty component</th><th>type</th>"
      "<th class=\"num\">u" +
      ru + "</th></tr>\n";
  for (const UncertaintyComponent& c : u.components) {
    const std::string type = to_string(c.type) + ", " + to_string(c.distribution);
    b.o += "<tr><td>" + esc(c.name) + "</td><td>" + esc(type) + "</td><td class=\"num\">" +
           esc(format_sig(c.standard, 3)) + "</td></tr>\n";
  }
  b.o += "<tr><th colspan=\"2\">combined u<sub>c</sub></th><td class=\"num\">" +
         esc(format_sig(u.combined, 3)) + "</td></tr>\n";
  b.o += "<tr><th colspan=\"2\">expanded U = k\u00B7u<sub>c</sub>, k = " + esc(format_sig(u.k, 3)) +
         "</th><td class=\"num\"><b>" + esc(format_sig(u.expanded, 3)) + "</b></td></tr>\n";
  b.o += "</table>\n";
}

}  // namespace

void header_section(Builder& b, const ReportData& d, const ReportOptions& opt) {
  const CalibrationRecord& rec = d.rec;
  const std::string& sensor = rec.sensor.name;
  b.o += "<header id=\"header\">\n";
  b.o += "<h1>Calibration report: " + (sensor.empty() ? missing("unnamed sensor") : esc(sensor)) +
         "</h1>\n";
  b.o += "<dl class=\"meta two\">\n";
  auto row = [&](const std::string& k, const std::string& html, bool wide = false) {
    b.o += std::string(wide ? "<dt class=\"wide-key\">" : "<dt>") + k + "</dt><dd" +
           (wide ? " class=\"wide\"" : "") + ">" + html + "</dd>\n";
  };
  auto or_missing = [](const std::optional<std::string>& s, const char* what = "not recorded") {
    return s ? esc(*s) : missing(what);
  };
  row("Sensor", sensor.empty() ? missing("not named") : esc(sensor), true);
  row("Units",
      "reading in " + esc(rec.sensor.reading_unit) + ", reference in " +
          esc(rec.sensor.reference_unit),
      true);
  const std::optional<std::string> created =
      rec.created_utc.empty() ? std::nullopt : std::optional<std::string>(rec.created_utc);
  row("Report date", or_missing(opt.date ? opt.date : created));
  row("Record created (UTC)", or_missing(created));
  row("Fitted with", "ridgecal " + esc(rec.tool_version), true);
  row("Input data", esc(rec.input.file) + ", " + esc(std::to_string(rec.input.rows)) + " rows",
      true);
  row("Input SHA-256", "<span class=\"mono\">" + esc(rec.input.sha256) + "</span>", true);
  std::string integrity = "<span class=\"mono\">" +
                          (d.seal.stored.empty() ? missing("not recorded") : esc(d.seal.stored)) +
                          "</span>";
  if (!d.seal.stored.empty())
    integrity += d.seal.intact() ? " <b>(verified)</b>"
                                 : " <b class=\"alert\">(DOES NOT MATCH the record content: the "
                                   "record was changed after it "
                                   "was written)</b>";
  row("Record SHA-256", integrity, true);
  const CsvOptions& cols = rec.input.columns;
  row("Columns",
      "reading = " + esc(cols.reading_column) + "; reference = " + esc(cols.reference_column) +
          "; setpoint = " + esc(cols.setpoint_column) +
          (cols.aux_column.empty()
               ? std::string()
               : "; second input (aux) = " + esc(cols.aux_column) +
                     (cols.aux_setpoint_column.empty()
                          ? std::string()
                          : "; aux setpoint = " + esc(cols.aux_setpoint_column))),
      true);
  b.o += "</dl>\n</header>\n";
}

void verdict_section(Builder& b, const ReportData& d) {
  const ToleranceView& tol = d.tolerance;
  const DecisionView& dec = d.decision;
  const UncertaintyView& unc = d.uncertainty;
  b.o += "<section id=\"verdict-section\">\n<h2>Verdict</h2>\n";
  if (!d.seal.intact()) {
    // Issue 14 item 9: nothing stored in a record that fails its digest is
    // shown as a verdict; the stored figures elsewhere are marked untrusted.
    b.o +=
        "<div class=\"verdict modified\" id=\"verdict\">\n<div class=\"word\">RECORD "
        "MODIFIED</div>\n<div class=\"why\">\n<div><b>The record does not match its integrity "
        "digest</b>" +
        std::string(d.seal.stored.empty() ? " (it has none)" : "") +
        ": it was changed after 'ridgecal fit' wrote it. No PASS or FAIL is shown from its "
        "stored data. The stored decision, per-point results, metrics and uncertainty below are "
        "not trustworthy.</div>\n<div>Re-create the record with 'ridgecal fit' from the original "
        "data.</div>\n</div>\n</div>\n</section>\n";
    return;
  }
  std::string cls = "none", word = "NO DECISION";
  if (dec.present) {
    word = esc(dec.verdict);
    if (dec.verdict == "PASS")
      cls = "pass";
    else if (dec.verdict == "FAIL" || dec.verdict == "UNDECIDED")
      cls = "fail";  // UNDECIDED is not accepted either (decision.hpp)
    if (dec.verdict == "UNDECIDED") word = "UNDECIDED \u2014 CONFORMITY NOT SHOWN";
  }
  b.o += fmt::format(
      "<div class=\"verdict {}\" id=\"verdict\">\n<div class=\"word\">{}</div>\n<div "
      "class=\"why\">\n",
      cls, word);
  if (!tol.present) {
    b.o +=
        "<div><b>No tolerance given \u2014 no decision.</b> The record states no acceptance "
        "tolerance, so this report does not judge the fit.</div>\n";
  } else {
    b.o +=
        "<div><b>Tolerance:</b> " + tol.text + " on the error (predicted \u2212 reference)</div>\n";
    if (!dec.present) b.o += "<div><b>The record holds no decision</b> for this tolerance.</div>\n";
  }
  if (dec.present) b.o += "<div><b>Decision rule:</b> " + esc(dec.rule) + "</div>\n";
  // The record's statement repeats the rule and the counts; show it only when
  // the per-set counts are not otherwise known.
  if (!dec.detail.empty() && (dec.set_lines.empty() || dec.verdict == "UNDECIDED"))
    b.o += "<div>" + esc(dec.detail) + "</div>\n";
  for (const std::string& line : dec.set_lines)
    b.o += "<div class=\"set\">" + esc(line) + "</div>\n";
  if (unc.present)
    b.o += "<div><b>Expanded uncertainty:</b> U = " + esc(format_sig(unc.expanded, 3)) +
           esc(d.units.reference_sfx()) +
           (std::isfinite(unc.k) ? " (k = " + esc(format_sig(unc.k, 3)) + ")" : std::string()) +
           (unc.band_x.empty() ? "" : ", varying along the range (hatched band in figure 2)") +
           "</div>\n";
  if (dec.set_lines.empty()) {
    const double mt = max_abs_error(d.points, "test", false),
                 mv = max_abs_error(d.points, "train", true);
    const double mtr = max_abs_error(d.points, "train", false);
    b.o += "<div><b>Largest |error|:</b> test " + esc(format_sig(mt, 3)) +
           ", validation (held-out) " + esc(format_sig(mv, 3)) + ", training " +
           esc(format_sig(mtr, 3)) + esc(d.units.reference_sfx()) + "</div>\n";
  }
  b.o += "</div>\n</div>\n";
  b.o += "</section>\n";
}

// One line per row: the table's words for the outcomes (the note below the
// table and the record's statement give them in full).
std::string short_conformity(Conformity c) {
  switch (c) {
    case Conformity::Conforms:
      return "conforms";
    case Conformity::NotShownGuardBand:
      return "not shown: guard band";
    case Conformity::NotShownUncertainty:
      return "not shown: U \u2265 limit";
    case Conformity::DoesNotConform:
      return "does not conform";
  }
  return "does not conform";
}

void points_section(Builder& b, const ReportData& d) {
  if (!d.rec.decision) return;  // no tolerance: nothing judged per point
  const Decision& dec = *d.rec.decision;
  b.open_section("points", "Results per point");
  if (!d.seal.intact())
    b.o +=
        "<p class=\"alert untrusted\"><b>Not trustworthy:</b> the record does not match its "
        "integrity digest; the stored results below are shown for inspection only.</p>\n";
  const std::string ru = d.units.reference.empty() ? "" : " [" + esc(d.units.reference) + "]";
  b.o +=
      "<table class=\"points\" id=\"points-table\"><tr><th>line</th><th>set</th>"
      "<th>setpoint</th><th class=\"num\">reference" +
      ru + "</th><th class=\"num\">indicated" + ru + "</th><th class=\"num\">error" + ru +
      "</th><th class=\"num\">limit" + ru + "</th><th class=\"num\">U" + ru +
      "</th><th class=\"num\">limit/U</th><th>conformity</th></tr>\n";
  std::size_t shown = 0, total = 0;
  for (const PointJudgement& p : dec.points) {
    if (p.set == "validation") continue;  // cross-validated predictions, not the curve's output
    ++total;
    if (shown >= kMaxPointRows) continue;
    ++shown;
    const char* cls = p.conformity == Conformity::Conforms         ? "conf-ok"
                      : p.conformity == Conformity::DoesNotConform ? "conf-fail"
                                                                   : "conf-not-shown";
    const bool low_tur = std::isfinite(p.tur) && p.tur < dec.tur_warning;
    b.o += fmt::format(
        "<tr class=\"{}\"><td class=\"num\">{}</td><td>{}</td><td>{}</td><td "
        "class=\"num\">{}</td><td class=\"num\">{}</td><td class=\"num\">{}</td><td "
        "class=\"num\">{}</td><td class=\"num\">{}</td><td "
        "class=\"num{}\">{}</td><td class=\"conf\">{}</td></tr>\n",
        cls, p.line, esc(p.set), esc(p.setpoint), esc(format_sig(p.reference, 6)),
        esc(format_sig(p.indicated, 6)), esc(format_sig(p.error, 3)), esc(format_sig(p.limit, 3)),
        p.uncertainty > 0.0 ? esc(format_sig(p.uncertainty, 3)) : std::string("\u2014"),
        low_tur ? " low-tur" : "",
        std::isfinite(p.tur) ? esc(format_sig(p.tur, 2)) + ":1" : std::string("\u2014"),
        esc(short_conformity(p.conformity)));
  }
  b.o += "</table>\n";
  if (shown < total)
    b.o += fmt::format(
        "<p class=\"note\">The first {} of {} points are listed; the record's decision.points "
        "holds them all.</p>\n",
        shown, total);
  b.o += fmt::format(
      "<p class=\"note\">Indicated = the calibrated curve's output at the reading; error = "
      "indicated \u2212 reference; U = expanded uncertainty at that point; limit/U = test "
      "uncertainty ratio (values below {}:1 in bold; common practice asks for at least 4:1). "
      "Conformity in ILAC-G8 decision-rule terms: <i>conforms</i>; <i>does not conform</i> "
      "(|error| &gt; limit); <i>conformity not shown</i> (inside the tolerance, but in the guard "
      "band of guarded acceptance, or with U \u2265 limit). Points judged on cross-validated "
      "predictions (validation) are counted in the verdict box for information only.</p>\n",
      format_sig(dec.tur_warning, 3));
  b.close_section();
}

void metrics_section(Builder& b, const ReportData& d) {
  const Calibration& cal = d.rec.calibration;
  b.open_section("metrics", "Metrics");
  if (!d.seal.intact())
    b.o +=
        "<p class=\"alert untrusted\"><b>Not trustworthy:</b> the record does not match its "
        "integrity digest; these stored metrics may not belong to the curve.</p>\n";
  const std::pair<const char*, const Metrics*> cols[] = {
      {"training", &cal.training}, {"validation", &cal.validation}, {"test", &cal.test}};
  const std::string ru = d.units.reference.empty() ? "" : " [" + esc(d.units.reference) + "]";
  struct Row {
    std::string label;
    std::string (*cell)(const Metrics&);
  };
  const Row rows[] = {
      {"points", [](const Metrics& m) { return std::to_string(m.n); }},
      {"predictors", [](const Metrics& m) { return std::to_string(m.predictors); }},
      {"RMSE" + ru, [](const Metrics& m) { return format_sig(m.rmse, 3); }},
      {"max |error|" + ru, [](const Metrics& m) { return format_sig(m.max_abs_error, 3); }},
      {"bias" + ru, [](const Metrics& m) { return format_sig(m.bias, 3); }},
      {"R\u00B2", [](const Metrics& m) { return format_fixed(m.r2, 8); }},
      {"adjusted R\u00B2", [](const Metrics& m) { return format_fixed(m.adj_r2, 8); }}};
  b.o += "<div class=\"side\">\n<table class=\"metrics\"><tr><th></th>";
  for (const auto& c : cols) b.o += "<th class=\"num\">" + esc(c.first) + "</th>";
  b.o += "</tr>\n";
  for (const Row& r : rows) {
    b.o += "<tr><th>" + r.label + "</th>";
    for (const auto& c : cols) b.o += "<td class=\"num\">" + esc(r.cell(*c.second)) + "</td>";
    b.o += "</tr>\n";
  }
  b.o += "</table>\n";
  uncertainty_table(b, d);
  b.o +=
      "</div>\n<p class=\"note\">Error = predicted \u2212 reference; bias = mean error. "
      "Validation: each training "
      "point predicted by the model fitted without its fold (cross-validation). Test: setpoints "
      "held out of fitting "
      "and of model selection.</p>\n";
  b.close_section();
}

void warnings_section(Builder& b, const ReportData& d) {
  b.open_section("warnings", "Warnings");
  const std::vector<Warning>& w = d.rec.warnings;
  // The fitter writes the list whenever it assessed the fit (the record then
  // holds an uncertainty budget) or there is a warning.
  if (w.empty() && !d.rec.uncertainty) {
    b.o += "<p class=\"missing\">The record has no warnings list.</p>\n";
  } else if (w.empty()) {
    b.o += "<p>None.</p>\n";
  } else {
    b.o += "<table class=\"warnings\"><tr><th>code</th><th>message</th></tr>\n";
    for (const Warning& e : w)
      b.o += "<tr><td class=\"mono\">" + esc(to_string(e.code)) + "</td><td>" + esc(e.message) +
             "</td></tr>\n";
    b.o += "</table>\n";
  }
  b.close_section();
}

void split_section(Builder& b, const ReportData& d) {
  const Calibration& cal = d.rec.calibration;
  const Units& u = d.units;
  const bool has_aux = d.model.has_aux;
  b.open_section("split", "Split of setpoints");
  b.o += "<p>Seed " + esc(std::to_string(cal.split_options.seed)) + ", test fraction " +
         esc(format_sig(cal.split_options.test_fraction, 3)) +
         ". Whole setpoints are assigned to the test set or to a cross-validation fold, so "
         "repeated readings at one "
         "setpoint never sit on both sides.</p>\n";
  const std::vector<SetpointResult>& sp = cal.setpoints;
  if (sp.empty()) {
    b.o += "<p class=\"missing\">The record lists no setpoints.</p>\n";
    b.close_section();
    return;
  }
  const std::size_t per_table = sp.size() > 6 ? (sp.size() + 1) / 2 : sp.size();
  b.o += "<div class=\"cols\">\n";
  for (std::size_t start = 0; start < sp.size(); start += per_table) {
    b.o += "<table class=\"setpoints\"><tr><th>setpoint</th><th class=\"num\">reference" +
           (u.reference.empty() ? "" : "<br/>[" + esc(u.reference) + "]") +
           "</th><th class=\"num\">reading" +
           (u.reading.empty() ? "" : "<br/>[" + esc(u.reading) + "]") + "</th>" +
           (has_aux ? "<th class=\"num\">" + esc(d.aux_name) + "</th>" : std::string()) +
           "<th>role</th><th class=\"num\">fold</th></tr>\n";
    for (std::size_t i = start; i < std::min(sp.size(), start + per_table); ++i) {
      const SetpointResult& s = sp[i];
      const std::string role = to_string(s.role);
      // Fold number, or a dash for none (test setpoints carry -1).
      const std::string fold = s.fold < 0 ? "\u2014" : std::to_string(s.fold);
      b.o += "<tr><td>" + esc(s.id) + "</td><td class=\"num\">" +
             esc(format_sig(s.mean_reference, 6)) + "</td><td class=\"num\">" +
             esc(format_sig(s.mean_reading, 6)) + "</td>" +
             (has_aux ? "<td class=\"num\">" + esc(format_sig(s.mean_aux, 6)) + "</td>"
                      : std::string()) +
             "<td>" + (s.role == SetRole::Test ? "<b>" + esc(role) + "</b>" : esc(role)) +
             "</td><td class=\"num\">" + esc(fold) + "</td></tr>\n";
    }
    b.o += "</table>\n";
  }
  b.o +=
      "</div>\n<p class=\"note\">Fold \u2014: the setpoint is in no cross-validation fold (test "
      "setpoints, and "
      "training setpoints that no fold holds out).</p>\n";
  b.close_section();
}

void cautions_section(Builder& b, const ReportData& d) {
  b.open_section("cautions", "Cautions");
  b.o += "<ul class=\"cautions\">\n";
  // The record's own cautions first; the report's standard ones only where the
  // record does not already say the same (no duplicated lines for the reviewer).
  std::string all_lower;
  for (const std::string& c : d.rec.cautions) {
    b.o += "<li>" + esc(c) + "</li>\n";
    all_lower += lower(c) + "\n";
  }
  if (all_lower.find("local code") == std::string::npos)
    b.o +=
        "<li>Calibration of safety-relevant instruments follows the local codes and the certified "
        "procedures "
        "that apply to them; this fit does not replace them.</li>\n";
  if (all_lower.find("accredited") == std::string::npos)
    b.o +=
        "<li>This report documents a software fit for quality review. It does not replace a "
        "calibration "
        "certificate from an accredited laboratory.</li>\n";
  if (d.model.has_aux)
    b.o +=
        "<li>The compensated model is valid only inside the calibrated region of <b>both</b> "
        "inputs (the ranges "
        "in the model section); outside it, in the reading or in " +
        esc(d.aux_name) + ", the values are extrapolated.</li>\n";
  else if (all_lower.find("extrapolat") == std::string::npos)
    b.o +=
        "<li>The polynomial is valid only inside the calibrated range of readings; outside it the "
        "values are "
        "extrapolated.</li>\n";
  b.o += "</ul>\n";
  b.close_section();
}

void signoff_section(Builder& b) {
  b.o +=
      "<section id=\"sign-off\" class=\"signoff\">\n<h2>Sign-off</h2>\n"
      "<table><tr><th></th><th>Name</th><th>Signature</th><th style=\"width:32mm\">Date</th></tr>\n"
      "<tr><th>Performed by</th><td></td><td></td><td></td></tr>\n"
      "<tr><th>Reviewed by</th><td></td><td></td><td></td></tr>\n"
      "</table>\n</section>\n";
}

}  // namespace ridgecal::report::detail
