// ridgecal Monte Carlo harness: invented scenarios with a known truth.
//
// Every scenario describes a sensor by its true response reading = f(q, aux)
// to the measurand q (reference units) and a noise SD sigma(q) expressed in
// reference units: one observation at true value q reads f(q + sigma(q) e, aux),
// e standard normal, and its reference is q. The delivered curve is judged
// against the truth q at noise-free readings f(q, aux).
#pragma once

#include <cstdint>
#include <functional>
#include <string>
#include <vector>

#include "mc_adapter.hpp"

namespace ridgecal::mc {

/// Small, portable, seeded generator (splitmix64 + Box-Muller), so that runs
/// are identical on every platform.
class Rng {
 public:
  explicit Rng(std::uint64_t seed) : state_(seed) {}
  std::uint64_t next();
  double uniform();  ///< [0, 1)
  double normal();   ///< standard normal
 private:
  std::uint64_t state_;
  bool has_spare_ = false;
  double spare_ = 0.0;
};

struct Scenario {
  std::string name;
  std::string description;
  std::string unit;                ///< reference unit, for the tables
  std::vector<double> setpoints;   ///< nominal q of each setpoint, increasing
  std::vector<double> aux_levels;  ///< empty: one input
  int repeats = 3;
  std::function<double(double q, double aux)> response;  ///< true reading
  std::function<double(double q)> sigma;                 ///< noise SD, reference units
  McOptions options;
  bool family_can_follow = true;  ///< the end-bias target applies
  double q_lo() const { return setpoints.front(); }
  double q_hi() const { return setpoints.back(); }
};

/// The scenarios of docs/monte-carlo.md: pt100, ntc-counts, ntc-ln, rh, loadcell, pressure.
std::vector<Scenario> all_scenarios();

/// Seeded faults (none = clean).
enum class Fault { None, Spike, Stuck, WrongLabel, Underfit, Drift };
std::string to_string(Fault f);
std::vector<Fault> all_faults();  ///< without None

/// Scenario with the fault's change of truth or options applied (Underfit
/// adds a cubic deviation of 6 sigma the degree-1..2 family cannot follow).
Scenario with_fault(const Scenario& s, Fault f);

/// One simulated calibration run: the data set (setpoint labels in
/// Observation::setpoint, aux levels in aux_setpoint) with the fault applied.
Dataset simulate_run(const Scenario& s, Fault f, Rng& rng);

}  // namespace ridgecal::mc
