#include "ridgecal/uncertainty.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cassert>
#include <cmath>
#include <limits>
#include <stdexcept>

#include "ridgecal/json_read.hpp"

namespace ridgecal {

namespace {
constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
}

std::string UncertaintyOptions::validate() const {
  auto bad = [](double v) { return !(std::isfinite(v) && v >= 0.0); };
  if (bad(reference_uncertainty))
    return fmt::format("reference_uncertainty is {}; it must be a finite number >= 0",
                       reference_uncertainty);
  if (!(std::isfinite(reference_k) && reference_k >= 1.0 && reference_k <= 10.0))
    return fmt::format("reference_k is {}; it must be between 1 (a standard uncertainty) and 10",
                       reference_k);
  if (bad(resolution))
    return fmt::format("resolution is {}; it must be a finite number >= 0", resolution);
  if (!(std::isfinite(coverage_k) && coverage_k >= 1.0 && coverage_k <= 10.0))
    return fmt::format("coverage_k is {}; it must be between 1 and 10", coverage_k);
  if (band_points < 2 || band_points > 1001)
    return fmt::format("band_points is {}; it must be between 2 and 1001", band_points);
  if (!(std::isfinite(inadequacy_alpha) && inadequacy_alpha >= 0.0 && inadequacy_alpha <= 0.5))
    return fmt::format(
        "inadequacy_alpha is {}; it must be between 0 (no model-inadequacy term) and 0.5",
        inadequacy_alpha);
  return {};
}

std::string to_string(EvaluationType t) {
  return t == EvaluationType::A ? "A" : "B";
}
EvaluationType evaluation_type_from_string(const std::string& s) {
  if (s == "A") return EvaluationType::A;
  if (s == "B") return EvaluationType::B;
  throw std::invalid_argument("evaluation type must be 'A' or 'B', got '" + s + "'");
}

std::string to_string(Distribution d) {
  return d == Distribution::Normal ? "normal" : "rectangular";
}
Distribution distribution_from_string(const std::string& s) {
  if (s == "normal") return Distribution::Normal;
  if (s == "rectangular") return Distribution::Rectangular;
  throw std::invalid_argument("distribution must be 'normal' or 'rectangular', got '" + s + "'");
}

// ---- FitCovariance ----

FitCovariance::FitCovariance(const Calibration& cal)
    : model_(general_model(cal)), intercept_(cal.intercept), lambda_(cal.lambda) {
  std::vector<const PointResult*> tr;
  for (const PointResult& p : cal.points)
    if (p.role == SetRole::Train) tr.push_back(&p);
  n_ = tr.size();
  columns_ = model_;
  columns_.terms.clear();
  for (const Term& t : model_.terms)
    if (!(t == Term{0, 0})) columns_.terms.push_back(t);
  columns_.coefficients.assign(columns_.terms.size(), 0.0);
  const std::size_t p = columns_.terms.size();
  if (!intercept_ && p > 0) {
    // Through the origin the columns are B(t) - B(t0), t0 the scaled reading 0.
    origin_.assign(p, 0.0);
    columns_.basis_row(model_.input.to_scaled(model_.transforms.input(0.0)), 0.0, origin_.data());
  }
  // Residuals in reference units (the reported errors) and in the fitted output v.
  double rss_ref = 0.0, rss_v = 0.0;
  for (const PointResult* q : tr) {
    rss_ref += q->error * q->error;
    const double rv = fitted_residual(*q);
    rss_v += rv * rv;
  }
  df_ = intercept_ ? 1.0 : 0.0;
  if (n_ > 0 && p > 0) {
    Eigen::MatrixXd X(static_cast<Eigen::Index>(n_), static_cast<Eigen::Index>(p));
    std::vector<double> row(p);
    for (std::size_t i = 0; i < n_; ++i) {
      design_row(tr[i]->reading, tr[i]->aux, row.data());
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

double FitCovariance::fitted_residual(const PointResult& p) const {
  // Without a reference transform v is the reference itself: the error, as reported.
  if (model_.transforms.reference == ReferenceTransform::None) return p.error;
  return model_.eval_fitted(model_.transforms.input(p.reading), p.aux) -
         model_.transforms.output(p.reference);
}

bool FitCovariance::design_row(double reading, double aux, double* out) const {
  const double u = model_.transforms.input(reading);
  if (!std::isfinite(u)) return false;
  columns_.basis_row(model_.input.to_scaled(u), model_.has_aux ? model_.aux.to_scaled(aux) : 0.0,
                     out);
  for (std::size_t q = 0; q < origin_.size(); ++q) out[q] = out[q] - origin_[q];
  return true;
}

bool FitCovariance::projected(double reading, double aux, Eigen::VectorXd& w) const {
  std::vector<double> row(columns_.terms.size());
  if (!design_row(reading, aux, row.data())) return false;
  const Eigen::Map<const Eigen::RowVectorXd> r(row.data(), static_cast<Eigen::Index>(row.size()));
  w = ((r - mean_) * V_).transpose();
  return true;
}

double FitCovariance::variance_factor(double reading, double aux) const {
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

double FitCovariance::leverage(double reading, double aux) const {
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

double FitCovariance::output_sensitivity(double reading, double aux) const {
  if (model_.transforms.reference == ReferenceTransform::None) return 1.0;
  const double u = model_.transforms.input(reading);
  if (!std::isfinite(u)) return kNaN;
  // reciprocal-kelvin: y = 1/v - offset, dy/dv = -1/v^2.
  const double v = model_.eval_fitted(u, aux);
  return 1.0 / (v * v);
}

double FitCovariance::u_fit(double reading, double aux) const {
  const double s = std::isfinite(sigma_v_) ? sigma_v_ : 0.0;
  return output_sensitivity(reading, aux) * s * std::sqrt(variance_factor(reading, aux));
}

// ---- budget ----

double UncertaintyBudget::expanded_at(double reading) const {
  if (band.empty()) return expanded;
  if (reading <= band.front().reading) return band.front().expanded;
  if (reading >= band.back().reading) return band.back().expanded;
  const auto it = std::lower_bound(band.begin(), band.end(), reading,
                                   [](const BandPoint& b, double x) { return b.reading < x; });
  const BandPoint& hi = *it;
  const BandPoint& lo = *(it - 1);
  const double f = (reading - lo.reading) / (hi.reading - lo.reading);
  return lo.expanded + f * (hi.expanded - lo.expanded);
}

namespace {
// Screen text never shows nan or inf: a figure that overflowed reads "n/a".
std::string shown_3g(double v) {
  return std::isfinite(v) ? fmt::format("{:.3g}", v) : std::string("n/a");
}
}  // namespace

std::string UncertaintyBudget::brief(const std::string& unit) const {
  const std::string u = unit.empty() ? "" : " " + unit;
  std::string s = fmt::format("uncertainty: U = {}{} (k = {:g}), combined standard u = {}{}\n",
                              shown_3g(expanded), u, k, shown_3g(combined), u);
  for (const UncertaintyComponent& c : components)
    s += fmt::format("  {:<19} {}{} (type {}, {})\n", c.name, shown_3g(c.standard), u,
                     to_string(c.type), to_string(c.distribution));
  return s;
}

std::string UncertaintyBudget::full(const std::string& unit) const {
  std::string s = brief(unit);
  for (const UncertaintyComponent& c : components) s += fmt::format("  {}: {}\n", c.name, c.note);
  s += "  band: " + band_method + "\n";
  for (const BandPoint& p : band)
    s += fmt::format("    reading {:<12g} value {:<12.6g} u_fit {:<10.3g} U {:.3g}\n", p.reading,
                     p.predicted, p.u_fit, p.expanded);
  return s;
}

// ---- UncertaintyEvaluator ----

double UncertaintyEvaluator::reading_sensitivity(double reading, double aux) const {
  const Model& m = cov_.model();
  if (m.transforms.identity() && !m.has_aux) {
    // A polynomial in the reading alone: its exact derivative,
    // d/dx sum m_k t^k = (1/h) sum k m_k t^(k-1) (as PolyModel::derivative).
    const double t = m.input.to_scaled(reading);
    double d = 0.0;
    for (std::size_t k = monomial_.size(); k-- > 1;)
      d = d * t + static_cast<double>(k) * monomial_[k][0];
    return std::fabs(d / m.input.half_width);
  }
  // Transforms or an aux input: a central difference through the whole chain.
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

double UncertaintyEvaluator::combined_at(double reading, double aux) const {
  const double uf = cov_.u_fit(reading, aux);
  const double ures = options_.resolution > 0.0 ? reading_sensitivity(reading, aux) *
                                                      options_.resolution / (2.0 * std::sqrt(3.0))
                                                : 0.0;
  const double ui = budget_.inadequacy.at(reading);
  return std::sqrt(s_ * s_ + uf * uf + u_ref_ * u_ref_ + ures * ures + ui * ui);
}

double UncertaintyEvaluator::combined_without_inadequacy_at(double reading, double aux) const {
  const double c = combined_at(reading, aux), ui = budget_.inadequacy.at(reading);
  return std::sqrt(std::max(c * c - ui * ui, 0.0));
}

double UncertaintyEvaluator::expanded_at(double reading, double aux) const {
  if (!cov_.model().has_aux) return budget_.expanded_at(reading);
  return options_.coverage_k * combined_at(reading, aux);
}

UncertaintyEvaluator::UncertaintyEvaluator(const Calibration& cal,
                                           const UncertaintyOptions& options, int aux_points)
    : options_(options), cov_(cal) {
  assert(options.validate().empty() && aux_points >= 2);
  const Model& m = cov_.model();
  monomial_ = m.monomial_in_scaled();
  const double s = cov_.residual_sd();
  s_ = std::isfinite(s) ? s : 0.0;
  u_ref_ = options.reference_uncertainty / options.reference_k;
  const double res_div = 2.0 * std::sqrt(3.0);
  UncertaintyBudget& b = budget_;
  b.k = options.coverage_k;
  b.residual_sd = s;
  b.degrees_of_freedom = cov_.dof();
  b.inadequacy = estimate_inadequacy(cal, cov_, s, options.inadequacy_alpha);

  // The calibrated region in raw readings: the training readings' range (the
  // model's input scaling is over the transformed reading u); a model without
  // training points (built by hand) falls back to its input range when the
  // transforms are the identity.
  double x_min = kNaN, x_max = kNaN;
  for (const PointResult& p : cal.points)
    if (p.role == SetRole::Train && std::isfinite(p.reading)) {
      x_min = std::isfinite(x_min) ? std::min(x_min, p.reading) : p.reading;
      x_max = std::isfinite(x_max) ? std::max(x_max, p.reading) : p.reading;
    }
  if (!std::isfinite(x_min) && m.transforms.identity()) {
    x_min = m.input.min;
    x_max = m.input.max;
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
      // Largest over the aux range at this reading (the reading itself without aux).
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
          bp.u_inadequacy = b.inadequacy.at(bp.reading);
        }
      }
      bp.expanded = b.k * bp.combined;
      if (b.band.empty() || bp.reading > b.band.back().reading) b.band.push_back(bp);
    }
    // The slope can peak between band points: refine on a finer grid.
    for (int i = 0; i <= 1000; ++i)
      for (int j = 0; j < na; ++j) {
        const double slope = reading_sensitivity(x_min + (x_max - x_min) * i / 1000.0, aux_at(j));
        if (std::isfinite(slope)) max_slope = std::max(max_slope, slope);
      }
  }
  // The wording of the notes: the one-input polynomial keeps its own (the
  // record's text for that layout); extended fits name terms and transforms.
  const bool extended = is_extended(cal);
  const std::string where =
      m.has_aux ? "over the calibrated (reading, aux) region" : "over the calibrated range";
  b.components.push_back({"fit-residual", EvaluationType::A, Distribution::Normal, s_, 1.0, 1.0, s_,
                          fmt::format("residual standard deviation of the {} training points, "
                                      "{:.3g} degrees of freedom (n minus "
                                      "effective parameters)",
                                      cov_.n(), cov_.dof())});
  const std::string coef_note =
      !extended
          ? (cal.lambda > 0.0
                 ? "largest standard deviation of the fitted curve over the range, from the "
                   "ridge sandwich covariance (shrinkage bias not included)"
                 : "largest standard deviation of the fitted curve over the range, from the "
                   "least-squares covariance")
          : fmt::format(
                "largest standard deviation of the fitted model {}, from the {} covariance of "
                "the design rows of its {} terms{}",
                where, cal.lambda > 0.0 ? "ridge sandwich" : "least-squares", m.terms.size(),
                cal.lambda > 0.0 ? " (shrinkage bias not included)" : "");
  b.components.push_back({"fit-coefficients", EvaluationType::A, Distribution::Normal, max_ufit,
                          1.0, 1.0, max_ufit, coef_note});
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
       !extended ? std::string("one digit step of the reading, rectangular, through the largest "
                               "slope dp/dx over the range")
                 : "one digit step of the reading, rectangular, through the largest slope d "
                   "reference / d reading (whole transform chain) " +
                       where});
  const double u_inad = b.inadequacy.largest();
  b.components.push_back(
      {"model-inadequacy", EvaluationType::A, Distribution::Normal, u_inad, 1.0, 1.0, u_inad,
       "largest over the range of the systematic error the curve family leaves, from the "
       "leave-one-setpoint-out errors of the training setpoints against the pure error of the "
       "repeats (smoothed over neighbouring setpoints); " +
           b.inadequacy.reason});
  double sum = 0.0;
  for (const UncertaintyComponent& c : b.components) sum += c.standard * c.standard;
  b.combined = std::sqrt(sum);
  b.expanded = b.k * b.combined;
  if (!extended) {
    b.band_method =
        cal.lambda > 0.0
            ? "U(x) = k*sqrt(s^2 + u_fit(x)^2 + u_ref^2 + u_res(x)^2 + u_inad(x)^2); u_fit from "
              "the ridge "
              "sandwich covariance s^2 V diag(s_j^2/(s_j^2+n*lambda)^2) V' of the centred "
              "Chebyshev design (approximation: ignores the shrinkage bias)"
            : "U(x) = k*sqrt(s^2 + u_fit(x)^2 + u_ref^2 + u_res(x)^2 + u_inad(x)^2); u_fit from "
              "the "
              "least-squares covariance s^2 (Xc'Xc)^-1 of the centred Chebyshev design";
    return;
  }
  // The text keeps the old type name SurfaceModel (now Model): the records
  // quote it, and the golden records pin it.
  b.band_method = fmt::format(
      "U(x, a) = k*sqrt(s^2 + u_fit(x, a)^2 + u_ref^2 + u_res(x, a)^2 + u_inad^2); u_fit from the "
      "{} "
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

UncertaintyBudget evaluate_uncertainty(const Calibration& cal, const UncertaintyOptions& options) {
  return UncertaintyEvaluator(cal, options).budget();
}

nlohmann::json to_json(const UncertaintyBudget& u) {
  using detail::num;
  nlohmann::json comps = nlohmann::json::array(), band = nlohmann::json::array();
  for (const UncertaintyComponent& c : u.components)
    comps.push_back({{"name", c.name},
                     {"type", to_string(c.type)},
                     {"distribution", to_string(c.distribution)},
                     {"value", num(c.value)},
                     {"divisor", num(c.divisor)},
                     {"sensitivity", num(c.sensitivity)},
                     {"standard", num(c.standard)},
                     {"note", c.note}});
  for (const BandPoint& p : u.band)
    band.push_back({{"reading", num(p.reading)},
                    {"predicted", num(p.predicted)},
                    {"reference", num(p.predicted)},  // position on the reference axis (for plots)
                    {"u_fit", num(p.u_fit)},
                    {"u_inadequacy", num(p.u_inadequacy)},
                    {"combined", num(p.combined)},
                    {"expanded", num(p.expanded)}});
  nlohmann::json nodes = nlohmann::json::array();
  for (const InadequacyNode& n : u.inadequacy.nodes)
    nodes.push_back({{"reading", num(n.reading)},
                     {"deleted", num(n.deleted)},
                     {"noise_sd", num(n.noise_sd)},
                     {"standard", num(n.standard)}});
  const ModelInadequacy& mi = u.inadequacy;
  nlohmann::json inad{{"estimated", mi.estimated},  {"included", mi.included},
                      {"alpha", num(mi.alpha)},     {"lack_of_fit_p", num(mi.lack_of_fit_p)},
                      {"pure_sd", num(mi.pure_sd)}, {"df_pure", num(mi.df_pure)},
                      {"uniform", num(mi.uniform)}, {"nodes", nodes},
                      {"reason", mi.reason}};
  return {{"method", "GUM: standard uncertainties added in quadrature; U = k * u_c"},
          {"residual_sd", num(u.residual_sd)},
          {"degrees_of_freedom", num(u.degrees_of_freedom)},
          {"combined", num(u.combined)},
          {"k", u.k},
          {"expanded", num(u.expanded)},
          {"components", comps},
          {"band_method", u.band_method},
          {"band", band},
          {"inadequacy", inad}};
}

UncertaintyBudget uncertainty_from_json(const nlohmann::json& j, const std::string& file) {
  const detail::JsonReader r{file};
  UncertaintyBudget u;
  u.residual_sd = r.number(j, "residual_sd", "uncertainty");
  u.degrees_of_freedom = r.number(j, "degrees_of_freedom", "uncertainty");
  u.combined = r.number(j, "combined", "uncertainty");
  u.k = r.finite(j, "k", "uncertainty");
  u.expanded = r.number(j, "expanded", "uncertainty");
  u.band_method = r.text_or(j, "band_method", "");
  for (const nlohmann::json& c : r.array(j, "components", "uncertainty")) {
    UncertaintyComponent uc;
    uc.name = r.text(c, "name", "uncertainty.components[]");
    uc.type = r.enum_value(c, "type", "uncertainty.components[]", evaluation_type_from_string);
    uc.distribution =
        r.enum_value(c, "distribution", "uncertainty.components[]", distribution_from_string);
    uc.value = r.number(c, "value", "uncertainty.components[]");
    uc.divisor = r.number(c, "divisor", "uncertainty.components[]");
    uc.sensitivity = r.number(c, "sensitivity", "uncertainty.components[]");
    uc.standard = r.number(c, "standard", "uncertainty.components[]");
    uc.note = r.text_or(c, "note", "");
    u.components.push_back(uc);
  }
  for (const nlohmann::json& p : r.array(j, "band", "uncertainty")) {
    BandPoint bp;
    bp.reading = r.finite(p, "reading", "uncertainty.band[]");
    bp.predicted = r.number(p, "predicted", "uncertainty.band[]");
    bp.u_fit = r.number(p, "u_fit", "uncertainty.band[]");
    // Records written before the model-inadequacy term have no such member (0).
    if (p.contains("u_inadequacy"))
      bp.u_inadequacy = r.number(p, "u_inadequacy", "uncertainty.band[]");
    bp.combined = r.number(p, "combined", "uncertainty.band[]");
    bp.expanded = r.number(p, "expanded", "uncertainty.band[]");
    if (!u.band.empty() && !(bp.reading > u.band.back().reading))
      r.fail("uncertainty.band", "is not in order of increasing reading");
    u.band.push_back(bp);
  }
  if (j.contains("inadequacy")) {
    const nlohmann::json& m = j["inadequacy"];
    const std::string w = "uncertainty.inadequacy";
    ModelInadequacy& mi = u.inadequacy;
    mi.estimated = r.boolean(m, "estimated", w);
    mi.included = r.boolean(m, "included", w);
    mi.alpha = r.number(m, "alpha", w);
    mi.lack_of_fit_p = r.number(m, "lack_of_fit_p", w);
    mi.pure_sd = r.number(m, "pure_sd", w);
    mi.df_pure = r.number(m, "df_pure", w);
    mi.uniform = r.number(m, "uniform", w);
    mi.reason = r.text_or(m, "reason", "");
    for (const nlohmann::json& n : r.array(m, "nodes", w)) {
      InadequacyNode in;
      in.reading = r.finite(n, "reading", w + ".nodes[]");
      in.deleted = r.number(n, "deleted", w + ".nodes[]");
      in.noise_sd = r.number(n, "noise_sd", w + ".nodes[]");
      in.standard = r.number(n, "standard", w + ".nodes[]");
      mi.nodes.push_back(in);
    }
  }
  return u;
}

VariationFloors variation_floors(const UncertaintyOptions& options) {
  VariationFloors f;
  f.reading = options.resolution;
  f.reference = 2.0 * options.reference_uncertainty / options.reference_k;
  return f;
}

}  // namespace ridgecal
