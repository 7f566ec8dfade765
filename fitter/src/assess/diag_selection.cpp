// Checks of the model choice: validation against training (overfit), the
// chosen cell at the edge of its grid, and the condition number of the design.
// (Test against validation and setpoints per coefficient are the calibrated
// checks of calibrated_checks.cpp.)
#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "ridgecal/diag_common.hpp"
#include "ridgecal/diagnostics.hpp"

namespace ridgecal {

using detail::make_warning;

std::vector<Warning> check_cv_vs_training(const Calibration& cal, const DiagnosticOptions& o) {
  const Metrics& v = cal.validation;
  const Metrics& t = cal.training;
  if (v.empty() || t.empty() || !(std::isfinite(v.rmse) && std::isfinite(t.rmse)) ||
      !(t.rmse > 0.0))
    return {};
  const double ratio = v.rmse / t.rmse;
  if (!(ratio > o.cv_training_ratio)) return {};
  return {make_warning(
      DiagnosticCode::ValidationMuchWorseThanTraining,
      fmt::format(
          "The validation (cross-validated) RMSE ({:.3g}) is {:.1f} times the training RMSE "
          "({:.3g}): "
          "the model follows the training points more closely than it predicts points it has not "
          "seen (overfit); use fewer terms, a larger lambda or more setpoints.",
          v.rmse, ratio, t.rmse),
      {}, ratio)};
}

std::vector<Warning> check_grid_edges(const Calibration& cal) {
  const SelectionInfo& s = cal.selection;
  std::vector<Warning> out;
  if (s.mode != SelectionMode::CrossValidation || s.chosen < 0) return out;
  const GridCell& c = s.grid[static_cast<std::size_t>(s.chosen)];
  if (s.degrees.size() > 1) {
    const int lo = *std::min_element(s.degrees.begin(), s.degrees.end());
    const int hi = *std::max_element(s.degrees.begin(), s.degrees.end());
    if (c.degree == hi)
      out.push_back(make_warning(
          DiagnosticCode::DegreeAtGridEdge,
          fmt::format("The chosen degree {} is the highest candidate: a higher degree might fit "
                      "better; widen --degrees and refit.",
                      c.degree),
          {}, c.degree));
    else if (c.degree == lo && lo > 1)
      out.push_back(make_warning(
          DiagnosticCode::DegreeAtGridEdge,
          fmt::format(
              "The chosen degree {} is the lowest candidate: a lower degree might do as well; "
              "widen --degrees and refit.",
              c.degree),
          {}, c.degree));
  }
  if (s.lambdas.size() > 1) {
    const double lo = s.lambdas.front(), hi = s.lambdas.back();
    if (c.lambda == hi)
      out.push_back(make_warning(
          DiagnosticCode::LambdaAtGridEdge,
          fmt::format(
              "The chosen lambda {:g} is the largest candidate: the curve is shrunk as far as "
              "the grid allows; widen --lambdas or lower the degree.",
              c.lambda),
          {}, c.lambda));
    else if (c.lambda == lo && lo > 0.0)
      out.push_back(make_warning(
          DiagnosticCode::LambdaAtGridEdge,
          fmt::format("The chosen lambda {:g} is the smallest candidate and the grid has no 0: a "
                      "smaller penalty might fit better; widen --lambdas.",
                      c.lambda),
          {}, c.lambda));
  }
  if (s.aux_degrees.size() > 1 && c.aux_degree >= 0) {
    const int hi = *std::max_element(s.aux_degrees.begin(), s.aux_degrees.end());
    if (c.aux_degree == hi)
      out.push_back(make_warning(
          DiagnosticCode::DegreeAtGridEdge,
          fmt::format(
              "The chosen aux degree {} is the highest candidate: a higher degree in the second "
              "input might fit better; widen --aux-degree and refit.",
              c.aux_degree),
          {}, c.aux_degree));
  }
  return out;
}

std::vector<Warning> check_condition(const Calibration& cal, const DiagnosticOptions& o) {
  if (!(cal.condition_number > o.condition_limit)) return {};
  return {make_warning(
      DiagnosticCode::HighConditionNumber,
      fmt::format(
          "The fit's design has condition number {:.3g} (above {:.3g}): the coefficients are "
          "sensitive to small changes in the data; lower the degree, raise lambda or spread the "
          "setpoints.",
          cal.condition_number, o.condition_limit),
      {}, cal.condition_number)};
}

}  // namespace ridgecal
