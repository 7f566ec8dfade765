#include "ridgecal/batch_synthetic.hpp"

#include <fmt/format.h>

#include <cmath>

#include "ridgecal/grouped_split.hpp"

namespace ridgecal {

std::string SyntheticUnitOptions::validate() const {
  if (setpoints < 2 || setpoints > 1000)
    return fmt::format("setpoints is {}; it must be between 2 and 1000", setpoints);
  if (repeats < 1 || repeats > 1000)
    return fmt::format("repeats is {}; it must be between 1 and 1000", repeats);
  if (!(reading_noise >= 0.0 && std::isfinite(reading_noise)))
    return fmt::format("reading_noise is {}; it must be a finite number >= 0", reading_noise);
  if (!(reference_noise >= 0.0 && std::isfinite(reference_noise)))
    return fmt::format("reference_noise is {}; it must be a finite number >= 0", reference_noise);
  return {};
}

std::string synthetic_unit_id(std::uint64_t index) {
  return fmt::format("U{:06d}", index);
}

namespace {

double uniform01(SplitRng& rng) {
  return static_cast<double>(rng.next() >> 11) * 0x1.0p-53;
}

// Standard normal by Box-Muller (one value per call; simple and deterministic).
double normal(SplitRng& rng) {
  double u1 = uniform01(rng);
  if (u1 <= 0.0) u1 = 0x1.0p-53;
  const double u2 = uniform01(rng);
  return std::sqrt(-2.0 * std::log(u1)) * std::cos(6.283185307179586 * u2);
}

template <class Emit>
void generate(std::uint64_t index, const SyntheticUnitOptions& o, Emit emit) {
  SplitRng rng(o.seed * 0x9E3779B97F4A7C15ULL + index);
  const double gain = 28000.0 * (1.0 + 0.05 * (2.0 * uniform01(rng) - 1.0));
  const double offset = 2000.0 + 400.0 * (2.0 * uniform01(rng) - 1.0);
  const double mid = 40.0 + 4.0 * (2.0 * uniform01(rng) - 1.0);
  const double wobble = 30.0 * (2.0 * uniform01(rng) - 1.0);
  const double t_lo = -20.0, t_hi = 100.0;
  for (int s = 0; s < o.setpoints; ++s) {
    const double t_set =
        t_lo + (t_hi - t_lo) * s / (o.setpoints - 1) + 0.2 * (2.0 * uniform01(rng) - 1.0);
    const std::string sp = fmt::format("S{:02d}", s + 1);
    for (int r = 0; r < o.repeats; ++r) {
      const double t = t_set + o.reference_noise * normal(rng);
      const double u = (t - 40.0) / 60.0;
      const double counts = offset + gain / (1.0 + std::exp(-(t - mid) / 32.0)) +
                            wobble * u * u * u + o.reading_noise * normal(rng);
      // Readings are integers (ADC counts), references are printed to 1 mK.
      const double reading = std::round(counts);
      const double reference = std::round(t_set * 1000.0) / 1000.0;
      emit(sp, reading, reference);
    }
  }
}

}  // namespace

Dataset synthetic_unit(std::uint64_t index, const SyntheticUnitOptions& options) {
  Dataset ds;
  ds.file = synthetic_unit_id(index);
  ds.columns.setpoint_column = "setpoint";
  std::size_t line = 1;
  generate(index, options, [&](const std::string& sp, double reading, double reference) {
    Observation ob;
    ob.reading = reading;
    ob.reference = reference;
    ob.setpoint = sp;
    ob.line = ++line;
    ds.rows.push_back(std::move(ob));
  });
  return ds;
}

void append_synthetic_unit_csv(std::string& out, std::uint64_t index,
                               const SyntheticUnitOptions& options) {
  const std::string id = synthetic_unit_id(index);
  generate(index, options, [&](const std::string& sp, double reading, double reference) {
    out += fmt::format("{},{},{},{}\n", id, sp, reading, reference);
  });
}

const char* synthetic_csv_header() {
  return "unit,setpoint,reading,reference\n";
}

}  // namespace ridgecal
