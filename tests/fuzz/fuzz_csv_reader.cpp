// libFuzzer target: the calibration CSV reader, and (for small inputs) the fit.
//
// Input layout: byte 0 chooses the options (delimiter, setpoint and role
// columns, decimal comma, whether to fit); the rest is the CSV text. Limits
// are lowered so that the limit checks are reached by small inputs.
//
// Invariants: the reader either returns rows or throws InputError (anything
// else escaping is a crash); returned values are finite and within the
// documented magnitudes, lines increase, the row limit holds; a fit either
// fails with a status or gives finite coefficients and predictions.
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <string>

#include "fuzz_check.hpp"
#include "ridgecal/calibration.hpp"
#include "ridgecal/calibration_csv.hpp"
#include "ridgecal/errors.hpp"
#include "ridgecal/grouped_split.hpp"

using namespace ridgecal;

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  if (size < 1) return 0;
  const std::uint8_t sel = data[0];
  CsvOptions opt;
  opt.delimiter = ",;\t"[sel % 3];
  if (sel & 0x04) opt.setpoint_column = "setpoint";
  if (sel & 0x08) opt.role_column = "role";
  opt.decimal_comma = (sel & 0x10) && opt.delimiter != ',';
  opt.limits.max_rows = 200;
  opt.limits.max_fields = 16;
  opt.limits.max_field_bytes = 64;
  const bool do_fit = sel & 0x20;
  const std::string text(reinterpret_cast<const char*>(data) + 1, size - 1);

  Dataset ds;
  try {
    ds = parse_calibration_csv(text, "fuzz.csv", opt);
  } catch (const InputError& e) {
    RIDGECAL_FUZZ_CHECK(std::string(e.what()).rfind("fuzz.csv", 0) == 0);
    return 0;
  }
  RIDGECAL_FUZZ_CHECK(!ds.rows.empty() && ds.rows.size() <= opt.limits.max_rows);
  std::size_t last_line = 0;
  for (const Observation& ob : ds.rows) {
    for (const double v : {ob.reading, ob.reference}) {
      RIDGECAL_FUZZ_CHECK(std::isfinite(v));
      RIDGECAL_FUZZ_CHECK(v == 0.0 ||
                          (std::fabs(v) <= kMaxMagnitude && std::fabs(v) >= kMinMagnitude));
    }
    RIDGECAL_FUZZ_CHECK(ob.line > last_line);
    RIDGECAL_FUZZ_CHECK(!ob.setpoint.empty());
    last_line = ob.line;
  }
  try {
    const auto groups = group_by_setpoint(ds);
    std::size_t total = 0;
    for (const auto& g : groups) total += g.rows.size();
    RIDGECAL_FUZZ_CHECK(total == ds.rows.size());
  } catch (const InputError&) {
    return 0;  // one setpoint with both roles
  }
  if (do_fit && ds.rows.size() <= 64) {
    FitOptions fo;
    fo.degrees = {1, 2, 3};
    fo.lambdas = {0.0, 1e-6, 1e-2};
    fo.intercept = !(sel & 0x40);
    if (sel & 0x80) {
      fo.fixed_degree = 2;
      fo.fixed_lambda = 0.0;
    }
    RIDGECAL_FUZZ_CHECK(fo.validate().empty());
    const FitOutcome fit = fit_calibration(ds, fo);
    if (fit.status.ok) {
      const Calibration& c = fit.calibration;
      RIDGECAL_FUZZ_CHECK(!c.model.coefficients.empty());
      for (double v : c.model.coefficients) RIDGECAL_FUZZ_CHECK(std::isfinite(v));
      RIDGECAL_FUZZ_CHECK(c.points.size() == ds.rows.size());
      for (const PointResult& p : c.points) RIDGECAL_FUZZ_CHECK(std::isfinite(p.predicted));
      RIDGECAL_FUZZ_CHECK(c.model.input.max > c.model.input.min);
    } else {
      RIDGECAL_FUZZ_CHECK(!fit.status.message.empty());
    }
  }
  return 0;
}
