#include "ridgecal/calibration.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cassert>
#include <cmath>
#include <limits>
#include <memory>
#include <stdexcept>

#include "ridgecal/extended_fit.hpp"
#include "ridgecal/fit_model.hpp"

namespace ridgecal {

std::string to_string(SelectionRule r) {
  return r == SelectionRule::MinCv ? "min-cv" : "one-se";
}
SelectionRule selection_rule_from_string(const std::string& s) {
  if (s == "min-cv") return SelectionRule::MinCv;
  if (s == "one-se") return SelectionRule::OneSe;
  throw std::invalid_argument("selection rule must be 'min-cv' or 'one-se', got '" + s + "'");
}

std::string to_string(SelectionMode m) {
  return m == SelectionMode::CrossValidation ? "cv" : "fixed";
}
SelectionMode selection_mode_from_string(const std::string& s) {
  if (s == "cv") return SelectionMode::CrossValidation;
  if (s == "fixed") return SelectionMode::Fixed;
  throw std::invalid_argument("selection mode must be 'cv' or 'fixed', got '" + s + "'");
}

int choose_cell(const std::vector<GridCell>& grid, SelectionRule rule) {
  int best = -1;
  for (std::size_t i = 0; i < grid.size(); ++i)
    if (!std::isnan(grid[i].cv_rmse) &&
        (best < 0 || grid[i].cv_rmse < grid[static_cast<std::size_t>(best)].cv_rmse))
      best = static_cast<int>(i);
  if (best < 0 || rule != SelectionRule::OneSe) return best;
  const double limit =
      grid[static_cast<std::size_t>(best)].cv_rmse + grid[static_cast<std::size_t>(best)].cv_se;
  int pick = best;
  for (std::size_t i = 0; i < grid.size(); ++i) {
    const GridCell& c = grid[i];
    if (!(c.cv_rmse <= limit)) continue;
    const GridCell& p = grid[static_cast<std::size_t>(pick)];
    if (c.terms < p.terms || (c.terms == p.terms && c.lambda > p.lambda))
      pick = static_cast<int>(i);
  }
  return pick;
}

std::vector<double> default_lambda_grid() {
  std::vector<double> g{0.0};
  const int count = 30;
  for (int i = 0; i < count; ++i) g.push_back(std::pow(10.0, -12.0 + 13.0 * i / (count - 1)));
  return g;
}

namespace {
constexpr int kMaxDegree = 20;
// The largest penalty accepted. Lambda is dimensionless (O(1) Chebyshev
// columns, a mean-square data term): above about 1e3 every coefficient but the
// intercept is already shrunk to nothing, and far larger values overflow n *
// lambda. 1e6 leaves three decades of margin.
constexpr double kMaxLambda = 1e6;
}  // namespace

std::string FitOptions::validate() const {
  if (fixed_degree.has_value() != fixed_lambda.has_value())
    return "fixed_degree and fixed_lambda go together; give both or neither";
  if (fixed_degree) {
    if (*fixed_degree < (intercept ? 0 : 1) || *fixed_degree > kMaxDegree)
      return fmt::format("fixed_degree is {}; it must be between {} and {}", *fixed_degree,
                         intercept ? 0 : 1, kMaxDegree);
    if (!(*fixed_lambda >= 0.0 && *fixed_lambda <= kMaxLambda))
      return fmt::format(
          "fixed_lambda is {}; it must be between 0 and {:g} (a penalty above about 1e3 already "
          "shrinks the curve to a constant)",
          *fixed_lambda, kMaxLambda);
  } else {
    if (degrees.empty()) return "degrees is empty; give at least one candidate degree";
    for (int d : degrees)
      if (d < 1 || d > kMaxDegree)
        return fmt::format("degrees contains {}; every candidate degree must be between 1 and {}",
                           d, kMaxDegree);
    if (lambdas.empty()) return "lambdas is empty; give at least one candidate penalty";
    for (double l : lambdas)
      if (!(l >= 0.0 && l <= kMaxLambda))
        return fmt::format(
            "lambdas contains {}; every penalty must be between 0 and {:g} (a penalty above about "
            "1e3 already shrinks the curve to a constant)",
            l, kMaxLambda);
  }
  return split.validate();
}

FitOutcome fit_calibration(const Dataset& data, const FitOptions& options) {
  // The plain one-input polynomial: the one fit with no extension (fit_model.hpp).
  return fit_model(data, options, ExtendedOptions{});
}

bool is_extended(const Calibration& cal) {
  return !is_one_input_polynomial(cal.model);
}

std::string Calibration::brief() const {
  std::string s;
  if (is_extended(*this))
    s += extended_brief(*this);
  else {
    const int degree = one_input_polynomial(model).degree();
    if (selection.mode == SelectionMode::Fixed)
      s += fmt::format("model: degree {}, lambda {:g} (fixed by the user)\n", degree, lambda);
    else
      s += fmt::format(
          "model: degree {}, lambda {:g} (chosen by {} grouped CV over {} folds, rule {})\n",
          degree, lambda, to_string(selection.scheme), selection.n_folds,
          to_string(selection.rule));
    s += fmt::format("range: reading {:g} .. {:g}\n", model.input.min, model.input.max);
  }
  std::size_t ntr = 0, nte = 0;
  for (const auto& sp : setpoints) (sp.role == SetRole::Train ? ntr : nte)++;
  s += fmt::format("setpoints: {} training, {} test{}\n", ntr, nte,
                   user_named_test ? " (named by the role column)" : "");
  s += "training:   " + training.brief() + "\n";
  s += "validation: " + validation.brief() + "\n";
  s += "test:       " + test.brief() + "\n";
  return s;
}

std::string Calibration::full() const {
  std::string s = brief();
  // Non-finite figures print as n/a (never nan or inf).
  const auto g = [](double v, const char* spec) {
    return std::isfinite(v) ? fmt::format(fmt::runtime(spec), v) : std::string("n/a");
  };
  if (is_extended(*this))
    s += extended_full(*this);
  else {
    const PolyModel p = one_input_polynomial(model);
    s += "chebyshev coefficients (scaled reading t):";
    for (double c : p.cheb) s += " " + g(c, "{:.17g}");
    s += "\npower coefficients (raw reading x):";
    for (double c : p.power_in_x()) s += " " + g(c, "{:.17g}");
  }
  s += "\ncondition number: " + g(condition_number, "{:.3g}") + "\n";
  for (const auto& note : selection.notes) s += "note: " + note + "\n";
  return s;
}

}  // namespace ridgecal
