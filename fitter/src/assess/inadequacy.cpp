// The model-inadequacy term of the uncertainty budget (uncertainty.hpp,
// estimate_inadequacy). Method and source: docs/decision-and-uncertainty.md,
// "Model inadequacy".
//
// Evidence, one item per setpoint, all out of sample:
//  * a training setpoint j with m_j readings at (nearly) one reading x_j,
//    mean error e_j of the final fit and single-point leverage h_j: the mean
//    error with the whole setpoint left out of the fit is
//      d_j = e_j / (1 - m_j h_j)
//    (the group-deletion identity of linear smoothers with a fixed penalty:
//    the hat-matrix block of m identical rows is h 1 1'), with variance from
//    the pure error s_p^2 (pooled scatter of the repeats) alone
//      v_j = s_p^2 / (m_j (1 - m_j h_j));
//    a setpoint that pins the curve (m h > 0.99) gives no usable evidence;
//  * a test setpoint: its mean error d_j, v_j = s_p^2 / m_j + u_fit(x_j)^2.
// b_j^2 = d_j^2 - v_j estimates the squared systematic error of a curve that
// has to bridge a gap at x_j: the error the family makes between setpoints.
// The budget's fit-residual term s already carries s^2 - s_p^2 of pooled
// in-sample lack of fit, which is taken off. Each setpoint's value is the
// largest b_j^2 of itself and its neighbours (a local envelope: the family's
// error peaks between setpoints), clipped at 0; u^2 is interpolated linearly
// along the reading. With an aux input: one figure, the mean of the b_j^2.
//
// Gate: the term enters only when the lack-of-fit F test of the final model
// (lack_of_fit.hpp) rejects at `alpha`: where the repeats give no evidence
// of inadequacy, the clipped estimate would only add noise to U.
#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "ridgecal/lack_of_fit.hpp"
#include "ridgecal/repeat_groups.hpp"
#include "ridgecal/uncertainty.hpp"

