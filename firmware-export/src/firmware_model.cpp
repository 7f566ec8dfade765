#include "ridgecal/firmware/firmware_model.hpp"

#include <algorithm>
#include <cmath>

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
  f.raw_power = model.power_in_x_ld();
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
