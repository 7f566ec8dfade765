// ridgecal: choosing and fitting a calibration curve for one sensor.
//
// Model: reference = p(reading), p a polynomial of degree d written as a
// Chebyshev series in the scaled reading t in [-1, 1] (see poly_model.hpp),
// fitted by ridge regression with penalty lambda on every coefficient but the
// intercept (see ridge_path.hpp for the exact convention).
//
// Selection: every (degree, lambda) of the grid is scored by grouped
// cross-validation on the training setpoints (see grouped_split.hpp); the test
// setpoints are used for nothing but the final test metrics.
//
// One fit, one model: fit_calibration and fit_extended (extended_fit.hpp)
// are two entry points into one implementation (fitter/src/fit/fit_model.cpp),
// and every fit is stored in the one Calibration::model (model.hpp).
// This polynomial is its N = 1 case: Chebyshev basis, terms (0,0)..(d,0),
// identity transforms, no aux. is_extended() tells the two output layouts apart.
#pragma once

#include <limits>
#include <optional>
#include <string>
#include <vector>

#include "ridgecal/calibration_csv.hpp"
#include "ridgecal/errors.hpp"
#include "ridgecal/grouped_split.hpp"
#include "ridgecal/metrics.hpp"
#include "ridgecal/model.hpp"

namespace ridgecal {

/// How the best grid cell is picked from the cross-validation scores.
enum class SelectionRule {
  MinCv,  ///< `min-cv`: the lowest mean CV RMSE
  OneSe,  ///< `one-se` (the default): the simplest cell (fewest model terms,
          ///< then largest lambda) whose mean CV RMSE is within one standard
          ///< error of the lowest. In one input the terms are the degree plus
          ///< the intercept, so "fewest terms" is "lowest degree". With few
          ///< setpoints the CV scores are noisy and the lowest often belongs to
          ///< a needlessly high degree; this rule follows the sensor rather
          ///< than its noise.
};
std::string to_string(SelectionRule r);
SelectionRule selection_rule_from_string(const std::string& s);  ///< throws std::invalid_argument

enum class SelectionMode { CrossValidation, Fixed };
std::string to_string(SelectionMode m);                          ///< `cv`, `fixed`
SelectionMode selection_mode_from_string(const std::string& s);  ///< throws std::invalid_argument

/// 0 followed by 30 values log-spaced from 1e-12 to 10 (dimensionless: the
/// Chebyshev columns are O(1) on [-1, 1], and lambda multiplies the squared
/// coefficients in reference units against the mean squared error).
std::vector<double> default_lambda_grid();

struct FitOptions {
  std::vector<int> degrees{1, 2, 3, 4,
                           5, 6, 7};  ///< candidate degrees, each 0..20 (0 only without CV)
  std::vector<double> lambdas = default_lambda_grid();  ///< candidate penalties, each >= 0
  SelectionRule rule = SelectionRule::OneSe;
  SplitOptions split;               ///< test hold-out and folds
  std::optional<int> fixed_degree;  ///< with fixed_lambda: skip the selection
  std::optional<double> fixed_lambda;
  bool intercept = true;  ///< false: force p(0) = 0 (regression through the origin)