namespace ridgecal {

namespace {
constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
/// A setpoint whose group leverage m h exceeds this pins the curve: its
/// deleted error is an extrapolation with a variance 20 times the pure
/// error's, too noisy to use (our judgement).
constexpr double kMaxGroupLeverage = 0.99;
}  // namespace

double ModelInadequacy::at(double reading) const {
  if (!included) return 0.0;
  if (nodes.empty()) return uniform;
  if (reading <= nodes.front().reading) return nodes.front().standard;
  if (reading >= nodes.back().reading) return nodes.back().standard;
  const auto it = std::lower_bound(nodes.begin(), nodes.end(), reading,
                                   [](const InadequacyNode& n, double x) { return n.reading < x; });
  const InadequacyNode& hi = *it;
  const InadequacyNode& lo = *(it - 1);
  const double f = (reading - lo.reading) / (hi.reading - lo.reading);
  const double v =
      lo.standard * lo.standard + f * (hi.standard * hi.standard - lo.standard * lo.standard);
  return std::sqrt(std::max(v, 0.0));
}

double ModelInadequacy::largest() const {
  if (!included) return 0.0;
  double u = uniform;
  for (const InadequacyNode& n : nodes) u = std::max(u, n.standard);
  return u;
}

ModelInadequacy estimate_inadequacy(const Calibration& cal, const FitCovariance& cov,
                                    double residual_sd, double alpha) {
  ModelInadequacy r;
  r.alpha = alpha;
  const bool has_aux = cov.model().has_aux;
  const std::vector<detail::RepeatGroup> groups =
      detail::training_groups(Dataset{}, cal, /*with_test=*/true);
  struct Evidence {
    double reading, b2, deleted, noise_var_factor, fit_var;
  };
  std::vector<Evidence> ev;
  double ss_pure = 0.0, df_pure = 0.0;
  std::size_t train_groups = 0, test_evidence = 0;
  for (const detail::RepeatGroup& g : groups) {
    const bool test = cal.points[g.points.front()].role != SetRole::Train;
    const double m = static_cast<double>(g.points.size());
    double mean_e = 0.0, mean_x = 0.0, mean_h = 0.0, mean_aux = 0.0;
    for (std::size_t i : g.points) {
      const PointResult& p = cal.points[i];
      mean_e += p.error / m;
      mean_x += p.reading / m;
      mean_aux += (has_aux ? p.aux : 0.0) / m;
      if (!test) mean_h += cov.leverage(p.reading, has_aux ? p.aux : 0.0) / m;
    }
    double ss = 0.0;
    for (std::size_t i : g.points)
      ss += (cal.points[i].error - mean_e) * (cal.points[i].error - mean_e);
    if (!std::isfinite(mean_e)) continue;
    if (test) {
      // A test setpoint is out of sample already: its mean error's variance
      // is the pure error's over m plus the curve's own (u_fit).
      const double uf = cov.u_fit(mean_x, mean_aux);
      ev.push_back({mean_x, 0.0, mean_e, m, std::isfinite(uf) ? uf * uf : 0.0});
      ++test_evidence;
      continue;
    }
    ++train_groups;
    ss_pure += ss;
    df_pure += m - 1.0;
    const double keep = 1.0 - m * mean_h;
    if (!std::isfinite(keep) || keep < 1.0 - kMaxGroupLeverage) continue;
    ev.push_back({mean_x, 0.0, mean_e / keep, keep * m, 0.0});
  }
  r.df_pure = df_pure;
  if (!(df_pure >= 2.0) || train_groups < 3 || ev.size() < 2) {
    r.reason =
        "not estimated: it needs at least 3 training setpoints and 2 degrees of freedom "
        "of repeats";
    return r;
  }
  r.pure_sd = std::sqrt(ss_pure / df_pure);
  r.estimated = true;
  const double sp2 = r.pure_sd * r.pure_sd;
  const double s = std::isfinite(residual_sd) ? residual_sd : 0.0;
  const double carried = std::max(s * s - sp2, 0.0);
  for (Evidence& e : ev) {
    const double v = sp2 / e.noise_var_factor + e.fit_var;
    e.b2 = e.deleted * e.deleted - v - carried;
  }
  const LackOfFit lof = lack_of_fit_test(Dataset{}, cal, alpha > 0.0 ? alpha : 0.05);
  r.lack_of_fit_p = lof.computed ? lof.p : kNaN;
  if (has_aux) {
    double sum = 0.0;
    for (const Evidence& e : ev) sum += e.b2;
    r.uniform = std::sqrt(std::max(sum / static_cast<double>(ev.size()), 0.0));
  } else {
    std::sort(ev.begin(), ev.end(),
              [](const Evidence& a, const Evidence& b) { return a.reading < b.reading; });
    const std::size_t n = ev.size();
    for (std::size_t j = 0; j < n; ++j) {
      // The local envelope: the largest estimate of the setpoint and its neighbours.
      double sum = ev[j].b2;
      if (j > 0) sum = std::max(sum, ev[j - 1].b2);
      if (j + 1 < n) sum = std::max(sum, ev[j + 1].b2);
      const double w = 1.0;
      InadequacyNode node;
      node.reading = ev[j].reading;
      node.deleted = ev[j].deleted;
      node.noise_sd = std::sqrt(sp2 / ev[j].noise_var_factor + ev[j].fit_var);
      node.standard = std::sqrt(std::max(sum / w, 0.0));
      if (r.nodes.empty() || node.reading > r.nodes.back().reading) r.nodes.push_back(node);
    }
  }
  if (!(alpha > 0.0)) {
    r.reason = "estimated but not included: the term is turned off (inadequacy_alpha = 0)";
  } else if (!lof.computed) {
    r.reason = "estimated but not included: the lack-of-fit test could not run";
  } else if (lof.p < alpha) {
    r.included = true;
    r.reason = fmt::format(
        "included: the lack-of-fit test rejects the model (p = {:.2g} < {:g}); from the "
        "out-of-sample errors of {} training setpoints (each left out in turn) and {} test "
        "setpoints against a pure error of {:.3g}",
        lof.p, alpha, ev.size() - test_evidence, test_evidence, r.pure_sd);
  } else {
    r.reason =
        fmt::format("not included: the lack-of-fit test finds no inadequacy (p = {:.2g} >= {:g})",
                    lof.p, alpha);
  }
  return r;
}

}  // namespace ridgecal
