// ridgecal: measurement uncertainty of the calibrated value (GUM method), for
// every model: the one-input polynomial (the N = 1 case of the general model,
// general_model() in calibration.hpp) and the extended fits (transforms, an aux
// input, restricted powers; extended_fit.hpp) alike.
//
// Components, all in reference units (standard uncertainties, added in
// quadrature; see docs/decision-and-uncertainty.md):
//  * fit residual: the residual standard deviation s of the training points,
//    s^2 = RSS / (n - df), df the effective number of parameters (Type A);
//  * fit coefficients: u_fit(x, a), the standard deviation of the fitted model
//    at reading x (and aux value a) from the coefficients' covariance (Type A).
//    The design row is Model::basis_row of the terms other than (0,0)
//    at the scaled inputs (t, s), centred on the training means when there is
//    an intercept; through the origin (cal.intercept false) it is
//    row(t) - row(t0), t0 the scaled reading 0, not centred: exactly the fit's
//    design. With w = V'(row - mean) from the SVD Xc = U S V',
//      Var(v(x, a)) = sigma_v^2 (1/n + w' diag(g_j^2) w),  g_j = s_j / (s_j^2 + n lambda)
//    (the ridge sandwich form s_v^2 (Xc'Xc + n lambda I)^-1 Xc'Xc (Xc'Xc + n lambda I)^-1,
//    least squares at lambda = 0; it ignores the shrinkage bias, which shows
//    up in s; the 1/n term only with an intercept), sigma_v the residual SD
//    of the fitted output v (the transformed reference; v = reference without
//    a reference transform), and u_fit = |d reference / d v| sqrt(Var(v))
//    through the inverse reference transform;
//  * reference standard: U_ref / k_ref as stated by the user (Type B, normal);
//  * reading resolution: a digit step r of the reading, rectangular,
//    u = |d reference / d reading| * r / (2 sqrt 3) (Type B). The slope is the
//    exact derivative of the polynomial for a model in the reading alone
//    without transforms, else a central difference through the whole
//    transform chain (transforms or an aux input).
//  * model inadequacy: u_inad(x), the systematic error the curve family
//    leaves where it cannot follow the sensor, from the leave-one-setpoint-out
//    errors against the pure error of the repeats, included when the
//    lack-of-fit test rejects the model (Type A; estimate_inadequacy below).
// combined(x, a) = sqrt(s^2 + u_fit^2 + u_ref^2 + u_res^2 + u_inad^2), U(x, a) = k combined(x, a).
// The headline `expanded` takes the largest value of each component over a
// grid of the calibrated region (band_points readings over the training
// readings' range x aux_points aux values, ends included), so it bounds U
// there. The record's `band` holds, at each of band_points readings, U at that
// reading (with an aux input: the largest U over the calibrated aux range, and
// `predicted` at the middle of that range).
#pragma once

#include <Eigen/Dense>
#include <limits>
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "ridgecal/calibration.hpp"
#include "ridgecal/model.hpp"

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
  /// Gate of the model-inadequacy term (inadequacy.cpp): the term enters the
  /// budget when the lack-of-fit F test of the final model against the pure
  /// error of the repeats gives p < inadequacy_alpha. 0 turns the term off;
  /// 0..0.5; default 0.05 (see docs/decision-and-uncertainty.md).
  double inadequacy_alpha = 0.05;

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
  double predicted = 0.0;     ///< calibrated value p(reading)
  double u_fit = 0.0;         ///< standard deviation of the fitted curve
  double u_inadequacy = 0.0;  ///< model-inadequacy standard uncertainty at this reading
  double combined = 0.0;      ///< combined standard uncertainty at this reading
  double expanded = 0.0;      ///< coverage_k * combined
};

/// One setpoint's evidence of model inadequacy (reference units).
struct InadequacyNode {
  double reading = 0.0;   ///< mean training reading of the setpoint
  double deleted = 0.0;   ///< mean error with the setpoint left out (group-deletion formula)
  double noise_sd = 0.0;  ///< standard deviation of `deleted` from the pure error alone
  double standard = 0.0;  ///< smoothed inadequacy standard uncertainty at this setpoint
};

/// The model-inadequacy term: an estimate of the systematic error of the
/// delivered curve where the curve family cannot follow the sensor, from the
/// training setpoints' leave-one-setpoint-out errors against the pure error of
/// the repeats. u(x) interpolates `nodes` linearly in u^2 (constant beyond the
/// ends); with an aux input the term is one figure over the whole region
/// (`uniform`). Zero unless `included`.
struct ModelInadequacy {
  bool estimated = false;  ///< enough evidence: repeats (df_pure >= 2) and >= 3 setpoints
  bool included = false;   ///< the gate passed: the term is in the budget
  double alpha = 0.0;      ///< the gate (UncertaintyOptions::inadequacy_alpha)
  double lack_of_fit_p = std::numeric_limits<double>::quiet_NaN();  ///< the gate's test
  double pure_sd = std::numeric_limits<double>::quiet_NaN();  ///< pooled repeat SD, reference units
  double df_pure = 0.0;
  double uniform = 0.0;               ///< with an aux input: the one figure used everywhere
  std::vector<InadequacyNode> nodes;  ///< one-input models: by increasing reading
  std::string reason;                 ///< why included or not, one sentence

