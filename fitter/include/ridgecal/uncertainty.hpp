// ridgecal: measurement uncertainty of the calibrated value (GUM method).
//
// Components, all in reference units (standard uncertainties, added in
// quadrature; see docs/decision-and-uncertainty.md):
//  * fit residual: the residual standard deviation s of the training points,
//    s^2 = RSS / (n - df), df the effective number of parameters (Type A);
//  * fit coefficients: u_fit(x), the standard deviation of the fitted curve
//    at reading x from the coefficients' covariance (Type A). For ridge
//    (lambda > 0) the covariance is the sandwich form
//      Cov(b) = s^2 (Xc'Xc + n lambda I)^-1 Xc'Xc (Xc'Xc + n lambda I)^-1
//             = s^2 V diag(s_j^2 / (s_j^2 + n lambda)^2) V',
//    which ignores the shrinkage bias (an approximation; the bias shows up in s);
//  * reference standard: U_ref / k_ref as stated by the user (Type B, normal);
//  * reading resolution: a digit step r of the reading, rectangular,
//    u = |dp/dx| * r / (2 sqrt 3) (Type B, sensitivity dp/dx).
// combined(x) = sqrt(s^2 + u_fit(x)^2 + u_ref^2 + u_res(x)^2), U(x) = k combined(x).
// The headline `expanded` uses the largest value of each component over the
// calibrated range, so it bounds U(x) everywhere in that range.
#pragma once

#include <Eigen/Dense>
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "ridgecal/calibration.hpp"

namespace ridgecal {

struct UncertaintyOptions {
  double reference_uncertainty =
      0.0;                   ///< U_ref of the reference standard (reference units), >= 0; default 0
  double reference_k = 1.0;  ///< coverage factor U_ref is stated with: 1 = a standard uncertainty
                             ///< (default), 2 = expanded k=2
  double resolution = 0.0;  ///< reading resolution (one digit step, reading units), >= 0; default 0
  double coverage_k =
      2.0;  ///< coverage factor of the reported expanded uncertainty; default 2 (about 95 %)
  int band_points = 21;  ///< points of the prediction band over the range, 2..1001; default 21

  /// Empty when valid, else a message naming the field, the value and the rule.
  std::string validate() const;
};

/// Type of evaluation (GUM): A from the data, B from other information.
enum class EvaluationType { A, B };
std::string to_string(EvaluationType t);                           ///< `A`, `B`
EvaluationType evaluation_type_from_string(const std::string& s);  ///< throws std::invalid_argument

enum class Distribution { Normal, Rectangular };
std::string to_string(Distribution d);                        ///< `normal`, `rectangular`
Distribution distribution_from_string(const std::string& s);  ///< throws std::invalid_argument

struct UncertaintyComponent {
  std::string
      name;  ///< `fit-residual`, `fit-coefficients`, `reference-standard`, `reading-resolution`
  EvaluationType type = EvaluationType::A;
  Distribution distribution = Distribution::Normal;
  double value = 0.0;        ///< as stated (U_ref, the digit step, s, ...)
  double divisor = 1.0;      ///< value / divisor = standard uncertainty of the input
  double sensitivity = 1.0;  ///< |d reference / d input| (largest over the range)
  double standard = 0.0;     ///< standard uncertainty contributed, reference units
  std::string note;
};

struct BandPoint {
  double reading = 0.0;
  double predicted = 0.0;  ///< calibrated value p(reading)
  double u_fit = 0.0;      ///< standard deviation of the fitted curve
  double combined = 0.0;   ///< combined standard uncertainty at this reading
  double expanded = 0.0;   ///< coverage_k * combined
};

struct UncertaintyBudget {
  std::vector<UncertaintyComponent> components;
  double residual_sd = 0.0;
  double degrees_of_freedom = 0.0;  ///< n - df of the residual SD
  double combined = 0.0;            ///< combined standard uncertainty (largest over the range)
  double k = 2.0;
  double expanded = 0.0;  ///< k * combined
  std::string band_method;
  std::vector<BandPoint> band;  ///< over [x_min, x_max], increasing reading

  /// U at a reading: linear interpolation in the band; outside the range, the
  /// nearest band end (the curve is then an extrapolation anyway). Falls back
  /// to `expanded` when the band is empty.
  double expanded_at(double reading) const;
  std::string brief(const std::string& unit) const;  ///< a few lines for a terminal
  std::string full(const std::string& unit) const;   ///< brief() plus the notes and the band
};

/// Leverages and curve variances of a fitted calibration, rebuilt from its
/// training points (same design as the fit: Chebyshev columns of the scaled
/// reading, centred when there is an intercept; ridge filter factors).
class FitCovariance {
 public:
  explicit FitCovariance(const Calibration& cal);
  bool ok() const { return ok_; }       ///< false without training points or for degree 0
  std::size_t n() const { return n_; }  ///< training points
  double effective_parameters() const {
    return df_;
  }                                              ///< intercept + sum of s_j^2/(s_j^2 + n lambda)
  double residual_sd() const { return sigma_; }  ///< sqrt(RSS / (n - df)); NaN when n <= df
  double dof() const { return static_cast<double>(n_) - df_; }
  /// Var(p(x)) / sigma^2.
  double variance_factor(double reading) const;
  /// Leverage h of a training point at this reading: (hat matrix diagonal).
  double leverage(double reading) const;

 private:
  Eigen::VectorXd projected(double reading) const;
  bool ok_ = false;
  bool intercept_ = true;
  std::size_t n_ = 0;
  double lambda_ = 0.0, df_ = 0.0, sigma_ = 0.0;
  int degree_ = 0;
  Scaling scaling_;
  Eigen::RowVectorXd mean_;
  Eigen::MatrixXd V_;
  Eigen::VectorXd s_;
  int rank_ = 0;
};

/// The floors of the variation check (calibration_csv.hpp) these options
/// imply: the reading resolution, and the reference standard's uncertainty
/// expanded with k = 2 (references closer together than that cannot be told
/// apart).
VariationFloors variation_floors(const UncertaintyOptions& options);

/// Evaluates the budget. Preconditions: options.validate() is empty.
UncertaintyBudget evaluate_uncertainty(const Calibration& cal, const UncertaintyOptions& options);

nlohmann::json to_json(const UncertaintyBudget& u);
UncertaintyBudget uncertainty_from_json(const nlohmann::json& j,
                                        const std::string& file);  ///< throws InputError

}  // namespace ridgecal
