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
  if (!(std::isfinite(adequacy_limit) &&
        (adequacy_limit == 0.0 || (adequacy_limit >= 1.0 && adequacy_limit <= 100.0))))
    return fmt::format(
        "adequacy_limit is {}; it must be 0 (no adequacy check) or between 1 and 100",
        adequacy_limit);
  if (std::string e = validate_tur_warning(tur_warning); !e.empty()) return e;
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

AdequacyCheck check_adequacy(const Calibration& cal, const UncertaintyEvaluator& unc,
                             double limit) {
  AdequacyCheck c;
  c.limit = limit;
  if (!(limit > 0.0)) return c;
  double e2 = 0.0, u02 = 0.0, u2 = 0.0;
  for (const PointResult& p : cal.points) {
    if (p.role != SetRole::Test || !std::isfinite(p.error)) continue;
    const double u0 = unc.combined_without_inadequacy_at(p.reading, p.aux);
    const double u = unc.combined_at(p.reading, p.aux);
    if (!(std::isfinite(u0) && std::isfinite(u))) continue;
    ++c.test_points;
    e2 += p.error * p.error;
    u02 += u0 * u0;
    u2 += u * u;
  }
  if (c.test_points == 0 || !(u02 > 0.0)) return c;
  c.computed = true;
  c.ratio = std::sqrt(e2 / u02);
  c.ratio_with_term = std::sqrt(e2 / u2);
  c.far = c.ratio > limit;
  return c;
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
                     expanded_at(p), p.setpoint});
    for (const PointResult& p : cal.points)
      if (p.role == SetRole::Train && std::isfinite(p.cv_predicted))
        pts.push_back({p.line, "validation", p.reference, p.cv_predicted - p.reference,
                       expanded_at(p), p.setpoint});
    if (tol.validate().empty()) {
      a.decision = judge(pts, tol, options.rule, {"validation"}, options.tur_warning);
      apply_adequacy_check(*a.decision, check_adequacy(cal, unc, options.adequacy_limit),
                           options.accept_inadequate_model);
    }
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
