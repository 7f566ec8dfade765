#include "ridgecal/surface_assessment.hpp"

#include <cassert>
#include <cmath>

namespace ridgecal {

std::string surface_assessment_unsupported(const AssessmentOptions& options) {
  if (options.tolerance && options.rule != DecisionRule::SimpleAcceptance)
    return "the decision rule '" + to_string(options.rule) +
           "' needs the uncertainty band, which is not yet evaluated for extended models (--aux, transforms, "
           "--powers); use --decision simple";
  if (options.uncertainty.reference_uncertainty > 0.0 || options.uncertainty.resolution > 0.0)
    return "the uncertainty budget is not yet evaluated for extended models (--aux, transforms, --powers); leave "
           "out --ref-uncertainty and --resolution";
  return {};
}

Assessment assess_surface_calibration(const Calibration& cal, const AssessmentOptions& options) {
  assert(cal.surface && surface_assessment_unsupported(options).empty());
  Assessment a;
  if (!options.tolerance) return a;
  ToleranceSpec tol = *options.tolerance;
  resolve_span(tol, cal, options.diagnostics);
  a.tolerance = tol;
  std::vector<PointToJudge> pts;
  for (const PointResult& p : cal.points)
    pts.push_back({p.line, p.role == SetRole::Train ? "training" : "test", p.reference, p.error, 0.0});
  for (const PointResult& p : cal.points)
    if (p.role == SetRole::Train && std::isfinite(p.cv_predicted))
      pts.push_back({p.line, "validation", p.reference, p.cv_predicted - p.reference, 0.0});
  if (tol.validate().empty()) a.decision = judge(pts, tol, DecisionRule::SimpleAcceptance, {"validation"});
  return a;
}

}  // namespace ridgecal
