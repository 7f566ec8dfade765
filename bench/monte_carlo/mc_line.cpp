#include "mc_line.hpp"

#include <algorithm>
#include <string>

#include "mc_adapter.hpp"
#include "mc_scenarios.hpp"
#include "ridgecal/errors.hpp"
#include "ridgecal/unit_reason.hpp"

namespace ridgecal::mc {

namespace {

enum class Defect { None, Stuck, Open, Spike, MissingCell };

const char* defect_name(Defect d) {
  switch (d) {
    case Defect::Stuck:
      return "stuck";
    case Defect::Open:
      return "open-circuit";
    case Defect::Spike:
      return "spike";
    case Defect::MissingCell:
      return "missing-cell";
    default:
      return "good";
  }
}

// One unit: counts = c0 + g RH + c2 RH^2 with unit-to-unit spread (invented),
// 9 setpoints x 3 repeats, noise 0.13 %RH.
std::string unit_csv(Defect defect, Rng& rng) {
  const double c0 = 2000.0 + 60.0 * rng.normal();
  const double g = 40.0 * (1.0 + 0.03 * rng.normal());
  const double c2 = -0.02 + 0.04 * rng.normal();
  const double c3 = 3e-4 * rng.normal();
  auto counts = [&](double rh) {
    return c0 + g * rh + c2 * rh * rh + c3 * (rh - 50) * (rh - 50) * (rh - 50);
  };
  const int victim = 1 + static_cast<int>(rng.uniform() * 7);  // an interior setpoint
  const int victim_rep = static_cast<int>(rng.uniform() * 3);
  std::string csv = "setpoint,reading,reference\n";
  double stuck_value = 0.0;
  for (int k = 0; k < 9; ++k)
    for (int r = 0; r < 3; ++r) {
      const double rh = 10.0 + 10.0 * k;
      double x = counts(rh + 0.13 * rng.normal());
      if (defect == Defect::Stuck) {
        if (k == 5 && r == 0) stuck_value = x;
        if (k >= 6) x = stuck_value;  // output frozen from the 60 %RH setpoint on
      }
      if (defect == Defect::Open && k >= 7) x = 0.0;  // open circuit reads 0 counts
      if (defect == Defect::Spike && k == victim && r == victim_rep) x += g * 3.0;  // +3 %RH
      char cell[64];
      std::snprintf(cell, sizeof cell, "%.2f", x);
      const bool missing = defect == Defect::MissingCell && k == victim && r == victim_rep;
      csv += "S" + std::to_string(k) + "," + (missing ? std::string() : std::string(cell)) + "," +
             std::to_string(rh) + "\n";
    }
  return csv;
}

}  // namespace

LineStats run_line(int good_units, std::uint64_t seed, bool no_inadequacy) {
  const std::vector<Scenario> all = all_scenarios();
  const auto rh =
      std::find_if(all.begin(), all.end(), [](const Scenario& s) { return s.name == "rh"; });
  McOptions options = rh->options;
  if (no_inadequacy) {
    options.assess.uncertainty.inadequacy_alpha = 0.0;
    options.assess.adequacy_limit = 0.0;
  }
  CsvOptions csv;
  csv.setpoint_column = "setpoint";
  LineStats st;
  const int defect_units = std::max(50, good_units / 10);
  for (Defect d : {Defect::None, Defect::Stuck, Defect::Open, Defect::Spike, Defect::MissingCell}) {
    LineRow row;
    row.kind = defect_name(d);
    row.units = d == Defect::None ? good_units : defect_units;
    for (int u = 0; u < row.units; ++u) {
      Rng rng(seed + 1000003ULL * static_cast<int>(d) + 7919ULL * u);
      bool rejected = false, flagged = false;
      InputCause cause = InputCause::Other;
      bool refused = false;
      try {
        const Dataset data = parse_calibration_csv(unit_csv(d, rng), "unit.csv", csv);
        const McFit fit = calibrate_adapter(data, options);
        rejected = !fit.ok || (fit.has_verdict && !fit.pass && !fit.undecided);
        row.undecided += fit.ok && fit.undecided;
        row.undecided_u += fit.ok && fit.undecided && fit.undecided_why == "uncertainty";
        flagged = fit.ok && !fit.warning_codes.empty();
        refused = !fit.ok;
        cause = fit.cause;
      } catch (const InputError& e) {
        rejected = refused = true;
        cause = e.cause();
      }
      if (refused) {
        const UnitReason r = reason_for_input(cause);
        row.hardware +=
            r == UnitReason::Stuck || r == UnitReason::OpenOrShort || r == UnitReason::Saturated;
        row.reasoned +=
            (d == Defect::Stuck && (r == UnitReason::Stuck || r == UnitReason::Saturated)) ||
            (d == Defect::Open && r == UnitReason::OpenOrShort) ||
            (d == Defect::MissingCell && r == UnitReason::MissingCells);
      }
      row.rejected += rejected;
      row.flagged += flagged;
      row.rejected_or_flagged += rejected || flagged;
    }
    st.rows.push_back(row);
  }
  return st;
}

}  // namespace ridgecal::mc
