#include "ridgecal/assessment.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cassert>
#include <cmath>
#include <optional>

#include "ridgecal/errors.hpp"

namespace ridgecal {

std::string AssessmentOptions::validate() const {
  if (tolerance) {
    ToleranceSpec t = *tolerance;
    if (t.percent_of_span > 0.0 && !(t.span_high > t.span_low)) {
      t.span_low = 0.0;  // resolved later; validate the other terms
      t.span_high = 1.0;
    }
    if (std::string e = t.validate(); !e.empty()) return "tolerance: " + e;
  }
  if (std::string e = uncertainty.validate(); !e.empty()) return "uncertainty: " + e;
  if (std::string e = diagnostics.validate(); !e.empty()) return "diagnostics: " + e;
  return {};
}

void resolve_span(ToleranceSpec& tol, const Calibration& cal, const DiagnosticOptions& diag,
                  const std::string& file) {
  if (!(tol.percent_of_span > 0.0) || tol.span_high > tol.span_low) return;
  if (diag.has_span()) {
    tol.span_low = diag.span_low;
    tol.span_high = diag.span_high;
    return;
  }
  bool any = false;
  for (const SetpointResult& sp : cal.setpoints)
    if (sp.role == SetRole::Train) {
      tol.span_low = any ? std::min(tol.span_low, sp.mean_reference) : sp.mean_reference;
      tol.span_high = any ? std::max(tol.span_high, sp.mean_reference) : sp.mean_reference;
      any = true;
    }
  if (!(tol.span_high > tol.span_low))
    throw InputError(file, 0,
                     fmt::format("the tolerance is {} % of the span, but the training references "
                                 "span {} .. {}: a zero span",
                                 tol.percent_of_span, tol.span_low, tol.span_high),
                     "declare the instrument's span (--span LO..HI) or give the tolerance in "
                     "reference units (--tol-offset)");
}

Assessment assess_calibration(const Dataset& data, const Calibration& cal,
                              const AssessmentOptions& options) {
  assert(options.validate().empty());
  Assessment a;
  // The budget, one for every model; U at each point from UncertaintyEvaluator::expanded_at.
  const UncertaintyEvaluator unc(cal, options.uncertainty);
  a.uncertainty = unc.budget();
  const auto expanded_at = [&](const PointResult& p) { return unc.expanded_at(p.reading, p.aux); };
  if (options.tolerance) {
    ToleranceSpec tol = *options.tolerance;
    resolve_span(tol, cal, options.diagnostics, data.file);
    a.tolerance = tol;
    std::vector<PointToJudge> pts;
    for (const PointResult& p : cal.points)
      pts.push_back({p.line, p.role == SetRole::Train ? "training" : "test", p.reference, p.error,
                     expanded_at(p)});
    for (const PointResult& p : cal.points)
      if (p.role == SetRole::Train && std::isfinite(p.cv_predicted))
        pts.push_back(
            {p.line, "validation", p.reference, p.cv_predicted - p.reference, expanded_at(p)});
    if (tol.validate().empty()) a.decision = judge(pts, tol, options.rule, {"validation"});
  }
  a.warnings = diagnose_fit(data, cal, a.uncertainty, a.tolerance ? &*a.tolerance : nullptr,
                            options.diagnostics);
  a.lack_of_fit = lack_of_fit_test(data, cal, options.diagnostics.lack_of_fit_alpha);
  return a;
}

Assessment assess_calibration(const Calibration& cal, const AssessmentOptions& options) {
  return assess_calibration(Dataset{}, cal, options);
}

}  // namespace ridgecal
