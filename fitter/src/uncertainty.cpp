#include "ridgecal/uncertainty.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <limits>
#include <stdexcept>

#include "json_read.hpp"

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

namespace {
// Design row: columns 1..D, T_k(t), or T_k(t) - T_k(t(0)) through the origin (as in the fit).
void design_row(double x, const Scaling& sc, int D, bool intercept, double* out) {
  std::vector<double> row(static_cast<std::size_t>(D) + 1), row0(static_cast<std::size_t>(D) + 1);
  chebyshev_row(sc.to_t(x), D, row.data());
  if (!intercept) chebyshev_row(sc.to_t(0.0), D, row0.data());
  for (int k = 1; k <= D; ++k)
    out[k - 1] = intercept ? row[static_cast<std::size_t>(k)]
                           : row[static_cast<std::size_t>(k)] - row0[static_cast<std::size_t>(k)];
}
}  // namespace

FitCovariance::FitCovariance(const Calibration& cal)
    : intercept_(cal.intercept),
      lambda_(cal.lambda),
      degree_(cal.model.degree()),
      scaling_(cal.model.scaling) {
  std::vector<const PointResult*> tr;
  for (const PointResult& p : cal.points)
    if (p.role == SetRole::Train) tr.push_back(&p);
  n_ = tr.size();
  if (n_ == 0 || degree_ < 1) {
    df_ = intercept_ ? 1.0 : 0.0;
    double rss = 0;
    for (const PointResult* p : tr) rss += p->error * p->error;
    sigma_ =
        static_cast<double>(n_) > df_ ? std::sqrt(rss / (static_cast<double>(n_) - df_)) : kNaN;
    return;
  }
  const int D = degree_;
  Eigen::MatrixXd X(static_cast<Eigen::Index>(n_), D);
  std::vector<double> row(static_cast<std::size_t>(D));
  double rss = 0;
  for (std::size_t i = 0; i < n_; ++i) {
    design_row(tr[i]->reading, scaling_, D, intercept_, row.data());
    for (int k = 0; k < D; ++k)
      X(static_cast<Eigen::Index>(i), k) = row[static_cast<std::size_t>(k)];
    rss += tr[i]->error * tr[i]->error;
  }
  mean_ = intercept_ ? Eigen::RowVectorXd(X.colwise().mean()) : Eigen::RowVectorXd::Zero(D);
  const Eigen::MatrixXd Xc = X.rowwise() - mean_;
  Eigen::JacobiSVD<Eigen::MatrixXd> svd(Xc, Eigen::ComputeThinV);
  V_ = svd.matrixV();
  s_ = svd.singularValues();
  const double smax = s_.size() ? s_(0) : 0.0;
  const double tol = smax * std::numeric_limits<double>::epsilon() *
                     static_cast<double>(std::max<std::size_t>(n_, static_cast<std::size_t>(D)));
  df_ = intercept_ ? 1.0 : 0.0;
  const double nl = static_cast<double>(n_) * lambda_;
  for (Eigen::Index j = 0; j < s_.size(); ++j) {
    if (s_(j) > tol) ++rank_;
    if (s_(j) > tol || lambda_ > 0.0) df_ += s_(j) * s_(j) / (s_(j) * s_(j) + nl);
  }
  sigma_ = static_cast<double>(n_) > df_ + 1e-9 ? std::sqrt(rss / (static_cast<double>(n_) - df_))
                                                : kNaN;
  ok_ = true;
}

Eigen::VectorXd FitCovariance::projected(double reading) const {
  std::vector<double> row(static_cast<std::size_t>(degree_));
  design_row(reading, scaling_, degree_, intercept_, row.data());
  const Eigen::Map<const Eigen::RowVectorXd> r(row.data(), degree_);
  return ((r - mean_) * V_).transpose();
}

double FitCovariance::variance_factor(double reading) const {
  double v = intercept_ && n_ > 0 ? 1.0 / static_cast<double>(n_) : 0.0;
  if (!ok_) return v;
  const Eigen::VectorXd w = projected(reading);
  const double nl = static_cast<double>(n_) * lambda_;
  for (Eigen::Index j = 0; j < s_.size(); ++j) {
    if (j >= rank_ && lambda_ == 0.0) continue;
    const double g = s_(j) / (s_(j) * s_(j) + nl);
    v += w(j) * w(j) * g * g;
  }
  return v;
}

