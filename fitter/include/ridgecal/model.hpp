// ridgecal: the calibration model, the one type every fit stores
// (Calibration::model): linearising transforms, an optional second input (aux,
// e.g. the sensor's own temperature) and a chosen set of polynomial terms. The
// one-input polynomial is its N = 1 case; a model with aux, transforms or
// restricted powers is "extended" (is_extended()).
//
//   u = transforms.input(reading)            (see transforms.hpp)
//   t = (u   - input.center) / input.half_width
//   s = (aux - aux.center)   / aux.half_width   (only with an aux input)
//   v = sum_m coefficients[m] * B_{i_m}(t) * B_{j_m}(s)
//   reference = transforms.output_inverse(v)
//
// B_k is the Chebyshev polynomial T_k (basis `chebyshev`, a tensor Chebyshev
// basis in two variables) or the plain power t^k (basis `power`, used when the
// allowed powers of the reading are restricted, e.g. Steinhart-Hart {0,1,3}).
// For the power basis the scaling has center 0 and half_width = max |u| over
// the calibrated range, so t^k is a fixed multiple of u^k and restricting the
// powers of t is the same as restricting the powers of u.
#pragma once

#include <string>
#include <vector>

#include "ridgecal/poly_model.hpp"
#include "ridgecal/transforms.hpp"

namespace ridgecal {

enum class ModelBasis { Chebyshev, Power };
std::string to_string(ModelBasis b);                       ///< `chebyshev`, `power`
ModelBasis model_basis_from_string(const std::string& s);  ///< throws std::invalid_argument

/// Affine map of one input onto its scaled variable: (v - center) / half_width.
/// `min`/`max` are the calibrated range of the (transformed) input.
struct AxisScaling {
  double min = -1.0;
  double max = 1.0;
  double center = 0.0;
  double half_width = 1.0;

  double to_scaled(double v) const { return (v - center) / half_width; }
  bool contains(double v) const { return v >= min && v <= max; }
  /// center = midpoint, half_width = half the range (Chebyshev basis). Precondition: max > min.
  static AxisScaling centered(double min, double max);
  /// center = 0, half_width = max(|min|, |max|) (power basis). Precondition: not both zero.
  static AxisScaling about_zero(double min, double max);
};

/// One term B_i(t) * B_j(s): i is the power/degree in the reading, j in aux.
struct Term {
  int i = 0;
  int j = 0;
  bool operator==(const Term& o) const { return i == o.i && j == o.j; }
};

struct Model {
  Transforms transforms;
  bool has_aux = false;
  ModelBasis basis = ModelBasis::Chebyshev;
  AxisScaling input;                 ///< scaling of the transformed reading u
  AxisScaling aux;                   ///< scaling of the aux input (unused without aux)
  std::vector<Term> terms;           ///< the model's terms, (0,0) first when present
  std::vector<double> coefficients;  ///< one per term, in the fitted output units (v)

  int reading_degree() const;  ///< largest i
  int aux_degree() const;      ///< largest j
  int total_degree() const;    ///< largest i + j
  bool has_intercept() const;  ///< a (0,0) term is present

  /// v at the transformed input u and aux value (no transforms applied).
  /// A Chebyshev series without aux is evaluated by Clenshaw's recurrence (as
  /// PolyModel::eval, so the one-input polynomial gives the same bits in both
  /// forms); every other model by the sum of its terms.
  double eval_fitted(double u, double aux_value = 0.0) const;
  /// The calibrated reference value for a raw reading (and aux): applies the
  /// reading transforms, the polynomial and the inverse reference transform.
  /// NaN when the reading is outside the transforms' domain.
  double eval(double reading, double aux_value = 0.0) const;

  /// The same polynomial in powers of the scaled variables:
  ///   v = sum_{k,l} m[k][l] t^k s^l,  m of size (reading_degree+1) x (aux_degree+1).
  /// The form a firmware header evaluates by nested Horner's scheme
  /// (outer in t, inner in s); well conditioned on [-1,1]^2.
  std::vector<std::vector<double>> monomial_in_scaled() const;
  /// In powers of the unscaled transformed inputs: v = sum a[k][l] u^k aux^l.
  /// Documentation only (can be badly conditioned), converted in long double.
  std::vector<std::vector<long double>> power_in_raw_ld() const;
  std::vector<std::vector<double>> power_in_raw() const;

  /// Fills out[m] with the value of term m's basis function at (t, s) (scaled).
  void basis_row(double t, double s, double* out) const;
};

/// True for the one-input polynomial: no aux, Chebyshev basis, identity
/// transforms (the terms are then (0,0)..(d,0), or a subset for a fit through
/// the origin). False for every extended model.
bool is_one_input_polynomial(const Model& m);
/// The one-input polynomial as the general model (the N = 1 case): Chebyshev
/// basis, terms (0,0)..(d,0), identity transforms, the same scaling and
/// coefficients.
Model one_input_model(const PolyModel& p);
/// The inverse, as an evaluation helper for the derived coefficient forms
/// (power_in_x) and the firmware writer. Precondition:
/// is_one_input_polynomial(m). No terms: an empty polynomial.
PolyModel one_input_polynomial(const Model& m);

/// Terms of degree <= d in the reading only: (0,0), (1,0), ... (d,0).
std::vector<Term> terms_reading_only(int d);
/// Terms with i + j <= d (total degree), (0,0) first, ordered by i+j then j.
std::vector<Term> terms_total_degree(int d);
/// Terms with i <= d and j <= a (separate limits), (0,0) first.
std::vector<Term> terms_rectangle(int d, int a);
/// Terms with i in powers and j <= a.
std::vector<Term> terms_powers(const std::vector<int>& powers, int a);

}  // namespace ridgecal