  double at(double reading) const;  ///< u at a reading (0 unless included)
  double largest() const;           ///< largest u over the nodes (0 unless included)
};

struct UncertaintyBudget {
  std::vector<UncertaintyComponent> components;
  ModelInadequacy inadequacy;  ///< the evidence behind the `model-inadequacy` component
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

/// Leverages and model variances of a fitted calibration, any model, rebuilt
/// from its training points and general_model(cal) (the same design as the
/// fit; see the top of this file). The aux value is ignored by models without
/// an aux input.
class FitCovariance {
 public:
  explicit FitCovariance(const Calibration& cal);
  bool ok() const { return ok_; }  ///< false without training points or without terms beyond (0,0)
  std::size_t n() const { return n_; }  ///< training points
  double effective_parameters() const {
    return df_;
  }  ///< intercept + sum of s_j^2/(s_j^2 + n lambda)
  double dof() const { return static_cast<double>(n_) - df_; }
  double residual_sd() const { return sigma_ref_; }  ///< reference units; NaN when n <= df
  double residual_sd_fitted() const {
    return sigma_v_;
  }  ///< in the fitted output v (= residual_sd() without a reference transform); NaN when n <= df
  /// Residual of a training point in the fitted output v (its error when
  /// there is no reference transform).
  double fitted_residual(const PointResult& p) const;
  /// Var(v(x, a)) / sigma_v^2 (NaN outside the transforms' domain).
  double variance_factor(double reading, double aux = 0.0) const;
  /// Leverage of a training point at (reading, aux): the hat-matrix diagonal.
  double leverage(double reading, double aux = 0.0) const;
  /// |d reference / d v| at (reading, aux): 1 without a reference transform.
  double output_sensitivity(double reading, double aux = 0.0) const;
  /// Standard deviation of the fitted model at (reading, aux), reference units.
  double u_fit(double reading, double aux = 0.0) const;
  const Model& model() const { return model_; }

 private:
  bool projected(double reading, double aux, Eigen::VectorXd& w) const;
  bool design_row(double reading, double aux, double* out) const;
  Model model_;
  Model columns_;  ///< model_ with the terms other than (0,0): the design columns
  bool ok_ = false;
  bool intercept_ = true;
  std::size_t n_ = 0;
  double lambda_ = 0.0, df_ = 0.0, sigma_ref_ = 0.0, sigma_v_ = 0.0;
  std::vector<double> origin_;  ///< design row at reading 0 (through the origin only)
  Eigen::RowVectorXd mean_;
  Eigen::MatrixXd V_;
  Eigen::VectorXd s_;
  int rank_ = 0;
};

/// The budget of a fitted calibration, any model, evaluated anywhere in
/// (reading, aux).
class UncertaintyEvaluator {
 public:
  /// Preconditions: options.validate() is empty; aux_points >= 2.
  UncertaintyEvaluator(const Calibration& cal, const UncertaintyOptions& options,
                       int aux_points = 11);
  const FitCovariance& covariance() const { return cov_; }
  /// |d reference / d reading| at (reading, aux): the polynomial's exact
  /// derivative for a model in the reading alone without transforms, else a
  /// central difference through the transform chain.
  double reading_sensitivity(double reading, double aux = 0.0) const;
  double combined_at(double reading, double aux = 0.0) const;  ///< combined standard uncertainty
  /// combined_at without the model-inadequacy term: what the fit's own scatter
  /// and the stated inputs allow (the adequacy check of decision.hpp).
  double combined_without_inadequacy_at(double reading, double aux = 0.0) const;
  /// U at (reading, aux) for guarded acceptance. Without an aux input the band
  /// is U(x) itself and this interpolates in it (UncertaintyBudget::expanded_at,
  /// so a reader of the record gets the same figure); with an aux input the
  /// band is an envelope and U is evaluated at the point itself.
  double expanded_at(double reading, double aux = 0.0) const;
  const UncertaintyBudget& budget() const { return budget_; }

 private:
  UncertaintyOptions options_;
  FitCovariance cov_;
  std::vector<std::vector<double>> monomial_;  ///< model in powers of (t, s), for the slope
  double s_ = 0.0, u_ref_ = 0.0;
  UncertaintyBudget budget_;
};

/// Estimates the model-inadequacy term of a fitted calibration
/// (inadequacy.cpp; the method is in docs/decision-and-uncertainty.md).
/// `residual_sd` is the budget's fit-residual component (reference units):
/// the pooled in-sample lack of fit it already carries is not counted twice.
ModelInadequacy estimate_inadequacy(const Calibration& cal, const FitCovariance& cov,
                                    double residual_sd, double alpha);

/// The floors of the variation check (calibration_csv.hpp) these options
/// imply: the reading resolution, and the reference standard's uncertainty
/// expanded with k = 2 (references closer together than that cannot be told
/// apart).
VariationFloors variation_floors(const UncertaintyOptions& options);

/// Evaluates the budget: UncertaintyEvaluator(cal, options).budget().
/// Preconditions: options.validate() is empty.
UncertaintyBudget evaluate_uncertainty(const Calibration& cal, const UncertaintyOptions& options);

nlohmann::json to_json(const UncertaintyBudget& u);
UncertaintyBudget uncertainty_from_json(const nlohmann::json& j,
                                        const std::string& file);  ///< throws InputError

}  // namespace ridgecal
