// Calibration models used by the firmware tests (made up, shaped like real
// sensors; no measured data).
#pragma once

#include <cmath>
#include <string>
#include <vector>

#include "ridgecal/firmware/export.hpp"
#include "ridgecal/poly_model.hpp"

namespace fwtest {

struct Fixture {
  std::string name;
  ridgecal::PolyModel model;
  ridgecal::firmware::HeaderMeta meta;
  ridgecal::firmware::ExportOptions options;
};

/// NTC thermistor on a 12-bit ADC: counts 200..3900 -> degC, degree 5.
inline ridgecal::PolyModel ntc_model() {
  ridgecal::PolyModel m;
  m.scaling = {200.0, 3900.0};
  m.cheb = {31.25, -58.5, 7.75, -3.125, 0.8125, -0.21875};
  return m;
}

/// Bipolar 16-bit ADC bridge sensor: counts -30000..30000 -> kPa, degree 4.
inline ridgecal::PolyModel bridge_model() {
  ridgecal::PolyModel m;
  m.scaling = {-30000.0, 30000.0};
  m.cheb = {101.325, 250.0, -1.5, 0.75, -0.0625};
  return m;
}

inline ridgecal::firmware::HeaderMeta base_meta(const std::string& sensor, const std::string& ru,
                                                const std::string& fu, double tol) {
  ridgecal::firmware::HeaderMeta meta;
  meta.sensor_name = sensor;
  meta.reading_unit = ru;
  meta.reference_unit = fu;
  meta.lambda = 1e-3;
  meta.validation_rmse = 0.02;
  meta.validation_max_abs_error = 0.05;
  meta.test_rmse = 0.021;
  meta.test_max_abs_error = 0.055;
  meta.tolerance_description = "+/- " + std::to_string(tol) + " " + fu + " (test fixture)";
  meta.tolerance_abs = tol;
  meta.pass_fail = "PASS (fixture)";
  meta.record_sha256 = "0123456789abcdef0123456789abcdef0123456789abcdef0123456789abcdef";
  meta.tool_version = "ridgecal test fixture";
  return meta;
}

inline std::vector<Fixture> target_fixtures() {
  using ridgecal::firmware::NumericMode;
  std::vector<Fixture> out;
  for (NumericMode mode : {NumericMode::Float, NumericMode::Double, NumericMode::Fixed}) {
    Fixture f;
    f.name = "ntc_" + ridgecal::firmware::to_string(mode);
    f.model = ntc_model();
    f.meta = base_meta("NTC 10k on ADC0", "counts", "degC", 0.1);
    f.meta.degree = 5;
    for (int i = 0; i < 37; ++i) f.meta.calibration_readings.push_back(200.0 + 100.0 * i + 3.0);
    f.options.prefix = "fwt";
    f.options.mode = mode;
    out.push_back(f);
  }
  Fixture b;
  b.name = "bridge_fixed";
  b.model = bridge_model();
  // Hostile text in every string field: the headers must still compile clean.
  b.meta = base_meta("bridge <script>alert(1)</script> */ #define X 1 /* \"quoted\" 'q' ?\?/",
                     "counts\n#error injected", "k\xc2\xb5Pa \\", 0.5);
  b.meta.tolerance_description = "+/-0.5 kPa */ int evil; /*\r\n" + std::string(500, '~');
  b.meta.pass_fail = "PASS \\";
  b.meta.tool_version = "ridgecal \xe2\x80\xae test";
  b.options.prefix = "fwt";
  b.options.mode = NumericMode::Fixed;
  b.options.output_scale = 100.0;  // centi-kPa
  out.push_back(b);
  Fixture bf = b;
  bf.name = "bridge_float";
  bf.options.mode = NumericMode::Float;
  out.push_back(bf);
  return out;
}

// ---- extended (surface) models ----------------------------------------------------

struct SurfaceFixture {
  std::string name;
  ridgecal::Model model;
  ridgecal::firmware::HeaderMeta meta;
  ridgecal::firmware::ExportOptions options;
};

/// Sets the coefficient of term (i, j) (the term must be in the model).
inline void set_coef(ridgecal::Model* m, int i, int j, double c) {
  for (std::size_t q = 0; q < m->terms.size(); ++q)
    if (m->terms[q].i == i && m->terms[q].j == j) m->coefficients[q] = c;
}

/// Pressure transmitter with a temperature-dependent zero and span, shaped like
/// calibration-samples/pressure-tempco: counts 5861..59787.5 and sensor
/// temperature -20.53..79.87 degC -> bar; tensor Chebyshev, reading degree 2,
/// aux degree 3 (12 terms). Made-up coefficients.
inline ridgecal::Model pressure_extended_model() {
  ridgecal::Model m;
  m.has_aux = true;
  m.basis = ridgecal::ModelBasis::Chebyshev;
  m.input = ridgecal::AxisScaling::centered(5861.0, 59787.5);
  m.aux = ridgecal::AxisScaling::centered(-20.53, 79.87);
  m.terms = ridgecal::terms_rectangle(2, 3);
  m.coefficients.assign(m.terms.size(), 0.0);
  set_coef(&m, 0, 0, 8.50381);
  set_coef(&m, 1, 0, 7.9542);
  set_coef(&m, 2, 0, 0.0512);
  set_coef(&m, 0, 1, 0.588651);
  set_coef(&m, 1, 1, -0.061234);
  set_coef(&m, 2, 1, 0.00213);
  set_coef(&m, 0, 2, 0.0299018);
  set_coef(&m, 1, 2, 0.00417);
  set_coef(&m, 2, 2, 0.00051);
  set_coef(&m, 0, 3, 0.00201764);
  set_coef(&m, 1, 3, -0.00031);
  set_coef(&m, 2, 3, 0.000107);
  return m;
}

/// NTC thermistor through a 10 kOhm sensor-low divider on a 12-bit ADC
/// (full scale 4095), Steinhart-Hart 1/T = A + B ln R + C (ln R)^3 over
/// 1 kOhm .. 100 kOhm (about 95 .. -27 degC): powers {0,1,3}, power basis.
inline ridgecal::Model steinhart_hart_model() {
  ridgecal::Model m;
  m.transforms.divider.enabled = true;
  m.transforms.divider.fixed_resistance = 10000.0;
  m.transforms.divider.full_scale = 4095.0;
  m.transforms.divider.position = ridgecal::DividerPosition::SensorLow;
  m.transforms.reading = ridgecal::ReadingTransform::Ln;
  m.transforms.reference = ridgecal::ReferenceTransform::ReciprocalKelvin;
  m.basis = ridgecal::ModelBasis::Power;
  m.input = ridgecal::AxisScaling::about_zero(std::log(1000.0), std::log(100000.0));
  m.terms = ridgecal::terms_powers({0, 1, 3}, 0);
  m.coefficients.assign(m.terms.size(), 0.0);
  const double h = m.input.half_width;
  set_coef(&m, 0, 0, 1.009249522e-3);
  set_coef(&m, 1, 0, 2.378405444e-4 * h);
  set_coef(&m, 3, 0, 2.019202697e-7 * h * h * h);
  return m;
}

inline std::vector<SurfaceFixture> surface_fixtures() {
  using ridgecal::firmware::NumericMode;
  std::vector<SurfaceFixture> out;
  for (NumericMode mode : {NumericMode::Float, NumericMode::Double, NumericMode::Fixed}) {
    SurfaceFixture f;
    f.name = "ptc2d_" + ridgecal::firmware::to_string(mode);
    f.model = pressure_extended_model();
    f.meta = base_meta("PT-7 pressure with tempco", "counts", "bar", 0.01);
    f.meta.aux_unit = "degC";
    for (int j = 0; j < 6; ++j)
      for (int i = 0; i < 9; ++i) {
        f.meta.calibration_readings.push_back(5861.0 + (59787.5 - 5861.0) * i / 8.0);
        f.meta.calibration_aux.push_back(-20.53 + (79.87 + 20.53) * j / 5.0);
      }
    f.options.prefix = "fwt";
    f.options.mode = mode;
    f.options.output_scale = 10000.0;   // 0.1 mbar
    f.options.aux_input_scale = 100.0;  // raw aux in 0.01 degC
    out.push_back(f);
  }
  for (NumericMode mode : {NumericMode::Float, NumericMode::Double}) {
    SurfaceFixture f;
    f.name = "shntc_" + ridgecal::firmware::to_string(mode);
    f.model = steinhart_hart_model();
    f.meta = base_meta("NTC 10k, Steinhart-Hart, divider", "counts", "degC", 0.1);
    for (int i = 0; i < 25; ++i) f.meta.calibration_readings.push_back(400.0 + 120.0 * i);
    f.options.prefix = "fwt";
    f.options.mode = mode;
    out.push_back(f);
  }
  return out;
}

}  // namespace fwtest
