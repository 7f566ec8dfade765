// ridgecal report (internal): the section "Model, selection and coefficients"
// for polynomial and extended records.
#include <algorithm>
#include <cmath>

#include "report_data.hpp"
#include "ridgecal/report/number_format.hpp"

namespace ridgecal::report::detail {

namespace {

std::string selection_text(const SelectionInfo& s) {
  if (s.mode == SelectionMode::Fixed) return "fixed by the operator (no model selection)";
  std::string sel = "chosen by grouped cross-validation over setpoints (" +
                    esc(to_string(s.scheme)) + ", " + esc(std::to_string(s.n_folds)) +
                    " folds), rule \u201C" + esc(to_string(s.rule)) + "\u201D";
  std::string degs, lams;
  for (int d : s.degrees) degs += (degs.empty() ? "" : ", ") + esc(std::to_string(d));
  if (s.lambdas.size() > 8) {
    // A long log-spaced grid: say how many, and the range.
    double lo = kNaN, hi = kNaN;
    bool zero = false;
    for (double v : s.lambdas) {
      if (v == 0.0)
        zero = true;
      else if (std::isfinite(v))
        lo = std::isfinite(lo) ? std::min(lo, v) : v, hi = std::isfinite(hi) ? std::max(hi, v) : v;
    }
    lams = esc(fmt::format("{} values: {}{} \u2026 {}", s.lambdas.size(), zero ? "0 and " : "",
                           format_lambda(lo), format_lambda(hi)));
  } else {
    for (double v : s.lambdas) lams += (lams.empty() ? "" : ", ") + esc(format_lambda(v));
  }
  if (!degs.empty()) sel += "; degrees tried: " + degs;
  if (!lams.empty()) sel += "; \u03BB tried: " + lams;
  return sel;
}

void surface_model_rows(Builder& b, const ReportData& d) {
  const ModelView& m = d.model;
  const CalibrationRecord& rec = d.rec;
  const std::string& aux = d.aux_name;
  std::string shape = "reading degree " + esc(std::to_string(m.reading_degree));
  if (m.has_aux)
    shape += ", " + esc(aux) + " degree " + esc(std::to_string(m.aux_degree)) + ", total degree " +
             esc(std::to_string(m.degree));
  b.o +=
      "<dt>Model</dt><dd>extended calibration model" +
      std::string(m.has_aux ? " in two inputs (reading and " + esc(aux) + ")" : " in the reading") +
      ": " + shape + fmt::format(", {} terms", m.terms.size()) +
      ", ridge penalty \u03BB = " + esc(format_lambda(rec.calibration.lambda)) + "</dd>\n";
  std::string basis_text =
      m.basis == "power" ? "plain powers t<sup>i</sup>" : "Chebyshev T<sub>i</sub>(t)";
  if (m.has_aux)
    basis_text = m.basis == "power" ? "plain powers t<sup>i</sup>\u00B7s<sup>j</sup>"
                                    : "tensor Chebyshev T<sub>i</sub>(t)\u00B7T<sub>j</sub>(s)";
  b.o += "<dt>Basis</dt><dd>" + basis_text + " of the scaled input" + (m.has_aux ? "s" : "") +
         "; terms " + esc(m.term_rule) + "</dd>\n";
  if (m.identity)
    b.o +=
        "<dt>Transforms</dt><dd>none: the polynomial gives the reference directly from the "
        "reading</dd>\n";
  else
    b.o += "<dt>Transforms</dt><dd>" + esc(m.chain) +
           " (the polynomial maps the transformed reading u to the transformed reference v; the "
           "reported value is "
           "the inverse reference transform of v)</dd>\n";
  for (int k = 0; k < (m.has_aux ? 2 : 1); ++k) {
    const bool reading = k == 0;
    const InputRange& in = reading ? m.reading : m.aux;
    const std::string& column =
        reading ? rec.input.columns.reading_column : rec.input.columns.aux_column;
    const std::string var = reading ? "t" : "s";
    const std::string what =
        reading ? (m.identity ? "u = reading" : "u = transformed reading") : "a = " + aux;
    const std::string unit = reading && m.identity ? d.units.reading_sfx() : std::string();
    b.o += "<dt>" + std::string(reading ? "Input 1 (reading)" : "Input 2 (" + esc(aux) + ")") +
           "</dt><dd>column " + esc(column) + "; calibrated range " + esc(format_sig(in.min, 8)) +
           " \u2026 " + esc(format_sig(in.max, 8)) + esc(unit) +
           (reading && !m.identity ? " (after the transforms)" : "") + "; " + var + " = (" +
           esc(what.substr(0, 1)) + " \u2212 " + esc(format_sig(in.center, 8)) + ") / " +
           esc(format_sig(in.half_width, 8)) + ", " + esc(what) + "</dd>\n";
  }
  if (m.has_aux) b.o += "<dt>" + esc(aux) + " levels</dt><dd>" + esc(m.aux_grouping) + "</dd>\n";
  b.o += "<dt>Boundary rule</dt><dd>" + esc(m.boundary_rule) + "</dd>\n";
}

void surface_coefficients(Builder& b, const ReportData& d) {
  const ModelView& m = d.model;
  if (m.terms.empty()) {
    b.o += "<p class=\"missing\">The record holds no terms.</p>\n";
    return;
  }
  const bool power = m.basis == "power";
  const std::string bi = power ? "t<sup>i</sup>" : "T<sub>i</sub>(t)";
  const std::string bj = power ? "s<sup>j</sup>" : "T<sub>j</sub>(s)";
  b.o += "<table class=\"coefficients\"><tr><th class=\"num\">i (reading)</th>";
  if (m.has_aux) b.o += "<th class=\"num\">j (" + esc(d.aux_name) + ")</th>";
  b.o += "<th class=\"num\">coefficient c<sub>m</sub> of " + bi +
         (m.has_aux ? "\u00B7" + bj : std::string()) + "</th></tr>\n";
  for (const TermView& t : m.terms) {
    b.o += "<tr><td class=\"num\">" + esc(std::to_string(t.i)) + "</td>";
    if (m.has_aux) b.o += "<td class=\"num\">" + esc(std::to_string(t.j)) + "</td>";
    b.o += "<td class=\"num mono\">" + esc(format_exact(t.coefficient)) + "</td></tr>\n";
  }
  b.o += "</table>\n<p class=\"note\">v = \u03A3<sub>m</sub> c<sub>m</sub> " + bi +
         (m.has_aux ? "\u00B7" + bj : std::string()) +
         (m.identity ? ", in reference units."
                     : ", in the transformed output; the reference is the inverse reference "
                       "transform of v.") +
         " The terms are the form that was fitted; the record also holds the same polynomial in "
         "powers of the scaled "
         "inputs (<span class=\"mono\">compensation.monomial_coefficients</span>, for a nested "
         "Horner scheme) and "
         "of the unscaled inputs (documentation only).</p>\n";
}

void polynomial_coefficients(Builder& b, const ModelView& m) {
  const std::size_t n = std::max(m.chebyshev.size(), m.power.size());
  if (n == 0) {
    b.o += "<p class=\"missing\">The record holds no coefficients.</p>\n";
    return;
  }
  b.o +=
      "<table class=\"coefficients\"><tr><th class=\"num\">k</th><th class=\"num\">Chebyshev "
      "c<sub>k</sub> "
      "(of T<sub>k</sub>(t))</th><th class=\"num\">power a<sub>k</sub> (of "
      "x<sup>k</sup>)</th></tr>\n";
  for (std::size_t i = 0; i < n; ++i) {
    b.o += fmt::format(
        "<tr><td class=\"num\">{}</td><td class=\"num mono\">{}</td><td class=\"num "
        "mono\">{}</td></tr>\n",
        i, esc(i < m.chebyshev.size() ? format_exact(m.chebyshev[i]) : std::string()),
        esc(i < m.power.size() ? format_exact(m.power[i]) : std::string()));
  }
  b.o +=
      "</table>\n<p class=\"note\">p(x) = \u03A3 c<sub>k</sub> T<sub>k</sub>(t) = \u03A3 "
      "a<sub>k</sub> x<sup>k</sup>, in "
      "reference units. The Chebyshev form is the one that was fitted; the power form is derived "
      "from it and "
      "can lose digits when evaluated far from zero.</p>\n";
}

}  // namespace

void model_section(Builder& b, const ReportData& d) {
  const Calibration& cal = d.rec.calibration;
  const ModelView& m = d.model;
  const Units& u = d.units;
  b.open_section("model", "Model, selection and coefficients");
  b.o += "<dl class=\"meta\">\n";
  if (m.extended)
    surface_model_rows(b, d);
  else
    b.o += "<dt>Polynomial</dt><dd>degree " + esc(std::to_string(m.degree)) +
           ", ridge penalty \u03BB = " + esc(format_lambda(cal.lambda)) + "</dd>\n";
  b.o += "<dt>Selection</dt><dd>" + selection_text(cal.selection) + "</dd>\n";
  std::string notes;
  for (const std::string& n : cal.selection.notes) notes += "<div>" + esc(n) + "</div>";
  if (!notes.empty()) b.o += "<dt>Selection notes</dt><dd>" + notes + "</dd>\n";
  if (!cal.intercept)
    b.o +=
        "<dt>Intercept</dt><dd>none: the curve is forced through reading 0 \u2192 reference "
        "0</dd>\n";
  if (std::isfinite(cal.condition_number))
    b.o += "<dt>Condition number</dt><dd>" + esc(format_sig(cal.condition_number, 3)) +
           (m.extended ? " (of the centred design matrix of the scaled basis)"
                       : " (of the scaled Chebyshev design matrix)") +
           "</dd>\n";
  if (!m.extended) {
    b.o += "<dt>Scaled variable</dt><dd>t = (x \u2212 " + esc(format_sig(m.reading.center, 8)) +
           ") / " + esc(format_sig(m.reading.half_width, 8)) + ", x = reading" +
           esc(u.reading_sfx()) + "; calibrated range " + esc(format_sig(m.reading.min, 8)) +
           " \u2026 " + esc(format_sig(m.reading.max, 8)) + esc(u.reading_sfx()) + "</dd>\n";
  }
  b.o += "</dl>\n";
  if (m.extended)
    surface_coefficients(b, d);
  else
    polynomial_coefficients(b, m);
  b.close_section();
}

}  // namespace ridgecal::report::detail