double FitCovariance::leverage(double reading) const {
  double h = intercept_ && n_ > 0 ? 1.0 / static_cast<double>(n_) : 0.0;
  if (!ok_) return h;
  const Eigen::VectorXd w = projected(reading);
  const double nl = static_cast<double>(n_) * lambda_;
  for (Eigen::Index j = 0; j < s_.size(); ++j) {
    if (j >= rank_ && lambda_ == 0.0) continue;
    h += w(j) * w(j) / (s_(j) * s_(j) + nl);
  }
  return h;
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

UncertaintyBudget evaluate_uncertainty(const Calibration& cal, const UncertaintyOptions& options) {
  UncertaintyBudget b;
  b.k = options.coverage_k;
  const FitCovariance cov(cal);
  const double s = cov.residual_sd();
  b.residual_sd = s;
  b.degrees_of_freedom = cov.dof();
  const double s_used = std::isfinite(s) ? s : 0.0;
  const double u_ref = options.reference_uncertainty / options.reference_k;
  const double res_div = 2.0 * std::sqrt(3.0);

  const Scaling& sc = cal.model.scaling;
  const int m = options.band_points;
  double max_ufit = 0.0, max_slope = 0.0;
  for (int i = 0; i < m; ++i) {
    BandPoint bp;
    bp.reading = sc.x_min + (sc.x_max - sc.x_min) * i / (m - 1);
    if (i == m - 1) bp.reading = sc.x_max;
    bp.predicted = cal.model.eval(bp.reading);
    bp.u_fit = s_used * std::sqrt(cov.variance_factor(bp.reading));
    const double slope = std::fabs(cal.model.derivative(bp.reading));
    const double u_res = options.resolution > 0.0 ? slope * options.resolution / res_div : 0.0;
    bp.combined = std::sqrt(s_used * s_used + bp.u_fit * bp.u_fit + u_ref * u_ref + u_res * u_res);
    bp.expanded = b.k * bp.combined;
    max_ufit = std::max(max_ufit, bp.u_fit);
    max_slope = std::max(max_slope, slope);
    b.band.push_back(bp);
  }
  // The slope can peak between band points: refine on a finer grid.
  for (int i = 0; i <= 1000; ++i)
    max_slope = std::max(
        max_slope, std::fabs(cal.model.derivative(sc.x_min + (sc.x_max - sc.x_min) * i / 1000.0)));

  b.components.push_back(
      {"fit-residual", EvaluationType::A, Distribution::Normal, s_used, 1.0, 1.0, s_used,
       fmt::format("residual standard deviation of the {} training points, {:.3g} degrees of "
                   "freedom (n minus effective parameters)",
                   cov.n(), cov.dof())});
  b.components.push_back(
      {"fit-coefficients", EvaluationType::A, Distribution::Normal, max_ufit, 1.0, 1.0, max_ufit,
       cal.lambda > 0.0 ? "largest standard deviation of the fitted curve over the range, from the "
                          "ridge sandwich covariance (shrinkage bias not included)"
                        : "largest standard deviation of the fitted curve over the range, from the "
                          "least-squares covariance"});
  b.components.push_back(
      {"reference-standard", EvaluationType::B, Distribution::Normal, options.reference_uncertainty,
       options.reference_k, 1.0, u_ref,
       options.reference_k == 1.0
           ? "standard uncertainty of the reference as stated by the user"
           : fmt::format("expanded uncertainty of the reference as stated by the user, k = {:g}",
                         options.reference_k)});
  b.components.push_back({"reading-resolution", EvaluationType::B, Distribution::Rectangular,
                          options.resolution, res_div, max_slope,
                          options.resolution > 0.0 ? max_slope * options.resolution / res_div : 0.0,
                          "one digit step of the reading, rectangular, through the largest slope "
                          "dp/dx over the range"});
  double sum = 0;
  for (const UncertaintyComponent& c : b.components) sum += c.standard * c.standard;
  b.combined = std::sqrt(sum);
  b.expanded = b.k * b.combined;
  b.band_method =
      cal.lambda > 0.0
          ? "U(x) = k*sqrt(s^2 + u_fit(x)^2 + u_ref^2 + u_res(x)^2); u_fit from the ridge sandwich "
            "covariance s^2 V diag(s_j^2/(s_j^2+n*lambda)^2) V' of the centred Chebyshev design "
            "(approximation: ignores the shrinkage bias)"
          : "U(x) = k*sqrt(s^2 + u_fit(x)^2 + u_ref^2 + u_res(x)^2); u_fit from the least-squares "
            "covariance s^2 (Xc'Xc)^-1 of the centred Chebyshev design";
  return b;
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
                    {"combined", num(p.combined)},
                    {"expanded", num(p.expanded)}});
  return {{"method", "GUM: standard uncertainties added in quadrature; U = k * u_c"},
          {"residual_sd", num(u.residual_sd)},
          {"degrees_of_freedom", num(u.degrees_of_freedom)},
          {"combined", num(u.combined)},
          {"k", u.k},
          {"expanded", num(u.expanded)},
          {"components", comps},
          {"band_method", u.band_method},
          {"band", band}};
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
    bp.combined = r.number(p, "combined", "uncertainty.band[]");
    bp.expanded = r.number(p, "expanded", "uncertainty.band[]");
    if (!u.band.empty() && !(bp.reading > u.band.back().reading))
      r.fail("uncertainty.band", "is not in order of increasing reading");
    u.band.push_back(bp);
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
