// ridgecal (internal): scoring the (candidate, lambda) grid of a fit by
// grouped cross-validation, and solving the chosen cell, for every model.
//
// Two solvers, one result:
//   * nested path (candidate term lists nested, fit_model.hpp): one
//     NestedRidge factorisation per fold, and one of all training points, of
//     the largest candidate's columns (at most NestedRidge::kMaxColumns) serves
//     every candidate and lambda (ridge_grid.hpp). Candidates it cannot solve
//     (more columns, or near rank deficiency: NestedRidge::usable()) go to
//   * the general path: one RidgePath (thin SVD) per candidate and fold
//     (ridge_path.hpp), every lambda from its filter factors.
// Both minimise (1/m)||v - b0 - X b||^2 + lambda ||b||^2 over the training rows
// (b0 unpenalised, columns and v centred when `centred`).
//
// Scores are RMSEs in reference units: the fitted-unit predictions are mapped
// by the output transform's inverse and compared with the reference. With an
// identity output transform the nested path takes the mean squared error its
// lanes compute (no predictions are formed); otherwise errors are summed in
// long double.
#pragma once

#include <Eigen/Dense>
#include <cstddef>
#include <vector>

#include "ridgecal/errors.hpp"
#include "ridgecal/transforms.hpp"

namespace ridgecal {

struct GridProblem {
  /// nested: one design holding the columns of the largest candidate, in
  /// order (candidate c uses the leading cols[c]); else one design per candidate.
  std::vector<Eigen::MatrixXd> designs;
  bool nested = false;
  std::vector<int> cols;  ///< design columns per candidate (ascending when nested)
  std::vector<double> v;  ///< fitted-unit target per row
  std::vector<double> y;  ///< reference per row (v = output(y))
  Transforms output;      ///< its output_inverse maps v to reference units
  bool centred = true;    ///< an unpenalised intercept: centre columns and v
  std::vector<double> lambdas;
  std::vector<std::size_t> train;                    ///< training rows
  std::vector<std::vector<std::size_t>> fold_train;  ///< per fold: rows trained on
  std::vector<std::vector<std::size_t>> fold_val;    ///< per fold: rows validated
};

class FitGrid {
 public:
  /// Scores every cell; with `cv` false only the training RMSEs.
  /// The problem must outlive the object.
  FitGrid(const GridProblem& problem, bool cv);

  /// RMSE of fold k's model of candidate c, penalty index l, at the fold's
  /// validation rows (NaN for a candidate without columns).
  double fold_rmse(std::size_t k, std::size_t c, std::size_t l) const {
    return fold_rmse_[(k * nc_ + c) * nl_ + l];
  }
  /// RMSE at the training rows of candidate c fitted on all of them.
  double train_rmse(std::size_t c, std::size_t l) const { return train_rmse_[c * nl_ + l]; }

  /// Coefficients of candidate c (cols[c] > 0) fitted on all training rows,
  /// the intercept b0 and the condition number of the centred design.
  /// Fails when the design is rank deficient and lambda is 0.
  Status solve(std::size_t c, double lambda, Eigen::VectorXd& b, double& b0, double& cond);

  /// Held-out fitted-unit predictions of candidate c (cols[c] > 0): each
  /// fold's validation rows predicted by the model fitted on the fold's
  /// training rows, written to out[row].
  void held_out(std::size_t c, double lambda, std::vector<double>& out);

 private:
  const Eigen::MatrixXd& design(std::size_t c) const {
    return p_.nested ? p_.designs.front() : p_.designs[c];
  }
  void score_problem(int k, const std::vector<std::size_t>& tr, const std::vector<std::size_t>* va);
  void store(int k, std::size_t c, std::size_t l, double rmse);
  double rmse(const double* vhat, std::size_t stride, const std::vector<std::size_t>& rows) const;

  const GridProblem& p_;
  std::size_t nc_ = 0, nl_ = 0, nk_ = 0;
  std::vector<double> fold_rmse_, train_rmse_;
  std::vector<double> buf_;
};

}  // namespace ridgecal
