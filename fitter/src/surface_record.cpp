#include "ridgecal/surface_record.hpp"

#include <fmt/format.h>

#include <cmath>
#include <limits>

#include "json_read.hpp"
#include "ridgecal/errors.hpp"
#include "ridgecal/multi_input_fit.hpp"

namespace ridgecal {

using nlohmann::json;

namespace {

json num(double v) {
  return std::isfinite(v) ? json(v) : json(nullptr);
}

json scaling_json(const AxisScaling& s) {
  return json{{"min", s.min}, {"max", s.max}, {"center", s.center}, {"half_width", s.half_width}};
}

// Reading: thin adapters over the one strict reader (json_read.hpp).
[[noreturn]] void fail(const std::string& file, const std::string& where, const std::string& what) {
  detail::JsonReader{file}.fail(where, what);
}

const json& member(const json& obj, const std::string& key, const std::string& where,
                   const std::string& file) {
  return detail::JsonReader{file}.member(obj, key, where);
}

double finite(const json& obj, const std::string& key, const std::string& where,
              const std::string& file) {
  return detail::JsonReader{file}.finite(obj, key, where);
}

double number_or_nan(const json& obj, const std::string& key) {
  const auto it = obj.find(key);
  return (it != obj.end() && it->is_number()) ? it->get<double>()
                                              : std::numeric_limits<double>::quiet_NaN();
}

AxisScaling read_scaling(const json& obj, const std::string& where, const std::string& file) {
  AxisScaling s;
  s.min = finite(obj, "min", where, file);
  s.max = finite(obj, "max", where, file);
  s.center = finite(obj, "center", where, file);
  s.half_width = finite(obj, "half_width", where, file);
  if (!(s.max > s.min) || !(s.half_width > 0.0))
    fail(file, where, "has max <= min or half_width <= 0");
  return s;
}

template <class F>
auto parse_enum(const json& obj, const std::string& key, const std::string& where,
                const std::string& file, F parse) {
  return detail::JsonReader{file}.enum_value(obj, key, where, parse);
}

}  // namespace

// The descriptive members of `compensation` (also shown by the report).
std::string surface_term_rule(const Calibration& cal) {
  const SurfaceModel& m = *cal.surface;
  if (!cal.selection.powers.empty()) return "powers";
  if (!m.has_aux) return "reading-only";
  return cal.selection.aux_degrees.empty() ? "total-degree" : "separate-limits";
}

std::string surface_aux_grouping(const CalibrationRecord& rec) {
  const Calibration& cal = rec.calibration;
  if (!cal.surface || !cal.surface->has_aux) return "none (no aux input)";
  return rec.input.columns.aux_setpoint_column.empty()
             ? fmt::format("aux value rounded to the nearest multiple of {:g}", cal.aux_step)
             : "aux setpoint column '" + rec.input.columns.aux_setpoint_column + "'";
}

std::string surface_boundary_rule(const Calibration& cal) {
  return cal.surface && cal.surface->has_aux
             ? "groups of the lowest and highest aux level, and the lowest- and highest-reading "
               "group of every aux "
               "level, always stay in training"
             : "the groups with the smallest and largest mean reading always stay in training";
}

bool is_surface_record(const json& j) {
  if (!j.is_object()) return false;
  const auto m = j.find("model");
  if (m == j.end() || !m->is_object()) return false;
  const auto k = m->find("kind");
  return k != m->end() && k->is_string() && k->get<std::string>() == "surface";
}

void add_surface_members(json& j, const CalibrationRecord& rec) {
  const Calibration& cal = rec.calibration;
  if (!cal.surface) return;
  const SurfaceModel& m = *cal.surface;
  json& cols = j["input"]["columns"];
  if (!rec.input.columns.aux_column.empty()) cols["aux"] = rec.input.columns.aux_column;
  if (!rec.input.columns.aux_setpoint_column.empty())
    cols["aux_setpoint"] = rec.input.columns.aux_setpoint_column;

  const std::string basis_text =
      m.basis == SurfaceBasis::Chebyshev
          ? (m.has_aux ? "tensor Chebyshev T_i(t)*T_j(s) in the scaled inputs"
                       : "Chebyshev T_i(t) in the scaled input")
          : (m.has_aux ? "plain powers t^i*s^j of the scaled inputs"
                       : "plain powers t^i of the scaled input");
  j["model"] = {
      {"kind", "surface"},
      {"degree", m.total_degree()},
      {"reading_degree", m.reading_degree()},
      {"aux_degree", m.has_aux ? json(m.aux_degree()) : json(nullptr)},
      {"lambda", cal.lambda},
      {"intercept", cal.intercept},
      {"basis", to_string(m.basis)},
      {"penalty",
       fmt::format("minimise (1/n)*sum((v-q)^2) + lambda*sum c_m^2 over the coefficients c_m of "
                   "every term but (0,0), "
                   "basis {}; v is the transformed reference; the (0,0) term is not penalised",
                   basis_text)},
      {"condition_number", num(cal.condition_number)}};

  json tf = {{"divider", nullptr},
             {"reading", to_string(m.transforms.reading)},
             {"reference", to_string(m.transforms.reference)},
             {"kelvin_offset", kKelvinOffset},
             {"description", m.transforms.describe()}};
  if (m.transforms.divider.enabled)
    tf["divider"] = {{"fixed_resistance", m.transforms.divider.fixed_resistance},
                     {"position", to_string(m.transforms.divider.position)},
                     {"full_scale", m.transforms.divider.full_scale}};
  json inputs = json::array();
  inputs.push_back({{"name", "reading"},
                    {"column", rec.input.columns.reading_column},
                    {"scaling", scaling_json(m.input)}});
  if (m.has_aux)
    inputs.push_back({{"name", "aux"},
                      {"column", rec.input.columns.aux_column},
                      {"scaling", scaling_json(m.aux)}});
  json terms = json::array();
  for (std::size_t q = 0; q < m.terms.size(); ++q)
    terms.push_back(
        {{"i", m.terms[q].i}, {"j", m.terms[q].j}, {"coefficient", num(m.coefficients[q])}});
  json mono = json::array(), pw = json::array();
  for (const auto& row : m.monomial_in_scaled()) {
    json r = json::array();
    for (double c : row) r.push_back(num(c));
    mono.push_back(r);
  }
  for (const auto& row : m.power_in_raw()) {
    json r = json::array();
    for (double c : row) r.push_back(num(c));
    pw.push_back(r);
  }
  j["compensation"] = {
      {"transforms", tf},
      {"inputs", inputs},
      {"aux_grouping", surface_aux_grouping(rec)},
      {"aux_step", m.has_aux && cal.aux_step > 0 ? json(cal.aux_step) : json(nullptr)},
      {"basis", to_string(m.basis)},
      {"term_rule", surface_term_rule(cal)},
      {"boundary_rule", surface_boundary_rule(cal)},
      {"evaluation",
       "u = transforms(reading); t = (u - inputs[0].center)/inputs[0].half_width; s = (aux - "
       "inputs[1].center)/"
       "inputs[1].half_width; v = sum_m terms[m].coefficient * B_i(t) * B_j(s) (B = Chebyshev T or "
       "plain power, "
       "per basis) = sum_kl monomial_coefficients[k][l] t^k s^l; reference = inverse reference "
       "transform of v"},
      {"terms", terms},
      {"monomial_coefficients", mono},
      {"power_coefficients", pw}};

  json& sel = j["selection"];
  sel["aux_degrees"] = cal.selection.aux_degrees;
  sel["powers"] = cal.selection.powers;
  for (std::size_t i = 0; i < cal.selection.grid.size() && i < sel["grid"].size(); ++i) {
    const GridCell& c = cal.selection.grid[i];
    sel["grid"][i]["aux_degree"] = c.aux_degree >= 0 ? json(c.aux_degree) : json(nullptr);
    sel["grid"][i]["terms"] = c.terms;
  }
  if (cal.selection.chosen >= 0) {
    const GridCell& c = cal.selection.grid[static_cast<std::size_t>(cal.selection.chosen)];
    sel["chosen"]["aux_degree"] = c.aux_degree >= 0 ? json(c.aux_degree) : json(nullptr);
    sel["chosen"]["terms"] = c.terms;
  }
  if (m.has_aux) {
    for (std::size_t i = 0; i < cal.setpoints.size(); ++i)
      j["split"]["setpoints"][i]["aux"] = num(cal.setpoints[i].mean_aux);
    for (std::size_t i = 0; i < cal.points.size(); ++i)
      j["points"][i]["aux"] = num(cal.points[i].aux);
  }
}

void read_surface_members(const json& j, CalibrationRecord& rec, const std::string& file) {
  Calibration& cal = rec.calibration;
  const json& mj = member(j, "model", "record", file);
  cal.lambda = finite(mj, "lambda", "model", file);
  const json& ic = member(mj, "intercept", "model", file);
  if (!ic.is_boolean()) fail(file, "model.intercept", "is not true or false");
  cal.intercept = ic.get<bool>();
  cal.condition_number = number_or_nan(mj, "condition_number");

  const json& c = member(j, "compensation", "record", file);
  SurfaceModel m;
  const json& tf = member(c, "transforms", "compensation", file);
  m.transforms.reading =
      parse_enum(tf, "reading", "compensation.transforms", file, reading_transform_from_string);
  m.transforms.reference =
      parse_enum(tf, "reference", "compensation.transforms", file, reference_transform_from_string);
  const json& dv = member(tf, "divider", "compensation.transforms", file);
  if (!dv.is_null()) {
    m.transforms.divider.enabled = true;
    m.transforms.divider.fixed_resistance =
        finite(dv, "fixed_resistance", "compensation.transforms.divider", file);
    m.transforms.divider.full_scale =
        finite(dv, "full_scale", "compensation.transforms.divider", file);
    m.transforms.divider.position = parse_enum(dv, "position", "compensation.transforms.divider",
                                               file, divider_position_from_string);
  }
  if (const std::string e = m.transforms.validate(); !e.empty())
    fail(file, "compensation.transforms", "is invalid: " + e);
  m.basis = parse_enum(c, "basis", "compensation", file, surface_basis_from_string);
  const json& inputs = member(c, "inputs", "compensation", file);
  if (!inputs.is_array() || inputs.empty() || inputs.size() > 2)
    fail(file, "compensation.inputs", "must list 1 or 2 inputs");
  m.input = read_scaling(member(inputs[0], "scaling", "compensation.inputs[0]", file),
                         "compensation.inputs[0].scaling", file);
  m.has_aux = inputs.size() == 2;
  if (m.has_aux)
    m.aux = read_scaling(member(inputs[1], "scaling", "compensation.inputs[1]", file),
                         "compensation.inputs[1].scaling", file);
  const json& terms = member(c, "terms", "compensation", file);
  if (!terms.is_array() || terms.empty() || terms.size() > 256)
    fail(file, "compensation.terms", "has an invalid length");
  for (const json& t : terms) {
    const json& ij = member(t, "i", "compensation.terms[]", file);
    const json& jj = member(t, "j", "compensation.terms[]", file);
    if (!ij.is_number_integer() || !jj.is_number_integer() || ij.get<long long>() < 0 ||
        ij.get<long long>() > 40 || jj.get<long long>() < 0 || jj.get<long long>() > 40 ||
        (!m.has_aux && jj.get<long long>() != 0))
      fail(file, "compensation.terms[]", "has an invalid power");
    m.terms.push_back(Term{ij.get<int>(), jj.get<int>()});
    m.coefficients.push_back(finite(t, "coefficient", "compensation.terms[]", file));
  }
  cal.surface = m;
  const auto st = c.find("aux_step");
  if (st != c.end() && st->is_number()) cal.aux_step = st->get<double>();

  const json& cols = j["input"]["columns"];
  if (cols.contains("aux") && cols["aux"].is_string())
    rec.input.columns.aux_column = cols["aux"].get<std::string>();
  if (cols.contains("aux_setpoint") && cols["aux_setpoint"].is_string())
    rec.input.columns.aux_setpoint_column = cols["aux_setpoint"].get<std::string>();

  const json& sel = member(j, "selection", "record", file);
  for (const char* key : {"aux_degrees", "powers"}) {
    const auto it = sel.find(key);
    if (it == sel.end() || !it->is_array()) continue;
    for (const json& v : *it)
      if (v.is_number_integer())
        (std::string(key) == "powers" ? cal.selection.powers : cal.selection.aux_degrees)
            .push_back(v.get<int>());
  }
}

void read_surface_extras(const json& j, Calibration& cal) {
  // Per-cell, per-setpoint and per-point extras; absent members leave the defaults.
  const json& grid = j["selection"]["grid"];
  cal.selection.chosen = -1;
  for (std::size_t i = 0; i < cal.selection.grid.size() && i < grid.size(); ++i) {
    GridCell& g = cal.selection.grid[i];
    g.aux_degree = grid[i].contains("aux_degree") && grid[i]["aux_degree"].is_number_integer()
                       ? grid[i]["aux_degree"].get<int>()
                       : -1;
    g.terms = grid[i].contains("terms") && grid[i]["terms"].is_number_integer()
                  ? grid[i]["terms"].get<int>()
                  : 0;
  }
  const json& ch = j["selection"]["chosen"];
  if (ch.is_object())
    for (std::size_t i = 0; i < cal.selection.grid.size(); ++i) {
      const GridCell& g = cal.selection.grid[i];
      if (ch.value("degree", -99) == g.degree && ch.value("lambda", -1.0) == g.lambda &&
          ch.value("terms", -1) == g.terms &&
          (ch["aux_degree"].is_null() ? -1 : ch.value("aux_degree", -2)) == g.aux_degree)
        cal.selection.chosen = static_cast<int>(i);
    }
  const json& sps = j["split"]["setpoints"];
  for (std::size_t i = 0; i < cal.setpoints.size() && i < sps.size(); ++i)
    cal.setpoints[i].mean_aux = number_or_nan(sps[i], "aux");
  const json& pts = j["points"];
  for (std::size_t i = 0; i < cal.points.size() && i < pts.size(); ++i)
    cal.points[i].aux = number_or_nan(pts[i], "aux");
}

}  // namespace ridgecal
