#include "ridgecal/firmware/firmware_model.hpp"

namespace ridgecal::firmware {

FirmwareModel firmware_model(const PolyModel& model) {
  FirmwareModel f;
  f.extended = false;
  AxisScaling a;
  a.min = model.scaling.x_min;
  a.max = model.scaling.x_max;
  a.center = model.scaling.center();
  a.half_width = model.scaling.half_width();
  f.inputs = {a};
  f.monomial = model.monomial_in_t();
  f.reading_degree = static_cast<int>(f.monomial.size()) - 1;
  f.aux_degree = 0;
  return f;
}

FirmwareModel firmware_model(const SurfaceModel& model) {
  FirmwareModel f;
  f.extended = true;
  f.transforms = model.transforms;
  f.inputs = {model.input};
  if (model.has_aux) f.inputs.push_back(model.aux);
  const auto m = model.monomial_in_scaled();
  f.reading_degree = static_cast<int>(m.size()) - 1;
  f.aux_degree = model.has_aux && !m.empty() ? static_cast<int>(m[0].size()) - 1 : 0;
  for (int k = 0; k <= f.reading_degree; ++k)
    for (int l = 0; l <= f.aux_degree; ++l)
      f.monomial.push_back(m[static_cast<std::size_t>(k)][static_cast<std::size_t>(l)]);
  return f;
}

}  // namespace ridgecal::firmware
