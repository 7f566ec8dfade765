#include "ridgecal/extended_fit.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cassert>
#include <cmath>
#include <limits>
#include <map>
#include <memory>

#include "ridgecal/errors.hpp"
#include "ridgecal/fit_model.hpp"

namespace ridgecal {

namespace {
constexpr int kMaxDegree = 20;
constexpr int kMaxAuxDegree = 10;
}  // namespace

std::string ExtendedOptions::validate(const FitOptions& fit) const {
  if (const std::string e = transforms.validate(); !e.empty()) return e;
  if (!fit.intercept && active())
    return "intercept is false; extended models (transforms, aux, powers) always have the (0,0) "
           "term or none via powers";
  if (aux && !(std::isfinite(aux_step) && aux_step > 0.0))
    return fmt::format("aux_step is {}; it must be a finite number > 0", aux_step);
  if (!aux && !aux_degrees.empty())
    return "aux_degrees is given without an aux input; name the aux column";
  for (int a : aux_degrees)
    if (a < 0 || a > kMaxAuxDegree)
      return fmt::format("aux_degrees contains {}; every aux degree must be between 0 and {}", a,
                         kMaxAuxDegree);
  if (fit.fixed_degree && aux_degrees.size() > 1)
    return "aux_degrees has several values with a fixed model; give one aux degree with --degree "
           "and --lambda";
  if (!powers.empty()) {
    std::vector<int> p = powers;
    std::sort(p.begin(), p.end());
    if (std::adjacent_find(p.begin(), p.end()) != p.end())
      return "powers contains a value twice; list each power once";
    if (p.front() < 0 || p.back() > kMaxDegree)
      return fmt::format("powers contains {}; every power must be between 0 and {}",
                         p.front() < 0 ? p.front() : p.back(), kMaxDegree);
    if (p.back() < 1) return "powers is {0}; give at least one power >= 1";
    if (aux && aux_degrees.empty())
      return "powers and an aux input need aux_degrees (the aux degree limit, --aux-degree)";
    if (fit.fixed_degree && *fit.fixed_degree != p.back())
      return fmt::format("fixed_degree is {} but the largest allowed power is {}; they must agree",
                         *fit.fixed_degree, p.back());
  }
  return {};
}

FitOutcome fit_extended(const Dataset& data, const FitOptions& options,
                        const ExtendedOptions& comp) {
  // The one fit (fit_model.hpp); with no extension active it is the plain polynomial.
  return fit_model(data, options, comp);
}

namespace {
std::string term_name(const Term& t, bool aux) {
  if (!aux) return fmt::format("{}", t.i);
  return fmt::format("({},{})", t.i, t.j);
}
}  // namespace

std::string extended_brief(const Calibration& cal) {
  const Model& m = cal.model;
  std::string s;
  std::string shape;
  if (!cal.selection.powers.empty()) {
    shape = "powers";
    for (std::size_t i = 0; i < cal.selection.powers.size(); ++i)
      shape += (i ? "," : " ") + std::to_string(cal.selection.powers[i]);
    if (m.has_aux) shape += fmt::format(", aux degree {}", m.aux_degree());
  } else if (m.has_aux) {
    const GridCell* c = cal.selection.chosen >= 0
                            ? &cal.selection.grid[static_cast<std::size_t>(cal.selection.chosen)]
                            : nullptr;
    shape = c && c->aux_degree >= 0
                ? fmt::format("degree {}, aux degree {}", m.reading_degree(), c->aux_degree)
                : fmt::format("total degree {}", m.total_degree());
  } else {
    shape = fmt::format("degree {}", m.reading_degree());
  }
  if (cal.selection.mode == SelectionMode::Fixed)
    s += fmt::format("model: {} ({} terms, {} basis), lambda {:g} (fixed by the user)\n", shape,
                     m.terms.size(), to_string(m.basis), cal.lambda);
  else
    s += fmt::format(
        "model: {} ({} terms, {} basis), lambda {:g} (chosen by {} grouped CV over {} folds, rule "
        "{})\n",
        shape, m.terms.size(), to_string(m.basis), cal.lambda, to_string(cal.selection.scheme),
        cal.selection.n_folds, to_string(cal.selection.rule));
  if (!m.transforms.identity()) s += "transforms: " + m.transforms.describe() + "\n";
  s += fmt::format("range: {} {:g} .. {:g}",
                   m.transforms.identity() ? "reading" : "transformed reading", m.input.min,
                   m.input.max);
  if (m.has_aux) s += fmt::format(", aux {:g} .. {:g}", m.aux.min, m.aux.max);
  s += "\n";
  return s;
}

std::string extended_full(const Calibration& cal) {
  const Model& m = cal.model;
  std::string s = fmt::format("{} coefficients (scaled variables):", to_string(m.basis));
  for (std::size_t q = 0; q < m.terms.size(); ++q)
    s += fmt::format(" {}:{:.17g}", term_name(m.terms[q], m.has_aux), m.coefficients[q]);
  s += "\npower coefficients (transformed reading u";
  s += m.has_aux ? ", aux a; key (k,l) of u^k a^l):" : "; key k of u^k):";
  const auto pw = m.power_in_raw();
  for (std::size_t k = 0; k < pw.size(); ++k)
    for (std::size_t l = 0; l < pw[k].size(); ++l)
      if (pw[k][l] != 0.0)
        s += fmt::format(" {}:{:.17g}",
                         term_name(Term{static_cast<int>(k), static_cast<int>(l)}, m.has_aux),
                         pw[k][l]);
  return s;
}

}  // namespace ridgecal
