// Fits the invented run through the installed public API (umbrella header
// only) and checks the chosen degree and a prediction against the true curve.
#include <cmath>
#include <cstdio>

#include "demo_run.hpp"
#include "ridgecal/ridgecal.hpp"

namespace {

/// Allowed |prediction - true curve| at mid-range, kPa. The stand-in noise is
/// at most 0.002 kPa and averages out over 27 points; measured deviation
/// 2.5e-4 kPa, so 0.01 kPa leaves a margin of 40 while a straight line (off by
/// more than 1 kPa somewhere in this range) still fails.
constexpr double kPredictionToleranceKpa = 0.01;

}  // namespace

int main() {
  ridgecal::CsvOptions columns;
  columns.setpoint_column = "setpoint";
  const ridgecal::Dataset data =
      ridgecal::parse_calibration_csv(demo::run_csv(), "demo.csv", columns);

  const ridgecal::FitOptions options;  // defaults: degrees 1..7, CV, one-SE rule
  if (!options.validate().empty()) {
    std::printf("fit_consumer: bad options: %s\n", options.validate().c_str());
    return 1;
  }
  const ridgecal::FitOutcome outcome = ridgecal::fit_calibration(data, options);
  if (!outcome.status.ok) {
    std::printf("fit_consumer: fit failed: %s\n", outcome.status.message.c_str());
    return 1;
  }
  const ridgecal::Calibration& cal = outcome.calibration;
  const double x = 5000.0;
  const double predicted = cal.model.eval(x);
  const double deviation = std::fabs(predicted - demo::true_kpa(x));
  std::printf(
      "fit_consumer: %zu rows, degree %d, p(%.0f counts) = %.4f kPa (true %.4f), |dev| = %.2e\n",
      data.rows.size(), cal.model.reading_degree(), x, predicted, demo::true_kpa(x), deviation);
  if (cal.model.reading_degree() != 2 || !(deviation <= kPredictionToleranceKpa)) {
    std::printf("fit_consumer: FAILED (expected degree 2 and |dev| <= %g kPa)\n",
                kPredictionToleranceKpa);
    return 1;
  }
  std::printf("fit_consumer: ok\n");
  return 0;
}
