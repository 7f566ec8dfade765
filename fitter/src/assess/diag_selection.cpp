// Checks of the model choice: test against validation, validation against
// training (overfit), the chosen cell at the edge of its grid, too few
// setpoints per coefficient, and the condition number of the design.
#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "ridgecal/diag_common.hpp"
#include "ridgecal/diagnostics.hpp"

namespace ridgecal {

using detail::make_warning;

std::vector<Warning> check_test_vs_validation(const Calibration& cal, const DiagnosticOptions& o) {
  const Metrics& t = cal.test;
  const Metrics& v = cal.validation;
  if (t.empty() || v.empty() || !(std::isfinite(t.rmse) && std::isfinite(v.rmse)) ||
      !(v.rmse > 0.0))
    return {};
  const double ratio = t.rmse / v.rmse;
  if (!(ratio > o.test_validation_ratio)) return {};
  return {make_warning(
      DiagnosticCode::TestMuchWorseThanValidation,
      fmt::format(
          "The test RMSE ({:.3g}) is {:.1f} times the validation RMSE ({:.3g}): the model may be "
          "overfitted, or the test points differ from the training points (a leak, a drift, or "
          "setpoints unlike the others).",
          t.rmse, ratio, v.rmse),
      {}, ratio)};
}

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

std::vector<Warning> check_setpoints_per_coefficient(const Calibration& cal,
                                                     const DiagnosticOptions& o) {
  std::size_t ntr = 0;
  for (const SetpointResult& sp : cal.setpoints)
    if (sp.role == SetRole::Train) ++ntr;
  // Free coefficients: the model's terms, less the (0,0) term a fit through
  // the origin fixes (the one-input polynomial: degree + intercept).
  const SurfaceModel m = general_model(cal);
  const int coefs = static_cast<int>(m.terms.size()) - (cal.intercept ? 0 : 1);
  if (coefs <= 0) return {};
  const double per = static_cast<double>(ntr) / coefs;
  if (!(per < o.min_setpoints_per_coefficient)) return {};
  if (m.has_aux)
    return {make_warning(
        DiagnosticCode::FewSetpointsPerCoefficient,
        fmt::format("Only {} training setpoint groups for {} terms ({:.1f} per term, fewer "
                    "than {:g}): the model "
                    "between the groups is poorly constrained; add setpoints or levels of "
                    "the second input, or "
                    "use fewer terms.",
                    ntr, coefs, per, o.min_setpoints_per_coefficient),
        {}, per)};
  return {make_warning(
      DiagnosticCode::FewSetpointsPerCoefficient,
      fmt::format(
          "Only {} training setpoints for {} coefficients ({:.1f} per coefficient, fewer than "
          "{:g}): "
          "the curve between setpoints is poorly constrained; add setpoints or lower the degree.",
          ntr, coefs, per, o.min_setpoints_per_coefficient),
      {}, per)};
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
