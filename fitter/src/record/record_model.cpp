// The model part of the record, both documented layouts (record_model.hpp).
#include "ridgecal/record_model.hpp"

#include <fmt/format.h>

#include <cmath>
#include <limits>
#include <utility>

#include "ridgecal/json_read.hpp"

namespace ridgecal {

using detail::num;
using nlohmann::json;
using Reader = detail::JsonReader;

std::string term_rule_text(const Model& m, const SelectionInfo& selection) {
  if (!selection.powers.empty()) return "powers";
  if (!m.has_aux) return "reading-only";
  return selection.aux_degrees.empty() ? "total-degree" : "separate-limits";
}

std::string aux_grouping_text(const Model& m, const CalibrationRecord& rec) {
  if (!m.has_aux) return "none (no aux input)";
  return rec.input.columns.aux_setpoint_column.empty()
             ? fmt::format("aux value rounded to the nearest multiple of {:g}",
                           rec.calibration.aux_step)
             : "aux setpoint column '" + rec.input.columns.aux_setpoint_column + "'";
}

std::string boundary_rule_text(const Model& m) {
  return m.has_aux
             ? "groups of the lowest and highest aux level, and the lowest- and highest-reading "
               "group of every aux "
               "level, always stay in training"
             : "the groups with the smallest and largest mean reading always stay in training";
}

namespace {

json numbers(const std::vector<double>& v) {
  json a = json::array();
  for (double x : v) a.push_back(num(x));
  return a;
}

json number_rows(const std::vector<std::vector<double>>& rows) {
  json a = json::array();
  for (const auto& row : rows) a.push_back(numbers(row));
  return a;
}

// ---- scaling: one input's range and affine map, under the layout's keys ----

struct ScalingKeys {
  const char* min;
  const char* max;
  bool stored;  ///< center and half_width are read (else recomputed from min and max)
};
constexpr ScalingKeys kPolynomialScaling{"x_min", "x_max", false};
constexpr ScalingKeys kInputScaling{"min", "max", true};

json scaling_json(const AxisScaling& s, const ScalingKeys& k) {
  return json{{k.min, s.min}, {k.max, s.max}, {"center", s.center}, {"half_width", s.half_width}};
}

AxisScaling read_scaling(const Reader& r, const json& obj, const std::string& where,
                         const ScalingKeys& k) {
  const double lo = r.finite(obj, k.min, where);
  const double hi = r.finite(obj, k.max, where);
  if (!k.stored) {
    if (!(hi > lo)) r.fail(where, fmt::format("has {} <= {}", k.max, k.min));
    return AxisScaling::centered(lo, hi);
  }
  const AxisScaling s{lo, hi, r.finite(obj, "center", where), r.finite(obj, "half_width", where)};
  if (!(s.max > s.min) || !(s.half_width > 0.0)) r.fail(where, "has max <= min or half_width <= 0");
  return s;
}

// ---- the polynomial layout: scaling and Chebyshev series inside `model` ----

std::string polynomial_penalty(const Model&) {
  return "minimise (1/n)*sum(error^2) + lambda*sum_{k>=1} c_k^2 over the Chebyshev coefficients "
         "c_k of the scaled reading t=(x-center)/half_width; the intercept is not penalised";
}

void write_polynomial(json& model, json&, const Model& m, const CalibrationRecord&) {
  model["scaling"] = scaling_json(m.input, kPolynomialScaling);
  model["chebyshev_coefficients"] = numbers(m.coefficients);  // terms (0,0)..(d,0) in order
  // a_k of x^k: the first column of the general model's power form.
  const auto rows = m.power_in_raw();
  std::vector<double> power;
  for (std::size_t k = 0; k < m.coefficients.size() && k < rows.size(); ++k)
    power.push_back(rows[k][0]);
  model["power_coefficients"] = numbers(power);
}

Model read_polynomial(const Reader& r, const json& j, CalibrationRecord&) {
  const json& model = r.member(j, "model", "record");
  Model m;
  m.input =
      read_scaling(r, r.member(model, "scaling", "model"), "model.scaling", kPolynomialScaling);
  const json& cheb = r.array(model, "chebyshev_coefficients", "model");
  if (cheb.empty() || cheb.size() > 64)
    r.fail("model.chebyshev_coefficients", "has an invalid length");
  for (const json& c : cheb) {
    if (!c.is_number() || !std::isfinite(c.get<double>()))
      r.fail("model.chebyshev_coefficients", "holds a value that is not a finite number");
    m.coefficients.push_back(c.get<double>());
  }
  m.terms = terms_reading_only(static_cast<int>(m.coefficients.size()) - 1);
  return m;
}

// ---- the extended layout (kind "surface"): `model` describes, `compensation` holds the model ----

std::string extended_penalty(const Model& m) {
  const std::string basis = m.basis == ModelBasis::Chebyshev
                                ? (m.has_aux ? "tensor Chebyshev T_i(t)*T_j(s) in the scaled inputs"
                                             : "Chebyshev T_i(t) in the scaled input")
                                : (m.has_aux ? "plain powers t^i*s^j of the scaled inputs"
                                             : "plain powers t^i of the scaled input");
  return fmt::format(
      "minimise (1/n)*sum((v-q)^2) + lambda*sum c_m^2 over the coefficients c_m of every term but "
      "(0,0), basis {}; v is the transformed reference; the (0,0) term is not penalised",
      basis);
}

json transforms_json(const Transforms& t) {
  json tf = {{"divider", nullptr},
             {"reading", to_string(t.reading)},
             {"reference", to_string(t.reference)},
             {"kelvin_offset", kKelvinOffset},
             {"description", t.describe()}};
  if (t.divider.enabled)
    tf["divider"] = {{"fixed_resistance", t.divider.fixed_resistance},
                     {"position", to_string(t.divider.position)},
                     {"full_scale", t.divider.full_scale}};
  return tf;
}

void write_extended(json& model, json& comp, const Model& m, const CalibrationRecord& rec) {
  const Calibration& cal = rec.calibration;
  model["reading_degree"] = m.reading_degree();
  model["aux_degree"] = m.has_aux ? json(m.aux_degree()) : json(nullptr);
  json inputs = json::array();
  inputs.push_back({{"name", "reading"},
                    {"column", rec.input.columns.reading_column},
                    {"scaling", scaling_json(m.input, kInputScaling)}});
  if (m.has_aux)
    inputs.push_back({{"name", "aux"},
                      {"column", rec.input.columns.aux_column},
                      {"scaling", scaling_json(m.aux, kInputScaling)}});
  json terms = json::array();
  for (std::size_t q = 0; q < m.terms.size(); ++q)
    terms.push_back(
        {{"i", m.terms[q].i}, {"j", m.terms[q].j}, {"coefficient", num(m.coefficients[q])}});
  comp = {
      {"transforms", transforms_json(m.transforms)},
      {"inputs", inputs},
      {"aux_grouping", aux_grouping_text(m, rec)},
      {"aux_step", m.has_aux && cal.aux_step > 0 ? json(cal.aux_step) : json(nullptr)},
      {"basis", to_string(m.basis)},
      {"term_rule", term_rule_text(m, cal.selection)},
      {"boundary_rule", boundary_rule_text(m)},
      {"evaluation",
       "u = transforms(reading); t = (u - inputs[0].center)/inputs[0].half_width; s = (aux - "
       "inputs[1].center)/inputs[1].half_width; v = sum_m terms[m].coefficient * B_i(t) * B_j(s) "
       "(B = Chebyshev T or plain power, per basis) = sum_kl monomial_coefficients[k][l] t^k s^l; "
       "reference = inverse reference transform of v"},
      {"terms", terms},
      {"monomial_coefficients", number_rows(m.monomial_in_scaled())},
      {"power_coefficients", number_rows(m.power_in_raw())}};
}

Transforms read_transforms(const Reader& r, const json& tf) {
  const std::string where = "compensation.transforms";
  Transforms t;
  t.reading = r.enum_value(tf, "reading", where, reading_transform_from_string);
  t.reference = r.enum_value(tf, "reference", where, reference_transform_from_string);
  const json& dv = r.member(tf, "divider", where);
  if (!dv.is_null()) {
    t.divider.enabled = true;
    t.divider.fixed_resistance = r.finite(dv, "fixed_resistance", where + ".divider");
    t.divider.full_scale = r.finite(dv, "full_scale", where + ".divider");
    t.divider.position =
        r.enum_value(dv, "position", where + ".divider", divider_position_from_string);
  }
  if (const std::string e = t.validate(); !e.empty()) r.fail(where, "is invalid: " + e);
  return t;
}

Model read_extended(const Reader& r, const json& j, CalibrationRecord& rec) {
  const json& c = r.member(j, "compensation", "record");
  Model m;
  m.transforms = read_transforms(r, r.member(c, "transforms", "compensation"));
  m.basis = r.enum_value(c, "basis", "compensation", model_basis_from_string);
  const json& inputs = r.member(c, "inputs", "compensation");
  if (!inputs.is_array() || inputs.empty() || inputs.size() > 2)
    r.fail("compensation.inputs", "must list 1 or 2 inputs");
  m.has_aux = inputs.size() == 2;
  for (std::size_t k = 0; k < inputs.size(); ++k) {
    const std::string where = fmt::format("compensation.inputs[{}]", k);
    (k == 0 ? m.input : m.aux) =
        read_scaling(r, r.member(inputs[k], "scaling", where), where + ".scaling", kInputScaling);
  }
  const json& terms = r.member(c, "terms", "compensation");
  if (!terms.is_array() || terms.empty() || terms.size() > 256)
    r.fail("compensation.terms", "has an invalid length");
  for (const json& t : terms) {
    const int i = static_cast<int>(r.bounded(t, "i", "compensation.terms[]", 0, 40));
    const int jj =
        static_cast<int>(r.bounded(t, "j", "compensation.terms[]", 0, m.has_aux ? 40 : 0));
    m.terms.push_back(Term{i, jj});
    m.coefficients.push_back(r.finite(t, "coefficient", "compensation.terms[]"));
  }
  const auto st = c.find("aux_step");
  if (st != c.end() && st->is_number()) rec.calibration.aux_step = st->get<double>();
  const json& cols = j["input"]["columns"];
  rec.input.columns.aux_column = r.text_or(cols, "aux", "");
  rec.input.columns.aux_setpoint_column = r.text_or(cols, "aux_setpoint", "");
  return m;
}

// ---- the table of layouts: what differs between the two, and nothing else ----

struct Layout {
  const char* kind;  ///< model.kind
  std::string (*penalty)(const Model&);
  /// The members only this layout writes, into `model` and `compensation`.
  void (*write)(json& model, json& compensation, const Model&, const CalibrationRecord&);
  /// Reads the scaling, terms and coefficients (and the layout's other members).
  Model (*read)(const Reader&, const json& record, CalibrationRecord&);
};

constexpr Layout kPolynomial{"polynomial", polynomial_penalty, write_polynomial, read_polynomial};
constexpr Layout kExtended{"surface", extended_penalty, write_extended, read_extended};

}  // namespace

ModelParts model_to_json(const CalibrationRecord& rec) {
  const Calibration& cal = rec.calibration;
  const Model& m = cal.model;
  ModelParts out;
  out.extended = is_extended(cal);
  out.has_aux = m.has_aux;
  const Layout& layout = out.extended ? kExtended : kPolynomial;
  out.model = {{"kind", layout.kind},
               {"degree", m.total_degree()},
               {"lambda", cal.lambda},
               {"intercept", cal.intercept},
               {"basis", to_string(m.basis)},
               {"penalty", layout.penalty(m)},
               {"condition_number", num(cal.condition_number)}};
  layout.write(out.model, out.compensation, m, rec);
  return out;
}

void model_from_json(const json& j, CalibrationRecord& rec, const std::string& file) {
  const Reader r{file};
  const json& model = r.member(j, "model", "record");
  const std::string kind = r.text(model, "kind", "model");
  if (kind != kPolynomial.kind && kind != kExtended.kind)
    r.fail("model.kind",
           fmt::format("is '{}', not '{}' or '{}'", kind, kPolynomial.kind, kExtended.kind));
  const bool extended = kind == kExtended.kind;
  Calibration& cal = rec.calibration;
  cal.lambda = r.finite(model, "lambda", "model");
  cal.intercept = r.boolean(model, "intercept", "model");
  cal.condition_number = r.number(model, "condition_number", "model");
  Model m = (extended ? kExtended : kPolynomial).read(r, j, rec);
  if (r.integer(model, "degree", "model") != m.total_degree())
    r.fail("model.degree", "does not match the degree of the coefficients");
  cal.model = std::move(m);
  if (is_extended(cal) != extended)
    r.fail("model.kind",
           fmt::format("is '{}' but the model uses {} (an aux input, transforms or the power "
                       "basis); the kind must match the model",
                       kind, extended ? "no extension" : "an extension"));
}

}  // namespace ridgecal
