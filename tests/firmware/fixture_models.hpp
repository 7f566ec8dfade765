// Calibration models used by the firmware tests (made up, shaped like real
// sensors; no measured data).
#pragma once

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
  b.meta = base_meta("bridge <script>alert(1)</script> */ #define X 1 /* \"quoted\" 'q' ?\?/", "counts\n#error injected",
                     "k\xc2\xb5Pa \\", 0.5);
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

}  // namespace fwtest
