#include "model_view.hpp"

#include "ridgecal/surface_record.hpp"

namespace ridgecal::report::detail {

ModelView describe_model(const CalibrationRecord& rec) {
  const Calibration& cal = rec.calibration;
  ModelView v;
  if (cal.surface) {
    const SurfaceModel& m = *cal.surface;
    v.extended = true;
    v.has_aux = m.has_aux;
    v.identity = m.transforms.identity();
    v.chain = m.transforms.describe();
    v.basis = to_string(m.basis);
    v.degree = m.total_degree();
    v.reading_degree = m.reading_degree();
    v.aux_degree = m.has_aux ? m.aux_degree() : 0;
    v.reading = InputRange{m.input.min, m.input.max, m.input.center, m.input.half_width};
    if (m.has_aux) v.aux = InputRange{m.aux.min, m.aux.max, m.aux.center, m.aux.half_width};
    for (std::size_t q = 0; q < m.terms.size() && q < m.coefficients.size(); ++q)
      v.terms.push_back(TermView{m.terms[q].i, m.terms[q].j, m.coefficients[q]});
    v.term_rule = surface_term_rule(cal);
    v.aux_grouping = surface_aux_grouping(rec);
    v.boundary_rule = surface_boundary_rule(cal);
    return v;
  }
  const PolyModel& m = cal.model;
  v.basis = "chebyshev";
  v.degree = m.degree();
  v.reading_degree = m.degree();
  v.reading =
      InputRange{m.scaling.x_min, m.scaling.x_max, m.scaling.center(), m.scaling.half_width()};
  v.chebyshev = m.cheb;
  v.power = m.power_in_x();
  return v;
}

double model_value(const Calibration& cal, double reading, double aux) {
  return cal.surface ? cal.surface->eval(reading, aux) : cal.model.eval(reading);
}

}  // namespace ridgecal::report::detail
