#include "ridgecal/metrics.hpp"

#include <fmt/format.h>

#include <cassert>
#include <cmath>
#include <limits>

namespace ridgecal {

std::string Metrics::brief() const {
  if (n == 0) return "no points";
  // Figures that cannot be computed print as n/a, never as nan.
  const auto f = [](double v, const char* spec) {
    return std::isfinite(v) ? fmt::format(fmt::runtime(spec), v) : std::string("n/a");
  };
  return fmt::format("n={} RMSE={} max|err|={} bias={} R2={}", n, f(rmse, "{:.6g}"),
                     f(max_abs_error, "{:.6g}"), f(bias, "{:+.3g}"), f(r2, "{:.8f}"));
}

Metrics compute_metrics(const std::vector<double>& reference, const std::vector<double>& predicted,
                        int predictors, bool intercept) {
  assert(reference.size() == predicted.size());
  const double nan = std::numeric_limits<double>::quiet_NaN();
  Metrics m;
  m.n = reference.size();
  m.predictors = predictors;
  m.centered = intercept;
  if (m.n == 0) {
    m.rmse = m.max_abs_error = m.bias = m.r2 = m.adj_r2 = m.residual_sd = nan;
    return m;
  }
  long double ss_res = 0, sum_err = 0, sum_ref = 0;
  double max_abs = 0.0;
  for (std::size_t i = 0; i < m.n; ++i) {
    const long double e = static_cast<long double>(predicted[i]) - reference[i];
    ss_res += e * e;
    sum_err += e;
    sum_ref += reference[i];
    max_abs = std::max(max_abs, static_cast<double>(std::fabs(e)));
  }
  const long double n = static_cast<long double>(m.n);
  const long double mean_ref = intercept ? sum_ref / n : 0.0L;
  long double ss_tot = 0;
  for (double r : reference) ss_tot += (r - mean_ref) * (r - mean_ref);
  m.rmse = static_cast<double>(std::sqrt(ss_res / n));
  m.max_abs_error = max_abs;
  m.bias = static_cast<double>(sum_err / n);
  m.r2 = ss_tot > 0 ? static_cast<double>(1.0L - ss_res / ss_tot) : nan;
  const long double dof = n - predictors - (intercept ? 1 : 0);
  m.residual_sd = dof > 0 ? static_cast<double>(std::sqrt(ss_res / dof)) : nan;
  if (dof > 0 && ss_tot > 0) {
    const long double ratio = (intercept ? n - 1 : n) / dof;
    m.adj_r2 = static_cast<double>(1.0L - (ss_res / ss_tot) * ratio);
  } else {
    m.adj_r2 = nan;
  }
  return m;
}

}  // namespace ridgecal
