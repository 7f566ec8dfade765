#include "mc_scenarios.hpp"

#include <algorithm>
#include <cmath>
#include <string>

namespace ridgecal::mc {

std::uint64_t Rng::next() {
  std::uint64_t z = (state_ += 0x9E3779B97F4A7C15ULL);
  z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9ULL;
  z = (z ^ (z >> 27)) * 0x94D049BB133111EBULL;
  return z ^ (z >> 31);
}

double Rng::uniform() {
  return static_cast<double>(next() >> 11) * 0x1.0p-53;
}

double Rng::normal() {
  if (has_spare_) {
    has_spare_ = false;
    return spare_;
  }
  double u1 = uniform();
  while (u1 <= 0.0) u1 = uniform();
  const double u2 = uniform();
  const double r = std::sqrt(-2.0 * std::log(u1));
  spare_ = r * std::sin(2.0 * M_PI * u2);
  has_spare_ = true;
  return r * std::cos(2.0 * M_PI * u2);
}

namespace {

std::vector<double> linspace(double lo, double hi, int n) {
  std::vector<double> v;
  for (int i = 0; i < n; ++i) v.push_back(lo + (hi - lo) * i / (n - 1));
  return v;
}

// IEC 60751 Callendar-Van Dusen for t >= 0 degC: R = R0 (1 + A t + B t^2).
// Constants as in tests/data/thermometry/iec60751_pt100.json.
double pt100_ohm(double t) {
  const double r0 = 100.0, a = 3.9083e-3, b = -5.775e-7;
  return r0 * (1.0 + a * t + b * t * t);
}

// An invented 10 kohm NTC following Steinhart-Hart 1/T = a + b lnR + c (lnR)^3
// (coefficients of the usual size for such parts, chosen for this harness),
// read through a 10 kohm divider (sensor to ground) by a 12-bit ratiometric ADC.
constexpr double kNtcA = 1.1e-3, kNtcB = 2.4e-4, kNtcC = 7.5e-8;
constexpr double kNtcRf = 10000.0, kNtcFull = 4095.0;
double ntc_ohm(double t_c) {
  // Closed-form inverse of Steinhart-Hart (depressed cubic in ln R).
  const double x = (kNtcA - 1.0 / (t_c + 273.15)) / kNtcC;
  const double y = std::sqrt(std::pow(kNtcB / (3.0 * kNtcC), 3) + 0.25 * x * x);
  return std::exp(std::cbrt(y - 0.5 * x) - std::cbrt(y + 0.5 * x));
}
double ntc_counts(double t_c) {
  const double r = ntc_ohm(t_c);
  return kNtcFull * r / (r + kNtcRf);
}

Scenario pt100() {
  Scenario s;
  s.name = "pt100";
  s.description =
      "Pt100 (IEC 60751 CVD) read in ohms, 0..400 degC, 10 setpoints x 4 repeats, sigma 0.01 degC";
  s.unit = "degC";
  s.setpoints = linspace(0.0, 400.0, 10);
  s.repeats = 4;
  s.response = [](double q, double) { return pt100_ohm(q); };
  s.sigma = [](double) { return 0.01; };
  return s;
}

Scenario ntc(bool ln_route) {
  Scenario s;
  s.name = ln_route ? "ntc-ln" : "ntc-counts";
  s.description = std::string("10k NTC through a 10k divider, 12-bit counts, 0..100 degC, ") +
                  "11 setpoints x 3 repeats, sigma 0.016 degC cold .. 0.071 degC hot; " +
                  (ln_route ? "fitted via divider -> ln R -> 1/T (CV over degrees 1..7)"
                            : "fitted on raw counts (default options)");
  s.unit = "degC";
  s.setpoints = linspace(0.0, 100.0, 11);
  s.repeats = 3;
  s.response = [](double q, double) { return ntc_counts(q); };
  s.sigma = [](double q) { return 0.016 + 0.055 * (q / 100.0) * (q / 100.0); };
  if (ln_route) {
    Divider& d = s.options.comp.transforms.divider;
    d.enabled = true;
    d.fixed_resistance = kNtcRf;
    d.position = DividerPosition::SensorLow;
    d.full_scale = kNtcFull;
    s.options.comp.transforms.reading = ReadingTransform::Ln;
    s.options.comp.transforms.reference = ReferenceTransform::ReciprocalKelvin;
  } else {
    // A degree <= 7 polynomial in counts cannot follow the thermistor to the noise level.
    s.family_can_follow = false;
  }
  return s;
}

// Capacitive RH probe behind a capacitance-to-digital converter (invented):
// counts = 2000 + 40 RH - 0.02 RH^2 (+ unit-to-unit spread in the line).
Scenario rh() {
  Scenario s;
  s.name = "rh";
  s.description =
      "capacitive RH probe in counts, 10..90 %RH, 9 setpoints x 3 repeats, sigma 0.13 %RH";
  s.unit = "%RH";
  s.setpoints = linspace(10.0, 90.0, 9);
  s.repeats = 3;
  s.response = [](double q, double) { return 2000.0 + 40.0 * q - 0.02 * q * q; };
  s.sigma = [](double) { return 0.13; };
  ToleranceSpec tol;
  tol.offset = 0.8;
  tol.proportional = 0.01;
  s.options.assess.tolerance = tol;
  return s;
}

// Strain-gauge load cell (invented): 0..500 N, 2 mV/V at full scale with a
// -0.05 % FS parabolic non-linearity, read by a 24-bit ADC (counts).
Scenario loadcell() {
  Scenario s;
  s.name = "loadcell";
  s.description = "load cell in ADC counts, 0..500 N, 11 setpoints x 3 repeats, sigma 0.05 N";
  s.unit = "N";
  s.setpoints = linspace(0.0, 500.0, 11);
  s.repeats = 3;
  s.response = [](double q, double) {
    const double f = q / 500.0;
    return 51200.0 + 1.6e6 * (f - 0.0005 * 4.0 * f * (1.0 - f));
  };
  s.sigma = [](double) { return 0.05; };
  return s;
}

// Piezoresistive pressure transmitter with a temperature-dependent zero and
// span (invented): counts = o(T) + g(T) P + 0.8 P^2, P in kPa, T in degC.
Scenario pressure() {
  Scenario s;
  s.name = "pressure";
  s.description =
      "pressure transmitter, 0..100 kPa x -10..50 degC (aux), 7 setpoints x 5 temperatures x 2 "
      "repeats, sigma 0.05 kPa";
  s.unit = "kPa";
  s.setpoints = linspace(0.0, 100.0, 7);
  s.aux_levels = linspace(-10.0, 50.0, 5);
  s.repeats = 2;
  s.response = [](double p, double t) {
    const double zero = 8000.0 + 12.0 * t + 0.05 * t * t;
    const double gain = 400.0 * (1.0 - 0.0015 * (t - 25.0));
    return zero + gain * p + 0.08 * p * p;
  };
  s.sigma = [](double) { return 0.05; };
  s.options.comp.aux = true;
  s.options.comp.aux_degrees = {0, 1, 2, 3};
  return s;
}

}  // namespace

std::vector<Scenario> all_scenarios() {
  return {pt100(), ntc(false), ntc(true), rh(), loadcell(), pressure()};
}

std::string to_string(Fault f) {
  switch (f) {
    case Fault::Spike:
      return "spike";
    case Fault::Stuck:
      return "stuck";
    case Fault::WrongLabel:
      return "wrong-label";
    case Fault::Underfit:
      return "underfit";
    case Fault::Drift:
      return "drift";
    default:
      return "clean";
  }
}

std::vector<Fault> all_faults() {
  return {Fault::Spike, Fault::Stuck, Fault::WrongLabel, Fault::Underfit, Fault::Drift};
}

Scenario with_fault(const Scenario& s, Fault f) {
  if (f != Fault::Underfit) return s;
  Scenario u = s;
  const double mid = 0.5 * (s.q_lo() + s.q_hi()), half = 0.5 * (s.q_hi() - s.q_lo());
  const auto base = s.response;
  const auto sigma = s.sigma;
  // A cubic (Chebyshev T3) deviation of 6 sigma at the ends, in the measurand.
  u.response = [base, sigma, mid, half](double q, double aux) {
    const double t = (q - mid) / half;
    return base(q + 6.0 * sigma(q) * (4.0 * t * t * t - 3.0 * t), aux);
  };
  u.options.fit.degrees = {1, 2};
  return u;
}

Dataset simulate_run(const Scenario& s, Fault f, Rng& rng) {
  Dataset d;
  d.file = s.name + ".csv";
  d.columns.setpoint_column = "setpoint";
  const bool two = !s.aux_levels.empty();
  if (two) {
    d.columns.aux_column = "aux";
    d.columns.aux_setpoint_column = "aux_setpoint";
  }
  const int n_sp = static_cast<int>(s.setpoints.size());
  // Faults hit one interior setpoint (never the ends).
  const int victim = 1 + static_cast<int>(rng.uniform() * (n_sp - 2));
  const int victim_rep = static_cast<int>(rng.uniform() * s.repeats);
  const double step = s.setpoints[1] - s.setpoints[0];
  const std::vector<double> levels = two ? s.aux_levels : std::vector<double>{0.0};
  std::size_t line = 2;
  for (std::size_t a = 0; a < levels.size(); ++a)
    for (int k = 0; k < n_sp; ++k)
      for (int r = 0; r < s.repeats; ++r) {
        const double q = s.setpoints[k];
        double e = s.sigma(q) * rng.normal();
        double q_read = q;
        if (f == Fault::Spike && k == victim && r == victim_rep && a == 0) e += 10.0 * s.sigma(q);
        if (f == Fault::Stuck && k == victim) q_read = s.setpoints[k - 1];  // output did not move
        if (f == Fault::Drift) e += 2.0 * s.sigma(q) * r;                   // 2 sigma per repeat
        Observation o;
        o.reading = s.response(q_read + e, levels[a]);
        o.reference = q;
        if (f == Fault::WrongLabel && k == victim) o.reference = q + 0.25 * step;
        o.setpoint = "S" + std::to_string(k);
        o.line = line++;
        if (two) {
          o.aux = levels[a];
          o.aux_setpoint = "A" + std::to_string(a);
        }
        d.rows.push_back(o);
      }
  return d;
}

}  // namespace ridgecal::mc
