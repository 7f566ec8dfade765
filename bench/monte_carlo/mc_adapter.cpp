#include "mc_adapter.hpp"

#include <memory>

#include "ridgecal/calibrate.hpp"
#include "ridgecal/errors.hpp"
#include "ridgecal/uncertainty.hpp"

namespace ridgecal::mc {

McFit calibrate_adapter(const Dataset& data, const McOptions& options) {
  McFit r;
  // The library's one pipeline (calibrate.hpp): fit, assessment and record.
  CalibrateOptions copt;
  copt.fit = options.fit;
  copt.comp = options.comp;
  copt.assess = options.assess;
  CalibrateResult result;
  try {
    result = calibrate(data, copt);
  } catch (const InputError& e) {
    r.error = format_input_error(e);
    r.cause = e.cause();
    return r;
  }
  if (!result.status.ok) {
    r.error = result.status.message;
    return r;
  }
  auto cal = std::make_shared<const Calibration>(std::move(result.record.calibration));
  Assessment a;
  a.decision = std::move(result.record.decision);
  a.warnings = std::move(result.record.warnings);
  if (result.record.uncertainty) a.uncertainty = std::move(*result.record.uncertainty);
  r.ok = true;
  r.has_verdict = a.decision.has_value();
  r.pass = a.decision && a.decision->pass();
  r.undecided = a.decision && a.decision->verdict == Verdict::Undecided;
  if (r.undecided) {
    r.undecided_why = "adequacy";
    for (const PointJudgement& p : a.decision->points)
      if (p.conformity == Conformity::NotShownUncertainty)
        r.undecided_why = "uncertainty";
      else if (p.conformity == Conformity::NotShownGuardBand && r.undecided_why == "adequacy")
        r.undecided_why = "guard-band";
  }
  for (const Warning& w : a.warnings) r.warning_codes.push_back(to_string(w.code));
  r.degree = general_model(*cal).total_degree();
  r.lambda = cal->lambda;
  r.training_rmse = cal->training.rmse;
  r.validation_rmse = cal->validation.rmse;
  r.test_rmse = cal->test.rmse;
  // One model and one budget for every fit: the general model (N = 1 for one input).
  auto model = std::make_shared<const Model>(general_model(*cal));
  auto unc = std::make_shared<const UncertaintyEvaluator>(*cal, options.assess.uncertainty);
  r.predict = [model](double x, double aux) { return model->eval(x, aux); };
  r.expanded = [unc](double x, double aux) { return unc->expanded_at(x, aux); };
  // The adequacy check, also where the scenario has no tolerance (no decision).
  r.inadequacy_included = unc->budget().inadequacy.included;
  const AdequacyCheck ac = check_adequacy(*cal, *unc, options.assess.adequacy_limit);
  r.adequacy_computed = ac.computed;
  r.adequacy_ratio = ac.ratio;
  r.adequacy_far = ac.far;
  return r;
}

}  // namespace ridgecal::mc
