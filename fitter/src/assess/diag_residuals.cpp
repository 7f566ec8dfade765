// Checks of the residuals: a systematic pattern (runs test). (Outliers are the
// calibrated check of calibrated_checks.cpp.)
#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <map>

#include "ridgecal/diag_common.hpp"
#include "ridgecal/diagnostics.hpp"

namespace ridgecal {

using detail::make_warning;

double runs_test_z(const std::vector<double>& values) {
  std::vector<int> signs;
  for (double v : values)
    if (v > 0)
      signs.push_back(1);
    else if (v < 0)
      signs.push_back(-1);
  double n1 = 0, n2 = 0;
  for (int sg : signs) (sg > 0 ? n1 : n2) += 1;
  if (n1 < 2 || n2 < 2) return detail::kDiagNaN;
  double runs = 1;
  for (std::size_t i = 1; i < signs.size(); ++i)
    if (signs[i] != signs[i - 1]) runs += 1;
  const double n = n1 + n2;
  const double mu = 2 * n1 * n2 / n + 1;
  const double var = 2 * n1 * n2 * (2 * n1 * n2 - n) / (n * n * (n - 1));
  if (!(var > 0)) return detail::kDiagNaN;
  return (runs - mu) / std::sqrt(var);
}

std::vector<Warning> check_residual_runs(const Calibration& cal, const DiagnosticOptions& o) {
  // Ordered along one input: not defined for a model with an aux input.
  if (general_model(cal).has_aux) return {};
  // Mean residual per training setpoint, in order of reading (repeats at one
  // setpoint would otherwise form runs of their own).
  std::map<std::string, std::pair<double, int>> by_id;
  for (const PointResult& p : cal.points)
    if (p.role == SetRole::Train) {
      auto& e = by_id[p.setpoint];
      e.first += p.error;
      e.second += 1;
    }
  std::vector<double> seq;
  for (const SetpointResult& sp : cal.setpoints) {
    const auto it = by_id.find(sp.id);
    if (sp.role == SetRole::Train && it != by_id.end())
      seq.push_back(it->second.first / it->second.second);
  }
  if (seq.size() < o.runs_min_setpoints) return {};
  const double z = runs_test_z(seq);
  if (!(z < -o.runs_z)) return {};
  double rms = 0;
  for (double v : seq) rms += v * v;
  rms = std::sqrt(rms / static_cast<double>(seq.size()));
  return {make_warning(
      DiagnosticCode::ResidualPattern,
      fmt::format(
          "The residuals of the {} training setpoints (RMS {:.3g}) change sign less often than "
          "chance allows (runs test z = {:.2f}): a systematic pattern, a sign that the curve "
          "underfits; consider a higher degree or a smaller lambda.",
          seq.size(), rms, z),
      {}, z)};
}

}  // namespace ridgecal
