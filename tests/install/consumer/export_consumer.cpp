// Fits the invented run and generates a float C header for it through the
// installed firmware-export API (umbrella headers only).
#include <cstdio>

#include "demo_run.hpp"
#include "ridgecal/firmware.hpp"
#include "ridgecal/ridgecal.hpp"

int main() {
  ridgecal::CsvOptions columns;
  columns.setpoint_column = "setpoint";
  const ridgecal::Dataset data =
      ridgecal::parse_calibration_csv(demo::run_csv(), "demo.csv", columns);
  const ridgecal::FitOutcome outcome = ridgecal::fit_calibration(data, ridgecal::FitOptions{});
  if (!outcome.status.ok) {
    std::printf("export_consumer: fit failed: %s\n", outcome.status.message.c_str());
    return 1;
  }
  ridgecal::firmware::HeaderMeta meta;
  meta.sensor_name = "demo transducer PT-7";
  meta.reading_unit = "counts";
  meta.reference_unit = "kPa";
  meta.tolerance_abs = 0.05;  // invented tolerance, kPa
  ridgecal::firmware::ExportOptions options;
  options.prefix = "pt7";
  options.mode = ridgecal::firmware::NumericMode::Float;
  const ridgecal::firmware::ExportResult header = ridgecal::firmware::generate_header(
      ridgecal::firmware::firmware_model(outcome.calibration), meta, options);
  const bool has_eval = header.header.find("pt7_eval") != std::string::npos;
  std::printf("export_consumer: %s, %zu bytes, max deviation %.2e kPa, pt7_eval %s\n",
              ridgecal::firmware::to_string(header.status), header.header.size(),
              header.max_deviation, has_eval ? "present" : "missing");
  if (!header.ok() || !has_eval) {
    std::printf("export_consumer: FAILED: %s\n", header.message.c_str());
    return 1;
  }
  std::printf("export_consumer: ok\n");
  return 0;
}