  /// Empty when valid, else a message naming the field, the value and the rule.
  std::string validate() const;
};

/// One cell of the validation grid.
struct GridCell {
  int degree = 0;
  double lambda = 0.0;
  double cv_rmse = 0.0;     ///< mean over folds of the fold RMSE (NaN if not scored)
  double cv_se = 0.0;       ///< standard error of that mean: sd(fold RMSE) / sqrt(K)
  double train_rmse = 0.0;  ///< RMSE of the same cell fitted on all training points
  int aux_degree = -1;      ///< extended fits with an aux input: its degree limit; -1 otherwise
  int terms =
      0;  ///< number of model terms (1-D: degree + intercept); the complexity the rule compares
};

/// The selection rule, written once for every fit: the index in `grid` of the
/// cell with the lowest mean CV RMSE (min-cv), or of the simplest cell within
/// one standard error of it (one-se: fewest terms, then largest lambda; the
/// first such cell in grid order on ties). Cells whose CV RMSE is NaN (not
/// scored) are never chosen; -1 when no cell was scored.
int choose_cell(const std::vector<GridCell>& grid, SelectionRule rule);

struct SelectionInfo {
  SelectionMode mode = SelectionMode::CrossValidation;
  SelectionRule rule = SelectionRule::OneSe;
  FoldScheme scheme = FoldScheme::KFold;
  int n_folds = 0;
  std::vector<int> degrees;        ///< the degrees actually scored
  std::vector<double> lambdas;     ///< sorted ascending
  std::vector<GridCell> grid;      ///< degree-major, lambda ascending
  int chosen = -1;                 ///< index into grid, -1 in fixed mode without CV
  std::vector<std::string> notes;  ///< e.g. degrees dropped for lack of setpoints
  std::vector<int>
      aux_degrees;  ///< extended fits: the aux degree limits scored (empty: total degree)
  std::vector<int>
      powers;  ///< extended fits: the allowed reading powers (empty: all up to the degree)
};

struct SetpointResult {
  std::string id;
  double mean_reading = 0.0;
  double mean_reference = 0.0;
  std::size_t count = 0;
  SetRole role = SetRole::Train;
  int fold = -1;  ///< -1: test, or an end setpoint never validated
  double mean_aux = std::numeric_limits<double>::quiet_NaN();  ///< fits with an aux input only
};

struct PointResult {
  std::size_t line = 0;  ///< line in the input file
  std::string setpoint;
  double reading = 0.0;
  double reference = 0.0;
  double predicted = 0.0;  ///< by the final model
  double error = 0.0;      ///< predicted - reference
  SetRole role = SetRole::Train;
  int fold = -1;
  double cv_predicted = 0.0;  ///< held-out prediction for validated points, else NaN
  double aux = std::numeric_limits<double>::quiet_NaN();  ///< fits with an aux input only
};

struct Calibration {
  /// The fitted model, for every fit: the one-input polynomial is its N = 1
  /// case (see is_extended() for the layout question).
  Model model;
  double lambda = 0.0;
  bool intercept = true;
  double condition_number = 0.0;  ///< of the centred Chebyshev design of the final fit
  SplitOptions split_options;
  bool user_named_test = false;
  SelectionInfo selection;
  std::vector<SetpointResult> setpoints;  ///< in order of increasing reading
  Metrics training, validation, test;
  std::vector<PointResult> points;  ///< in file order
  /// Extended fits with an aux input grouped by rounded value: the rounding step (0 otherwise).
  double aux_step = 0.0;

  std::string brief() const;  ///< a few lines for a terminal
  std::string full() const;   ///< everything, for logs
};

struct FitOutcome {
  Status status;  ///< failure: too few setpoints, all readings equal, ... (message says which)
  Calibration calibration;
};

/// True when the model uses an extension (an aux input, non-identity
/// transforms or restricted powers, i.e. the power basis), computed from
/// Calibration::model: the record and the header then use their extended
/// layout. False for the plain one-input polynomial.
bool is_extended(const Calibration& cal);

/// The fitted model: Calibration::model (kept as the accessor code that works
/// on any model has always used).
inline const Model& general_model(const Calibration& cal) {
  return cal.model;
}

/// Splits, selects and fits the one-input polynomial (the same as
/// fit_extended with no extension). Preconditions: options.validate() is empty.
/// Fails (status) when: all readings are equal; there are fewer distinct
/// training setpoints than the smallest candidate model needs; the grid has
/// several cells but too few setpoints to cross-validate.
FitOutcome fit_calibration(const Dataset& data, const FitOptions& options);

}  // namespace ridgecal
