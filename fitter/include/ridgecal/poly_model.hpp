// ridgecal: the fitted calibration polynomial and its two coefficient forms.
#pragma once

#include <string>
#include <vector>

namespace ridgecal {

/// Affine map of the raw reading x onto the scaled variable t in [-1, 1]:
///   t = (x - center) / half_width,
/// with center = (x_min + x_max)/2 and half_width = (x_max - x_min)/2 over the
/// calibrated range [x_min, x_max] (the smallest and largest training reading).
struct Scaling {
  double x_min = 0.0;  ///< smallest calibrated reading (reading units)
  double x_max = 1.0;  ///< largest calibrated reading (reading units)

  double center() const { return 0.5 * (x_min + x_max); }
  double half_width() const { return 0.5 * (x_max - x_min); }
  /// Scaled variable t for reading x. Precondition: x_max > x_min.
  double to_t(double x) const { return (x - center()) / half_width(); }
  bool contains(double x) const { return x >= x_min && x <= x_max; }
};

/// reference = p(reading), stored as a Chebyshev series in the scaled variable:
///   p(x) = sum_k cheb[k] * T_k(t(x)),  k = 0..degree.
/// The Chebyshev form is the one the fit solves for (well conditioned); the
/// other forms are derived from it in long double.
struct PolyModel {
  Scaling scaling;
  std::vector<double> cheb;  ///< Chebyshev coefficients, size degree+1, reference units

  int degree() const { return static_cast<int>(cheb.size()) - 1; }

  /// Evaluate by Clenshaw's recurrence in double. Any finite x is accepted;
  /// outside the scaling range the result is an extrapolation.
  double eval(double x) const;
  /// Derivative dp/dx (reference units per reading unit).
  double derivative(double x) const;

  /// Coefficients of the same polynomial in powers of t:
  ///   p = sum_k m[k] * t^k.  This is the form the firmware header evaluates
  ///   with Horner's scheme; it stays well conditioned on [-1, 1].
  std::vector<double> monomial_in_t() const;
  /// Coefficients in plain powers of the raw reading x:
  ///   p = sum_k a[k] * x^k.
  /// For readings far from zero (ADC counts, ohms) these can be badly
  /// conditioned: they are reported for documentation, not evaluated here.
  std::vector<double> power_in_x() const;
  /// The same, as long double, for callers who evaluate the power form.
  std::vector<long double> power_in_x_ld() const;
};

/// Evaluate a Chebyshev series at t by Clenshaw's recurrence.
double chebyshev_eval(const std::vector<double>& c, double t);
/// Values T_0(t) .. T_degree(t) written to out[0..degree].
void chebyshev_row(double t, int degree, double* out);

}  // namespace ridgecal
