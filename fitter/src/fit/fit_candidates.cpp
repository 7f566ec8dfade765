// The candidate term lists of a fit and their designs (fit_model.hpp).
#include <fmt/format.h>

#include <algorithm>

#include "ridgecal/fit_model.hpp"

namespace ridgecal {

namespace {

// Values of B_0..B_degree at t in the basis (no allocation).
void basis_values(ModelBasis basis, double t, int degree, double* out) {
  if (basis == ModelBasis::Chebyshev) {
    chebyshev_row(t, degree, out);
    return;
  }
  out[0] = 1.0;
  for (int k = 1; k <= degree; ++k) out[k] = out[k - 1] * t;
}

}  // namespace

TermRule term_rule(const ExtendedOptions& comp) {
  if (!comp.powers.empty()) return TermRule::Powers;
  if (!comp.aux) return TermRule::ReadingOnly;
  return comp.aux_degrees.empty() ? TermRule::TotalDegree : TermRule::SeparateLimits;
}

bool nested(TermRule rule) {
  // terms_reading_only(d) and terms_total_degree(d) list the terms of degree
  // d after those of every lower degree; separate limits and powers do not
  // (their candidates differ in the aux degree, or there is one candidate).
  return rule == TermRule::ReadingOnly || rule == TermRule::TotalDegree;
}

std::vector<Candidate> candidate_models(TermRule rule, const std::vector<int>& degrees,
                                        const std::vector<int>& aux_degrees,
                                        const std::vector<int>& powers) {
  std::vector<Candidate> cands;
  switch (rule) {
    case TermRule::ReadingOnly:
      for (int d : degrees) cands.push_back({d, -1, terms_reading_only(d)});
      break;
    case TermRule::TotalDegree:
      for (int d : degrees) cands.push_back({d, -1, terms_total_degree(d)});
      break;
    case TermRule::SeparateLimits:
      for (int d : degrees)
        for (int a : aux_degrees) cands.push_back({d, a, terms_rectangle(d, a)});
      break;
    case TermRule::Powers:
      if (aux_degrees.empty())
        cands.push_back({powers.back(), -1, terms_powers(powers, 0)});
      else
        for (int a : aux_degrees) cands.push_back({powers.back(), a, terms_powers(powers, a)});
      break;
  }
  return cands;
}

std::vector<Term> design_terms(const std::vector<Term>& terms) {
  std::vector<Term> cols;
  for (const Term& t : terms)
    if (!(t == Term{0, 0})) cols.push_back(t);
  return cols;
}

std::string candidate_name(const Candidate& c) {
  return c.aux_degree >= 0 ? fmt::format("degree {} / aux degree {}", c.degree, c.aux_degree)
                           : fmt::format("degree {}", c.degree);
}

// The design of `cols` at the scaled inputs (t, s) of every row; through the
// origin (origin_row not null) each column minus its value at reading 0.
Eigen::MatrixXd make_design(const std::vector<Term>& cols, ModelBasis basis,
                            const std::vector<double>& ts, const std::vector<double>& ss,
                            const double* origin_row) {
  int D = 0, A = 0;
  for (const Term& t : cols) {
    D = std::max(D, t.i);
    A = std::max(A, t.j);
  }
  std::vector<double> bt(static_cast<std::size_t>(D) + 1), bs(static_cast<std::size_t>(A) + 1);
  Eigen::MatrixXd X(static_cast<Eigen::Index>(ts.size()), static_cast<Eigen::Index>(cols.size()));
  for (std::size_t r = 0; r < ts.size(); ++r) {
    basis_values(basis, ts[r], D, bt.data());
    basis_values(basis, ss[r], A, bs.data());
    for (std::size_t q = 0; q < cols.size(); ++q) {
      const double b =
          bt[static_cast<std::size_t>(cols[q].i)] * bs[static_cast<std::size_t>(cols[q].j)];
      X(static_cast<Eigen::Index>(r), static_cast<Eigen::Index>(q)) =
          origin_row ? b - origin_row[q] : b;
    }
  }
  return X;
}

}  // namespace ridgecal
