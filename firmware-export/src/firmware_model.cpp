#include "ridgecal/firmware/firmware_model.hpp"

#include <algorithm>
#include <cmath>

namespace ridgecal::firmware {

namespace {

// Why a plain polynomial cannot be exported ("" when it can).
std::string poly_problem(const PolyModel& model) {
  if (model.cheb.empty()) return "model: no coefficients";
  if (model.degree() > 30) return "model: degree " + std::to_string(model.degree()) + " exceeds 30";
  for (double c : model.cheb)
    if (!std::isfinite(c)) return "model: non-finite Chebyshev coefficient";
  if (!(std::isfinite(model.scaling.x_min) && std::isfinite(model.scaling.x_max) &&
        model.scaling.x_max > model.scaling.x_min))
    return "model: calibrated range must satisfy x_min < x_max (both finite)";
  return "";
}

// Why an extended model cannot be exported ("" when it can).
std::string extended_problem(const Model& model) {
  if (model.terms.empty() || model.coefficients.size() != model.terms.size())
    return "model: no coefficients (or not one per term)";
  if (model.reading_degree() > 30 || model.aux_degree() > 30) return "model: a degree exceeds 30";
  for (double c : model.coefficients)
    if (!std::isfinite(c)) return "model: non-finite coefficient";
  const auto axis_ok = [](const AxisScaling& a) {
    return std::isfinite(a.min) && std::isfinite(a.max) && a.max > a.min &&
           std::isfinite(a.center) && std::isfinite(a.half_width) && a.half_width > 0;
  };
  if (!axis_ok(model.input) || (model.has_aux && !axis_ok(model.aux)))
    return "model: calibrated range must satisfy min < max (both finite) for every input";
  if (std::string e = model.transforms.validate(); !e.empty()) return "model: " + e;
  return "";
}

}  // namespace

FirmwareModel firmware_model(const PolyModel& model) {
  FirmwareModel f;
  f.extended = false;
  f.problem = poly_problem(model);
  f.fitted_terms = model.cheb.size();
  f.fitted_basis = "chebyshev";
  f.reference = [model](double x, double) { return model.eval(x); };
  f.reference_fitted = f.reference;  // no transforms: u = x, output = v
  AxisScaling a;
  a.min = model.scaling.x_min;
  a.max = model.scaling.x_max;
  a.center = model.scaling.center();
  a.half_width = model.scaling.half_width();
  f.inputs = {a};
  if (!f.problem.empty()) return f;
  f.monomial = model.monomial_in_t();
  f.reading_degree = static_cast<int>(f.monomial.size()) - 1;
  f.aux_degree = 0;
  f.raw_power = model.power_in_x_ld();
  return f;
}

FirmwareModel firmware_model(const Model& model) {
  FirmwareModel f;
  f.extended = true;
  f.problem = extended_problem(model);
  f.fitted_terms = model.terms.size();
  f.fitted_basis = to_string(model.basis);
  f.reference = [model](double x, double aux) { return model.eval(x, aux); };
  f.reference_fitted = [model](double u, double aux) { return model.eval_fitted(u, aux); };
  f.transforms = model.transforms;
  f.inputs = {model.input};
  if (model.has_aux) f.inputs.push_back(model.aux);
  if (!f.problem.empty()) return f;
  const auto m = model.monomial_in_scaled();
  f.reading_degree = static_cast<int>(m.size()) - 1;
  f.aux_degree = model.has_aux && !m.empty() ? static_cast<int>(m[0].size()) - 1 : 0;
  for (int k = 0; k <= f.reading_degree; ++k)
    for (int l = 0; l <= f.aux_degree; ++l)
      f.monomial.push_back(m[static_cast<std::size_t>(k)][static_cast<std::size_t>(l)]);
  return f;
}

FirmwareModel firmware_model(const Calibration& cal) {
  return is_extended(cal) ? firmware_model(cal.model)
                          : firmware_model(one_input_polynomial(cal.model));
}

std::pair<double, double> raw_reading_range(const FirmwareModel& m) {
  const Transforms& tr = m.transforms;
  const auto back = [&](double u) {
    double r = tr.reading == ReadingTransform::Ln ? std::exp(u) : u;
    const Divider& d = tr.divider;
    if (d.enabled)
      r = d.position == DividerPosition::SensorLow
              ? d.full_scale * r / (d.fixed_resistance + r)
              : d.full_scale * d.fixed_resistance / (r + d.fixed_resistance);
    return r;
  };
  const double a = back(m.inputs.at(0).min), b = back(m.inputs.at(0).max);
  return {std::min(a, b), std::max(a, b)};
}

}  // namespace ridgecal::firmware
