#include "ridgecal/model.hpp"

#include <algorithm>
#include <cassert>
#include <cmath>
#include <stdexcept>

#include "ridgecal/poly_model.hpp"

namespace ridgecal {

std::string to_string(ModelBasis b) {
  return b == ModelBasis::Chebyshev ? "chebyshev" : "power";
}
ModelBasis model_basis_from_string(const std::string& s) {
  if (s == "chebyshev") return ModelBasis::Chebyshev;
  if (s == "power") return ModelBasis::Power;
  throw std::invalid_argument("basis must be 'chebyshev' or 'power', got '" + s + "'");
}

AxisScaling AxisScaling::centered(double min, double max) {
  assert(max > min);
  return AxisScaling{min, max, 0.5 * (min + max), 0.5 * (max - min)};
}

AxisScaling AxisScaling::about_zero(double min, double max) {
  const double h = std::max(std::fabs(min), std::fabs(max));
  assert(h > 0.0);
  return AxisScaling{min, max, 0.0, h};
}

int Model::reading_degree() const {
  int d = 0;
  for (const Term& t : terms) d = std::max(d, t.i);
  return d;
}
int Model::aux_degree() const {
  int d = 0;
  for (const Term& t : terms) d = std::max(d, t.j);
  return d;
}
int Model::total_degree() const {
  int d = 0;
  for (const Term& t : terms) d = std::max(d, t.i + t.j);
  return d;
}
bool Model::has_intercept() const {
  return std::find(terms.begin(), terms.end(), Term{0, 0}) != terms.end();
}

namespace {
void univariate_row(ModelBasis b, double t, int degree, double* out) {
  if (b == ModelBasis::Chebyshev) {
    chebyshev_row(t, degree, out);
    return;
  }
  out[0] = 1.0;
  for (int k = 1; k <= degree; ++k) out[k] = out[k - 1] * t;
}

// Monomial coefficients (in long double) of B_0..B_n.
std::vector<std::vector<long double>> basis_monomials(ModelBasis b, int n) {
  std::vector<std::vector<long double>> T(static_cast<std::size_t>(n) + 1);
  for (int k = 0; k <= n; ++k) {
    T[k].assign(static_cast<std::size_t>(k) + 1, 0.0L);
    if (b == ModelBasis::Power) {
      T[k][k] = 1.0L;
    } else if (k == 0) {
      T[0][0] = 1.0L;
    } else if (k == 1) {
      T[1][1] = 1.0L;
    } else {
      for (std::size_t i = 0; i < T[k - 1].size(); ++i) T[k][i + 1] += 2.0L * T[k - 1][i];
      for (std::size_t i = 0; i < T[k - 2].size(); ++i) T[k][i] -= T[k - 2][i];
    }
  }
  return T;
}

std::vector<std::vector<long double>> monomial_ld(const Model& m) {
  const int D = m.reading_degree(), A = m.aux_degree();
  std::vector<std::vector<long double>> out(
      static_cast<std::size_t>(D) + 1,
      std::vector<long double>(static_cast<std::size_t>(A) + 1, 0.0L));
  const auto Bt = basis_monomials(m.basis, D);
  // The aux input always uses the tensor partner of the basis: Chebyshev for
  // the Chebyshev basis, powers for the power basis.
  const auto Bs = basis_monomials(m.basis, A);
  for (std::size_t q = 0; q < m.terms.size(); ++q) {
    const Term& tm = m.terms[q];
    const long double c = m.coefficients[q];
    for (std::size_t k = 0; k < Bt[tm.i].size(); ++k)
      for (std::size_t l = 0; l < Bs[tm.j].size(); ++l) out[k][l] += c * Bt[tm.i][k] * Bs[tm.j][l];
  }
  return out;
}

// Coefficients of ((x - c)/h)^k in powers of x, k = 0..n.
std::vector<std::vector<long double>> shifted_powers(long double c, long double h, int n) {
  std::vector<std::vector<long double>> P(static_cast<std::size_t>(n) + 1);
  P[0] = {1.0L};
  for (int k = 1; k <= n; ++k) {
    P[k].assign(static_cast<std::size_t>(k) + 1, 0.0L);
    for (std::size_t j = 0; j < P[k - 1].size(); ++j) {
      P[k][j + 1] += P[k - 1][j] / h;
      P[k][j] -= P[k - 1][j] * c / h;
    }
  }
  return P;
}
}  // namespace

void Model::basis_row(double t, double s, double* out) const {
  const int D = reading_degree(), A = aux_degree();
  std::vector<double> bt(static_cast<std::size_t>(D) + 1), bs(static_cast<std::size_t>(A) + 1);
  univariate_row(basis, t, D, bt.data());
  univariate_row(basis, s, A, bs.data());
  for (std::size_t q = 0; q < terms.size(); ++q) out[q] = bt[terms[q].i] * bs[terms[q].j];
}

double Model::eval_fitted(double u, double aux_value) const {
  assert(terms.size() == coefficients.size());
  const double t = input.to_scaled(u);
  if (basis == ModelBasis::Chebyshev && !has_aux) {
    // A Chebyshev series in the reading alone (the one-input polynomial is
    // this case): Clenshaw's recurrence, exactly as PolyModel::eval.
    std::vector<double> c(static_cast<std::size_t>(reading_degree()) + 1, 0.0);
    for (std::size_t q = 0; q < terms.size(); ++q)
      c[static_cast<std::size_t>(terms[q].i)] += coefficients[q];
    return chebyshev_eval(c, t);
  }
  const double s = has_aux ? aux.to_scaled(aux_value) : 0.0;
  std::vector<double> row(terms.size());
  basis_row(t, s, row.data());
  double v = 0.0;
  for (std::size_t q = 0; q < terms.size(); ++q) v += coefficients[q] * row[q];
  return v;
}

double Model::eval(double reading, double aux_value) const {
  const double u = transforms.input(reading);
  if (std::isnan(u)) return u;
  return transforms.output_inverse(eval_fitted(u, aux_value));
}

std::vector<std::vector<double>> Model::monomial_in_scaled() const {
  const auto m = monomial_ld(*this);
  std::vector<std::vector<double>> out;
  for (const auto& row : m) out.emplace_back(row.begin(), row.end());
  return out;
}

std::vector<std::vector<long double>> Model::power_in_raw_ld() const {
  const auto m = monomial_ld(*this);
  const int D = reading_degree(), A = aux_degree();
  const auto Pu = shifted_powers(input.center, input.half_width, D);
  const auto Pa =
      has_aux ? shifted_powers(aux.center, aux.half_width, A) : shifted_powers(0.0L, 1.0L, A);
  std::vector<std::vector<long double>> out(
      static_cast<std::size_t>(D) + 1,
      std::vector<long double>(static_cast<std::size_t>(A) + 1, 0.0L));
  for (int k = 0; k <= D; ++k)
    for (int l = 0; l <= A; ++l) {
      if (m[k][l] == 0.0L) continue;
      for (std::size_t p = 0; p < Pu[k].size(); ++p)
        for (std::size_t q = 0; q < Pa[l].size(); ++q) out[p][q] += m[k][l] * Pu[k][p] * Pa[l][q];
    }
  return out;
}

std::vector<std::vector<double>> Model::power_in_raw() const {
  const auto a = power_in_raw_ld();
  std::vector<std::vector<double>> out;
  for (const auto& row : a) out.emplace_back(row.begin(), row.end());
  return out;
}

bool is_one_input_polynomial(const Model& m) {
  return !m.has_aux && m.basis == ModelBasis::Chebyshev && m.transforms.identity();
}

Model one_input_model(const PolyModel& p) {
  Model m;
  m.basis = ModelBasis::Chebyshev;
  m.input =
      AxisScaling{p.scaling.x_min, p.scaling.x_max, p.scaling.center(), p.scaling.half_width()};
  m.terms = terms_reading_only(p.degree());
  m.coefficients = p.cheb;
  return m;
}

PolyModel one_input_polynomial(const Model& m) {
  assert(is_one_input_polynomial(m));
  PolyModel p;
  if (m.terms.empty()) return p;
  p.scaling.x_min = m.input.min;
  p.scaling.x_max = m.input.max;
  p.cheb.assign(static_cast<std::size_t>(m.reading_degree()) + 1, 0.0);
  for (std::size_t q = 0; q < m.terms.size() && q < m.coefficients.size(); ++q)
    p.cheb[static_cast<std::size_t>(m.terms[q].i)] = m.coefficients[q];
  return p;
}

std::vector<Term> terms_reading_only(int d) {
  std::vector<Term> t;
  for (int i = 0; i <= d; ++i) t.push_back({i, 0});
  return t;
}

std::vector<Term> terms_total_degree(int d) {
  std::vector<Term> t;
  for (int tot = 0; tot <= d; ++tot)
    for (int j = 0; j <= tot; ++j) t.push_back({tot - j, j});
  return t;
}

std::vector<Term> terms_rectangle(int d, int a) {
  std::vector<Term> t;
  for (int j = 0; j <= a; ++j)
    for (int i = 0; i <= d; ++i) t.push_back({i, j});
  std::stable_sort(t.begin(), t.end(),
                   [](const Term& x, const Term& y) { return x.i + x.j < y.i + y.j; });
  return t;
}

std::vector<Term> terms_powers(const std::vector<int>& powers, int a) {
  std::vector<Term> t;
  for (int j = 0; j <= a; ++j)
    for (int p : powers) t.push_back({p, j});
  std::stable_sort(t.begin(), t.end(),
                   [](const Term& x, const Term& y) { return x.i + x.j < y.i + y.j; });
  return t;
}

}  // namespace ridgecal
