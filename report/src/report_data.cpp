#include "report_data.hpp"

#include <cctype>
#include <cmath>

#include "ridgecal/report/html_escape.hpp"
#include "ridgecal/report/number_format.hpp"

namespace ridgecal::report::detail {

std::string esc(const std::string& s) {
  return html_escape(s);
}

std::string lower(std::string s) {
  for (char& c : s) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  return s;
}

std::string upper(std::string s) {
  for (char& c : s) c = static_cast<char>(std::toupper(static_cast<unsigned char>(c)));
  return s;
}

const SeriesStyle kTrainStyle{"#1f4e9a", 0, "", Marker::circle, true, 7.5};
const SeriesStyle kValidationStyle{"#b35900", 0, "", Marker::square, false, 7.5};
const SeriesStyle kTestStyle{"#a0001c", 0, "", Marker::triangle, true, 9.0};

const char* const kDegreeColors[8] = {"#1f4e9a", "#b35900", "#2e7d32", "#6a1b9a",
                                      "#4e342e", "#00707a", "#ad1457", "#555555"};
const Marker kDegreeMarkers[8] = {Marker::circle,  Marker::square,        Marker::triangle,
                                  Marker::diamond, Marker::triangle_down, Marker::cross,
                                  Marker::plus,    Marker::circle};
const char* const kDegreeDashes[8] = {"", "7 3", "2 3", "9 3 2 3", "4 4", "1 2", "12 4", "6 2 2 2"};

double ToleranceView::limit(double r) const {
  return offset + proportional * std::fabs(r) + percent_of_span / 100.0 * span;
}

namespace {

std::vector<Point> points_of(const Calibration& cal) {
  std::vector<Point> pts;
  for (const PointResult& p : cal.points) {
    Point q;
    q.reading = p.reading;
    q.reference = p.reference;
    q.predicted = p.predicted;
    // Held-out prediction of a training point by the model fitted without its fold.
    q.cv_predicted = p.cv_predicted;
    q.aux = p.aux;
    q.role = p.role == SetRole::Test ? "test" : "train";
    pts.push_back(q);
  }
  return pts;
}

ToleranceView tolerance_of(const CalibrationRecord& rec, const Units& u) {
  ToleranceView t;
  if (!rec.tolerance) return t;
  const ToleranceSpec& spec = *rec.tolerance;
  t.present = true;
  t.readable = true;
  t.offset = std::fabs(spec.offset);
  t.proportional = std::fabs(spec.proportional);
  t.percent_of_span = std::fabs(spec.percent_of_span);
  if (t.percent_of_span > 0) t.span = std::fabs(spec.span_high - spec.span_low);
  std::string note;
  if (!spec.source.empty() && spec.source != "user") note = "source: " + spec.source;
  if (t.offset == 0 && t.proportional == 0 && t.percent_of_span == 0) t.readable = false;
  const std::string us = u.reference_sfx();
  std::vector<std::string> parts;
  if (t.offset > 0) parts.push_back(format_sig(t.offset, 4) + us);
  if (t.proportional > 0)
    parts.push_back(format_sig(100.0 * t.proportional, 3) + " % of |reference|");
  if (t.percent_of_span > 0)
    parts.push_back(format_sig(t.percent_of_span, 3) + " % of the span (" + format_sig(t.span, 4) +
                    us + ")");
  std::string formula;
  for (std::size_t i = 0; i < parts.size(); ++i) formula += (i ? " + " : "") + parts[i];
  if (t.readable) t.text = esc(parts.size() == 1 ? "\u00B1" + formula : "\u00B1(" + formula + ")");
  if (!note.empty()) t.text += (t.text.empty() ? "" : " \u2014 ") + esc(note);
  if (t.text.empty()) t.text = "given, but without a readable value";
  return t;
}

DecisionView decision_of(const CalibrationRecord& rec) {
  DecisionView d;
  if (!rec.decision) return d;
  const Decision& dec = *rec.decision;
  d.present = true;
  d.verdict = to_string(dec.verdict);
  d.rule = dec.rule == DecisionRule::GuardedAcceptance
               ? "guarded acceptance: a point conforms when |error| \u2264 tolerance \u2212 U at "
                 "that point, does not conform when |error| > tolerance; in between (the guard "
                 "band) conformity is not shown"
               : "simple acceptance: a point conforms when |error| \u2264 tolerance";
  d.detail = dec.statement;
  for (const SetJudgement& set : dec.sets) {
    std::string line = set.name + ": ";
    line += fmt::format("{} of {} points conform",
                        static_cast<long>(set.n - set.failed - set.not_shown),
                        static_cast<long>(set.n));
    if (set.failed > 0) line += fmt::format(", {} do not conform", static_cast<long>(set.failed));
    if (set.not_shown > 0)
      line += fmt::format(", {} conformity not shown", static_cast<long>(set.not_shown));
    line += ", max |error| " + format_sig(set.max_abs_error, 3);
    if (std::isfinite(set.worst_ratio))
      line += ", worst " + format_fixed(100.0 * set.worst_ratio, 0) + " % of the limit";
    line += " \u2014 " + to_string(set.verdict);
    if (!set.counts) line += " (for information, does not decide)";
    d.set_lines.push_back(line);
  }
  for (const PointJudgement& p : dec.points) {
    const bool located = std::isfinite(p.reference);
    if (!p.pass && located && std::isfinite(p.error))
      d.fail_ref.push_back(p.reference), d.fail_err.push_back(p.error);
    if (dec.rule == DecisionRule::GuardedAcceptance && located &&
        std::isfinite(p.acceptance_limit) && p.set != "validation")
      d.acc_ref.push_back(p.reference), d.acc_limit.push_back(p.acceptance_limit);
  }
  return d;
}

UncertaintyView uncertainty_of(const CalibrationRecord& rec) {
  UncertaintyView out;
  if (!rec.uncertainty) return out;
  const UncertaintyBudget& u = *rec.uncertainty;
  out.present = true;
  out.expanded = u.expanded;
  out.k = u.k;
  // The band is placed on the reference axis at the calibrated value of its reading.
  for (const BandPoint& b : u.band)
    if (std::isfinite(b.predicted) && std::isfinite(b.expanded))
      out.band_x.push_back(b.predicted), out.band_u.push_back(std::fabs(b.expanded));
  return out;
}

}  // namespace

ReportData::ReportData(const CalibrationRecord& r, const RecordSeal& s) : rec(r), seal(s) {
  units.reading = r.sensor.reading_unit;
  units.reference = r.sensor.reference_unit;
  points = points_of(r.calibration);
  model = describe_model(r);
  aux_name = r.input.columns.aux_column.empty() ? "aux" : r.input.columns.aux_column;
  tolerance = tolerance_of(r, units);
  decision = decision_of(r);
  uncertainty = uncertainty_of(r);
}

}  // namespace ridgecal::report::detail
