// An invented calibration run for the install consumer: a pressure
// transducer read in ADC counts against a reference gauge in kPa, nine
// setpoints, three readings each. The true curve is a quadratic; the
// reference carries a small deterministic pattern standing in for noise.
#pragma once

#include <string>

namespace demo {

/// The invented true curve, kPa as a function of counts.
inline double true_kpa(double counts) {
  return 12.5 + 0.0125 * counts + 3.0e-7 * counts * counts;
}

/// Half-width of the stand-in noise added to the reference, kPa.
inline constexpr double kNoiseKpa = 0.002;

/// Deterministic stand-in noise for row k, uniform in [-kNoiseKpa, kNoiseKpa]
/// (a 64-bit mixing function of k; the same on every platform).
inline double noise_kpa(unsigned long long k) {
  unsigned long long z = (k + 1) * 0x9E3779B97F4A7C15ull;
  z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9ull;
  z = (z ^ (z >> 27)) * 0x94D049BB133111EBull;
  z ^= z >> 31;
  return kNoiseKpa * (2.0 * static_cast<double>(z >> 11) / 9007199254740992.0 - 1.0);
}

/// The run as CSV text with columns setpoint, reading, reference.
inline std::string run_csv() {
  std::string csv = "setpoint,reading,reference\n";
  unsigned long long k = 0;
  for (int s = 1; s <= 9; ++s) {
    for (int r = -1; r <= 1; ++r, ++k) {
      const double counts = 1000.0 * s + 3.0 * r;
      csv += "P" + std::to_string(s) + "," + std::to_string(counts) + "," +
             std::to_string(true_kpa(counts) + noise_kpa(k)) + "\n";
    }
  }
  return csv;
}

}  // namespace demo
