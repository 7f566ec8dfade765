// ridgecal: the GUM uncertainty budget of an extended fit (multi_input_fit.hpp).
//
// The same components as for the 1-D curve (uncertainty.hpp), all in reference
// units, added in quadrature:
//  * fit residual: s = sqrt(sum e_i^2 / (n - df)), e_i = predicted - reference
//    of the training points, df the effective number of parameters (Type A);
//  * fit coefficients: u_fit(x, a), the standard deviation of the fitted model
//    at reading x and aux value a. The design row is SurfaceModel::basis_row at
//    the scaled inputs (t, s) of the terms other than (0,0), centred on the
//    training means when there is an intercept (exactly the fit's design):
//      Var(v(x, a)) = sigma_v^2 (1/n + w' diag(g_j^2) w),  w = V'(row - mean),
//      g_j = s_j / (s_j^2 + n lambda)   (ridge sandwich form; least squares at lambda = 0),
//    sigma_v the residual SD of the fitted output v (the transformed reference),
//    and u_fit = |d reference / d v| * sqrt(Var(v)) through the inverse
//    reference transform (1 without a reference transform);
//  * reference standard: U_ref / k_ref (Type B, normal);
//  * reading resolution: |d reference / d reading| * r / (2 sqrt 3) through the
//    whole transform chain (central difference), rectangular (Type B).
// U(x, a) = k sqrt(s^2 + u_fit^2 + u_ref^2 + u_res^2). The headline `expanded`
// takes the largest of each component over a grid of the calibrated region
// (band_points readings x aux_points aux values, corners included), so it
// bounds U(x, a) there. The record's `band` holds, at each of band_points
// readings, the largest U over the calibrated aux range (and predicted at the
// middle of that range); guarded acceptance uses U at each point itself.
#pragma once

#include <Eigen/Dense>
#include <string>
#include <vector>

#include "ridgecal/calibration.hpp"
#include "ridgecal/uncertainty.hpp"

namespace ridgecal {

/// Leverages and model variances of an extended fit, rebuilt from its training
/// points and its model (cal.surface).
class SurfaceCovariance {
 public:
  /// Precondition: cal.surface is set.
  explicit SurfaceCovariance(const Calibration& cal);
  bool ok() const { return ok_; }  ///< false without training points or without terms beyond (0,0)
  std::size_t n() const { return n_; }  ///< training points
  double effective_parameters() const {
    return df_;
  }  ///< intercept + sum of s_j^2/(s_j^2 + n lambda)
  double dof() const { return static_cast<double>(n_) - df_; }
  double residual_sd() const { return sigma_ref_; }  ///< reference units; NaN when n <= df
  double residual_sd_fitted() const {
    return sigma_v_;
  }  ///< in the fitted output v; NaN when n <= df
  /// Var(v(x, a)) / sigma_v^2 (NaN outside the transforms' domain).
  double variance_factor(double reading, double aux) const;
  /// Leverage of a training point at (reading, aux): the hat-matrix diagonal.
  double leverage(double reading, double aux) const;
  /// |d reference / d v| at (reading, aux): 1 without a reference transform.
  double output_sensitivity(double reading, double aux) const;
  /// Standard deviation of the fitted model at (reading, aux), reference units.
  double u_fit(double reading, double aux) const;
  const SurfaceModel& model() const { return model_; }

 private:
  bool projected(double reading, double aux, Eigen::VectorXd& w) const;
  SurfaceModel model_;
  bool ok_ = false;
  bool intercept_ = true;
  std::size_t n_ = 0;
  double lambda_ = 0.0, df_ = 0.0, sigma_ref_ = 0.0, sigma_v_ = 0.0;
  std::vector<Term> cols_;  ///< the terms other than (0,0), in the fit's column order
  Eigen::RowVectorXd mean_;
  Eigen::MatrixXd V_;
  Eigen::VectorXd s_;
  int rank_ = 0;
};

/// The budget of an extended fit, evaluated anywhere in (reading, aux).
class SurfaceUncertainty {
 public:
  /// Preconditions: cal.surface is set; options.validate() is empty.
  SurfaceUncertainty(const Calibration& cal, const UncertaintyOptions& options,
                     int aux_points = 11);
  const SurfaceCovariance& covariance() const { return cov_; }
  /// |d reference / d reading| through the transform chain (central difference).
  double reading_sensitivity(double reading, double aux) const;
  double combined_at(double reading, double aux) const;  ///< combined standard uncertainty
  double expanded_at(double reading, double aux) const;  ///< k * combined_at
  const UncertaintyBudget& budget() const { return budget_; }

 private:
  UncertaintyOptions options_;
  SurfaceCovariance cov_;
  double s_ = 0.0, u_ref_ = 0.0;
  UncertaintyBudget budget_;
};

}  // namespace ridgecal
