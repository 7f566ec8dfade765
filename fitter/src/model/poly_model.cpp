#include "ridgecal/poly_model.hpp"

#include <cassert>
#include <cmath>

namespace ridgecal {

double chebyshev_eval(const std::vector<double>& c, double t) {
  // Clenshaw: b_k = c_k + 2 t b_{k+1} - b_{k+2}; p = c_0 + t b_1 - b_2.
  double b1 = 0.0, b2 = 0.0;
  for (std::size_t k = c.size(); k-- > 1;) {
    const double b0 = c[k] + 2.0 * t * b1 - b2;
    b2 = b1;
    b1 = b0;
  }
  return c.empty() ? 0.0 : c[0] + t * b1 - b2;
}

void chebyshev_row(double t, int degree, double* out) {
  assert(degree >= 0);
  out[0] = 1.0;
  if (degree >= 1) out[1] = t;
  for (int k = 2; k <= degree; ++k) out[k] = 2.0 * t * out[k - 1] - out[k - 2];
}

double PolyModel::eval(double x) const {
  return chebyshev_eval(cheb, scaling.to_t(x));
}

double PolyModel::derivative(double x) const {
  // d/dx sum m_k t^k = (1/h) sum k m_k t^{k-1}
  const std::vector<double> m = monomial_in_t();
  const double t = scaling.to_t(x);
  double d = 0.0;
  for (std::size_t k = m.size(); k-- > 1;) d = d * t + static_cast<double>(k) * m[k];
  return d / scaling.half_width();
}

namespace {
// Monomial coefficients of T_0..T_n, built by T_{k+1} = 2 t T_k - T_{k-1}.
std::vector<std::vector<long double>> chebyshev_monomials(int n) {
  std::vector<std::vector<long double>> T(static_cast<std::size_t>(n) + 1);
  T[0] = {1.0L};
  if (n >= 1) T[1] = {0.0L, 1.0L};
  for (int k = 1; k < n; ++k) {
    std::vector<long double> next(static_cast<std::size_t>(k) + 2, 0.0L);
    for (std::size_t i = 0; i < T[k].size(); ++i) next[i + 1] += 2.0L * T[k][i];
    for (std::size_t i = 0; i < T[k - 1].size(); ++i) next[i] -= T[k - 1][i];
    T[k + 1] = std::move(next);
  }
  return T;
}

std::vector<long double> monomial_in_t_ld(const std::vector<double>& cheb) {
  const int n = static_cast<int>(cheb.size()) - 1;
  std::vector<long double> m(cheb.size(), 0.0L);
  if (n < 0) return m;
  const auto T = chebyshev_monomials(n);
  for (int k = 0; k <= n; ++k)
    for (std::size_t i = 0; i < T[k].size(); ++i)
      m[i] += static_cast<long double>(cheb[k]) * T[k][i];
  return m;
}
}  // namespace

std::vector<double> PolyModel::monomial_in_t() const {
  const auto m = monomial_in_t_ld(cheb);
  return std::vector<double>(m.begin(), m.end());
}

std::vector<long double> PolyModel::power_in_x_ld() const {
  // p = sum m_k ((x - c)/h)^k = sum m_k h^-k sum_j binom(k,j) x^j (-c)^{k-j}
  const auto m = monomial_in_t_ld(cheb);
  const long double c = static_cast<long double>(scaling.center());
  const long double h = static_cast<long double>(scaling.half_width());
  std::vector<long double> a(m.size(), 0.0L);
  // poly = (x - c)^k / h^k, built incrementally
  std::vector<long double> poly{1.0L};
  for (std::size_t k = 0; k < m.size(); ++k) {
    if (k > 0) {
      std::vector<long double> next(poly.size() + 1, 0.0L);
      for (std::size_t j = 0; j < poly.size(); ++j) {
        next[j + 1] += poly[j] / h;
        next[j] -= poly[j] * c / h;
      }
      poly = std::move(next);
    }
    for (std::size_t j = 0; j < poly.size(); ++j) a[j] += m[k] * poly[j];
  }
  return a;
}

std::vector<double> PolyModel::power_in_x() const {
  const auto a = power_in_x_ld();
  return std::vector<double>(a.begin(), a.end());
}

}  // namespace ridgecal
