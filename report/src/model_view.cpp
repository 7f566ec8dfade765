#include "model_view.hpp"

#include "ridgecal/record_model.hpp"

namespace ridgecal::report::detail {

ModelView describe_model(const CalibrationRecord& rec) {
  const Calibration& cal = rec.calibration;
  ModelView v;
  v.model = general_model(cal);
  const Model& m = v.model;
  v.extended = is_extended(cal);
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
  v.term_rule = term_rule_text(m, cal.selection);
  v.aux_grouping = aux_grouping_text(m, rec);
  v.boundary_rule = boundary_rule_text(m);
  if (!v.extended) {
    // The polynomial layout shows the series in T_k(t) (the terms (k,0) in
    // order) and its power form in x (the first column of the general one).
    v.chebyshev = m.coefficients;
    const auto rows = m.power_in_raw();
    for (std::size_t k = 0; k < m.coefficients.size() && k < rows.size(); ++k)
      v.power.push_back(rows[k][0]);
  }
  return v;
}

double model_value(const ModelView& m, double reading, double aux) {
  return m.model.eval(reading, aux);
}

}  // namespace ridgecal::report::detail
