#include "ridgecal/surface_uncertainty.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cassert>
#include <cmath>
#include <limits>

namespace ridgecal {

namespace {
constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
}

// ---- SurfaceCovariance ----

SurfaceCovariance::SurfaceCovariance(const Calibration& cal)
    : model_(*cal.surface), intercept_(cal.intercept), lambda_(cal.lambda) {
  assert(cal.surface);
  std::vector<const PointResult*> tr;
  for (const PointResult& p : cal.points)
    if (p.role == SetRole::Train) tr.push_back(&p);
  n_ = tr.size();
  for (const Term& t : model_.terms)
    if (!(t == Term{0, 0})) cols_.push_back(t);
  // Residuals in reference units (the reported errors) and in the fitted output v.
  double rss_ref = 0.0, rss_v = 0.0;
  for (const PointResult* p : tr) {
    rss_ref += p->error * p->error;
    const double u = model_.transforms.input(p->reading);
    const double rv = model_.eval_fitted(u, p->aux) - model_.transforms.output(p->reference);
    rss_v += rv * rv;
  }
  df_ = intercept_ ? 1.0 : 0.0;
  const std::size_t p = cols_.size();
  if (n_ > 0 && p > 0) {
    SurfaceModel probe = model_;
    probe.terms = cols_;
    Eigen::MatrixXd X(static_cast<Eigen::Index>(n_), static_cast<Eigen::Index>(p));
    std::vector<double> row(p);
    for (std::size_t i = 0; i < n_; ++i) {
      const double t = model_.input.to_scaled(model_.transforms.input(tr[i]->reading));
      const double s = model_.has_aux ? model_.aux.to_scaled(tr[i]->aux) : 0.0;
      probe.basis_row(t, s, row.data());
      for (std::size_t q = 0; q < p; ++q)
        X(static_cast<Eigen::Index>(i), static_cast<Eigen::Index>(q)) = row[q];
    }
    mean_ = intercept_ ? Eigen::RowVectorXd(X.colwise().mean())
                       : Eigen::RowVectorXd::Zero(static_cast<Eigen::Index>(p));
    const Eigen::MatrixXd Xc = X.rowwise() - mean_;
    Eigen::JacobiSVD<Eigen::MatrixXd> svd(Xc, Eigen::ComputeThinV);
    V_ = svd.matrixV();
    s_ = svd.singularValues();
    const double smax = s_.size() ? s_(0) : 0.0;
    const double tol =
        smax * std::numeric_limits<double>::epsilon() * static_cast<double>(std::max(n_, p));
    const double nl = static_cast<double>(n_) * lambda_;
    for (Eigen::Index j = 0; j < s_.size(); ++j) {
      if (s_(j) > tol) ++rank_;
      if (s_(j) > tol || lambda_ > 0.0) df_ += s_(j) * s_(j) / (s_(j) * s_(j) + nl);
    }
    ok_ = true;
  }
  const double nd = static_cast<double>(n_);
  sigma_ref_ = nd > df_ + 1e-9 ? std::sqrt(rss_ref / (nd - df_)) : kNaN;
  sigma_v_ = nd > df_ + 1e-9 ? std::sqrt(rss_v / (nd - df_)) : kNaN;
}

bool SurfaceCovariance::projected(double reading, double aux, Eigen::VectorXd& w) const {
  const double u = model_.transforms.input(reading);
  if (!std::isfinite(u)) return false;
  SurfaceModel probe = model_;
  probe.terms = cols_;
  std::vector<double> row(cols_.size());
  probe.basis_row(model_.input.to_scaled(u), model_.has_aux ? model_.aux.to_scaled(aux) : 0.0,
                  row.data());
  const Eigen::Map<const Eigen::RowVectorXd> r(row.data(), static_cast<Eigen::Index>(row.size()));
  w = ((r - mean_) * V_).transpose();
  return true;
}

double SurfaceCovariance::variance_factor(double reading, double aux) const {
  if (!std::isfinite(model_.transforms.input(reading))) return kNaN;
  double v = intercept_ && n_ > 0 ? 1.0 / static_cast<double>(n_) : 0.0;
  if (!ok_) return v;
  Eigen::VectorXd w;
  if (!projected(reading, aux, w)) return kNaN;
  const double nl = static_cast<double>(n_) * lambda_;
  for (Eigen::Index j = 0; j < s_.size(); ++j) {
    if (j >= rank_ && lambda_ == 0.0) continue;
    const double g = s_(j) / (s_(j) * s_(j) + nl);
    v += w(j) * w(j) * g * g;
  }
  return v;
}

double SurfaceCovariance::leverage(double reading, double aux) const {
  if (!std::isfinite(model_.transforms.input(reading))) return kNaN;
  double h = intercept_ && n_ > 0 ? 1.0 / static_cast<double>(n_) : 0.0;
  if (!ok_) return h;
  Eigen::VectorXd w;
  if (!projected(reading, aux, w)) return kNaN;
  const double nl = static_cast<double>(n_) * lambda_;
  for (Eigen::Index j = 0; j < s_.size(); ++j) {
    if (j >= rank_ && lambda_ == 0.0) continue;
    h += w(j) * w(j) / (s_(j) * s_(j) + nl);
  }
  return h;
}

double SurfaceCovariance::output_sensitivity(double reading, double aux) const {
  if (model_.transforms.reference == ReferenceTransform::None) return 1.0;
  const double u = model_.transforms.input(reading);
  if (!std::isfinite(u)) return kNaN;
  // reciprocal-kelvin: y = 1/v - offset, dy/dv = -1/v^2.
  const double v = model_.eval_fitted(u, aux);
  return 1.0 / (v * v);
}

double SurfaceCovariance::u_fit(double reading, double aux) const {
  const double s = std::isfinite(sigma_v_) ? sigma_v_ : 0.0;
  return output_sensitivity(reading, aux) * s * std::sqrt(variance_factor(reading, aux));
}

// ---- SurfaceUncertainty ----

double SurfaceUncertainty::reading_sensitivity(double reading, double aux) const {
  const SurfaceModel& m = cov_.model();
  // Step: a small fraction of the magnitude (at least of 1 reading unit), so
  // counts, ohms and volts alike get a central difference well inside the domain.
  const double h = 1e-6 * std::max(1.0, std::fabs(reading));
  const double hi = m.eval(reading + h, aux), lo = m.eval(reading - h, aux);
  if (std::isfinite(hi) && std::isfinite(lo)) return std::fabs(hi - lo) / (2.0 * h);
  const double c = m.eval(reading, aux);
  if (std::isfinite(hi) && std::isfinite(c)) return std::fabs(hi - c) / h;
  if (std::isfinite(lo) && std::isfinite(c)) return std::fabs(c - lo) / h;
  return kNaN;
}

double SurfaceUncertainty::combined_at(double reading, double aux) const {
  const double uf = cov_.u_fit(reading, aux);
  const double ures = options_.resolution > 0.0 ? reading_sensitivity(reading, aux) *
                                                      options_.resolution / (2.0 * std::sqrt(3.0))
                                                : 0.0;
  return std::sqrt(s_ * s_ + uf * uf + u_ref_ * u_ref_ + ures * ures);
}

double SurfaceUncertainty::expanded_at(double reading, double aux) const {
  return options_.coverage_k * combined_at(reading, aux);
}

SurfaceUncertainty::SurfaceUncertainty(const Calibration& cal, const UncertaintyOptions& options,
                                       int aux_points)
    : options_(options), cov_(cal) {
  assert(cal.surface && options.validate().empty() && aux_points >= 2);
  const SurfaceModel& m = cov_.model();
  const double s = cov_.residual_sd();
  s_ = std::isfinite(s) ? s : 0.0;
  u_ref_ = options.reference_uncertainty / options.reference_k;
  const double res_div = 2.0 * std::sqrt(3.0);
  UncertaintyBudget& b = budget_;
  b.k = options.coverage_k;
  b.residual_sd = s;
  b.degrees_of_freedom = cov_.dof();

  // The calibrated region in raw readings: the training readings' range (the
  // model's input scaling is over the transformed reading u).
  double x_min = kNaN, x_max = kNaN;
  for (const PointResult& p : cal.points)
    if (p.role == SetRole::Train && std::isfinite(p.reading)) {
      x_min = std::isfinite(x_min) ? std::min(x_min, p.reading) : p.reading;
      x_max = std::isfinite(x_max) ? std::max(x_max, p.reading) : p.reading;
    }
  const int na = m.has_aux ? aux_points : 1;
  auto aux_at = [&](int j) {
    if (!m.has_aux) return 0.0;
    return j == na - 1 ? m.aux.max : m.aux.min + (m.aux.max - m.aux.min) * j / (na - 1);
  };
  const double aux_mid = m.has_aux ? 0.5 * (m.aux.min + m.aux.max) : 0.0;
  double max_ufit = 0.0, max_slope = 0.0;
  if (std::isfinite(x_min)) {
    const int nb = options.band_points;
    for (int i = 0; i < nb; ++i) {
      BandPoint bp;
      bp.reading = i == nb - 1 ? x_max : x_min + (x_max - x_min) * i / (nb - 1);
      bp.predicted = m.eval(bp.reading, aux_mid);
      // Largest over the aux range at this reading.
      for (int j = 0; j < na; ++j) {
        const double a = aux_at(j);
        const double uf = cov_.u_fit(bp.reading, a);
        const double slope = reading_sensitivity(bp.reading, a);
        if (std::isfinite(uf)) max_ufit = std::max(max_ufit, uf);
        if (std::isfinite(slope)) max_slope = std::max(max_slope, slope);
        const double comb = combined_at(bp.reading, a);
        if (std::isfinite(comb) && comb >= bp.combined) {
          bp.combined = comb;
          bp.u_fit = uf;
        }
      }
      bp.expanded = b.k * bp.combined;
      if (b.band.empty() || bp.reading > b.band.back().reading) b.band.push_back(bp);
    }
    // The slope can peak between band points: refine on a finer grid.
    for (int i = 0; i <= 400; ++i)
      for (int j = 0; j < na; ++j) {
        const double slope = reading_sensitivity(x_min + (x_max - x_min) * i / 400.0, aux_at(j));
        if (std::isfinite(slope)) max_slope = std::max(max_slope, slope);
      }
  }
  const std::string where =
      m.has_aux ? "over the calibrated (reading, aux) region" : "over the calibrated range";
  b.components.push_back({"fit-residual", EvaluationType::A, Distribution::Normal, s_, 1.0, 1.0, s_,
                          fmt::format("residual standard deviation of the {} training points, "
                                      "{:.3g} degrees of freedom (n minus "
                                      "effective parameters)",
                                      cov_.n(), cov_.dof())});
  b.components.push_back(
      {"fit-coefficients", EvaluationType::A, Distribution::Normal, max_ufit, 1.0, 1.0, max_ufit,
       fmt::format("largest standard deviation of the fitted model {}, from the {} covariance of "
                   "the design rows "
                   "of its {} terms{}",
                   where, cal.lambda > 0.0 ? "ridge sandwich" : "least-squares", m.terms.size(),
                   cal.lambda > 0.0 ? " (shrinkage bias not included)" : "")});
  b.components.push_back(
      {"reference-standard", EvaluationType::B, Distribution::Normal, options.reference_uncertainty,
       options.reference_k, 1.0, u_ref_,
       options.reference_k == 1.0
           ? "standard uncertainty of the reference as stated by the user"
           : fmt::format("expanded uncertainty of the reference as stated by the user, k = {:g}",
                         options.reference_k)});
  b.components.push_back(
      {"reading-resolution", EvaluationType::B, Distribution::Rectangular, options.resolution,
       res_div, max_slope,
       options.resolution > 0.0 ? max_slope * options.resolution / res_div : 0.0,
       "one digit step of the reading, rectangular, through the largest slope d reference / d "
       "reading (whole transform chain) " +
           where});
  double sum = 0.0;
  for (const UncertaintyComponent& c : b.components) sum += c.standard * c.standard;
  b.combined = std::sqrt(sum);
  b.expanded = b.k * b.combined;
  b.band_method = fmt::format(
      "U(x, a) = k*sqrt(s^2 + u_fit(x, a)^2 + u_ref^2 + u_res(x, a)^2); u_fit from the {} "
      "covariance of the centred "
      "design rows (SurfaceModel::basis_row of the terms other than (0,0)) in the fitted output, "
      "times |d reference / "
      "d v|{}. {}",
      cal.lambda > 0.0 ? "ridge sandwich s_v^2 V diag(s_j^2/(s_j^2+n*lambda)^2) V'"
                       : "least-squares s_v^2 (Xc'Xc)^-1",
      cal.lambda > 0.0 ? " (approximation: ignores the shrinkage bias)" : "",
      m.has_aux ? fmt::format(
                      "Band: at each reading the largest U over {} aux values from {:g} to {:g}; "
                      "predicted "
                      "at aux {:g}. Guarded acceptance uses U at each point's own (reading, aux).",
                      na, m.aux.min, m.aux.max, aux_mid)
                : std::string("Band over the calibrated readings."));
}

}  // namespace ridgecal
