// ridgecal: extended fits. Linearising transforms, a second input (aux) and
// restricted powers, chosen and fitted like the 1-D curve (calibration.hpp).
//
// Model: see model.hpp. Terms (i = degree in the reading, j in aux):
//   no aux:                 i <= d                      (d from FitOptions::degrees)
//   aux, total degree:      i + j <= d                  (aux_degrees empty)
//   aux, separate limits:   i <= d, j <= a              (a from aux_degrees)
//   restricted powers:      i in powers, j <= a         (power basis; d = max power)
// Penalty: (1/n) sum (v - q)^2 + lambda * sum of the squared coefficients of
// every term but (0,0), in the basis of the scaled variables (tensor Chebyshev,
// or plain powers with --powers). The (0,0) term is not penalised (centring, as
// in ridge_path.hpp); without a power 0 there is no intercept and nothing is
// centred. Selection scores (cross-validation RMSE) and all metrics are in the
// reference units, after the inverse reference transform.
//
// Groups (never split): rows sharing a setpoint label (or reference value) and,
// with aux, an aux level: the aux setpoint label (CsvOptions::aux_setpoint_column)
// or else the aux value rounded to the nearest multiple of aux_step. The
// boundary rule (which groups always stay in training) is that of
// grouped_split.hpp: the 1-D end rule is its case without aux.
//
// One fit: fit_extended and fit_calibration are entry points into one
// implementation (fitter/src/fit/fit_model.cpp); with no extension active
// (ExtendedOptions{}) fit_extended is the plain polynomial; either way the
// model goes to the one Calibration::model. Candidates
// whose term lists are nested (no aux; aux with total degree) share the nested
// fast path (one QR per fold); separate limits and powers use one SVD per
// candidate and fold.
#pragma once

#include <Eigen/Dense>
#include <string>
#include <vector>

#include "ridgecal/calibration.hpp"
#include "ridgecal/model.hpp"
#include "ridgecal/transforms.hpp"

namespace ridgecal {

struct ExtendedOptions {
  Transforms transforms;
  bool aux = false;  ///< the rows carry an aux value (Observation::aux)
  std::vector<int>
      aux_degrees;          ///< candidate aux degree limits (separate limits); empty: total degree
  std::vector<int> powers;  ///< allowed reading powers (power basis); empty: Chebyshev, all powers
  double aux_step = 1.0;    ///< aux grouping step without an aux setpoint column, > 0

  /// True when any extension is in use (otherwise the fit is the plain polynomial).
  bool active() const {
    return aux || !aux_degrees.empty() || !powers.empty() || !transforms.identity();
  }
  /// Empty when valid together with `fit`, else a message naming the field, the value and the rule.
  std::string validate(const FitOptions& fit) const;
};

/// Splits, selects and fits a model with the extensions of `comp` (none: the
/// plain polynomial, as fit_calibration). Preconditions: fit.validate()
/// and comp.validate(fit) are empty. Throws InputError (with the line) when a
/// reading or reference is outside the transforms' domain or an aux value is
/// missing; otherwise fails (status) like fit_calibration.
FitOutcome fit_extended(const Dataset& data, const FitOptions& fit, const ExtendedOptions& comp);

/// Lines describing an extended model for Calibration::brief()/full().
std::string extended_brief(const Calibration& cal);
std::string extended_full(const Calibration& cal);

}  // namespace ridgecal
