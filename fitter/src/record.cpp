#include "ridgecal/record.hpp"

#include <fmt/format.h>

#include <cmath>
#include <cstdint>
#include <limits>

#include "json_read.hpp"
#include "ridgecal/atomic_file.hpp"
#include "ridgecal/errors.hpp"
#include "ridgecal/sha256.hpp"
#include "ridgecal/surface_record.hpp"

namespace ridgecal {

using nlohmann::json;

const char* tool_version() {
  return RIDGECAL_VERSION_STRING;
}

std::vector<std::string> standard_cautions() {
  return {
      "Safety-relevant calibration must follow local codes and certified procedures; this record "
      "does "
      "not replace them.",
      "This record does not replace a certificate from an accredited calibration laboratory.",
      "The calibration is valid only inside the calibrated reading range; outside it the curve is "
      "an "
      "extrapolation.",
  };
}

namespace {

json num(double v) {
  return std::isfinite(v) ? json(v) : json(nullptr);
}

json metrics_json(const Metrics& m) {
  return json{{"n", m.n},
              {"predictors", m.predictors},
              {"centered", m.centered},
              {"rmse", num(m.rmse)},
              {"max_abs_error", num(m.max_abs_error)},
              {"bias", num(m.bias)},
              {"r2", num(m.r2)},
              {"adj_r2", num(m.adj_r2)},
              {"residual_sd", num(m.residual_sd)}};
}

json cell_json(const GridCell& c) {
  return json{{"degree", c.degree},
              {"lambda", c.lambda},
              {"cv_rmse", num(c.cv_rmse)},
              {"cv_se", num(c.cv_se)},
              {"train_rmse", num(c.train_rmse)}};
}

// ---- reading: the one strict reader (json_read.hpp); every failure is an
// InputError naming the member ----

using Reader = detail::JsonReader;

Metrics read_metrics(const Reader& r, const json& obj, const std::string& where) {
  Metrics m;
  m.n = r.count(obj, "n", where);
  m.predictors = r.small(obj, "predictors", where, 0, 64);
  m.centered = r.boolean(obj, "centered", where);
  m.rmse = r.number(obj, "rmse", where);
  m.max_abs_error = r.number(obj, "max_abs_error", where);
  m.bias = r.number(obj, "bias", where);
  m.r2 = r.number(obj, "r2", where);
  m.adj_r2 = r.number(obj, "adj_r2", where);
  m.residual_sd = r.number(obj, "residual_sd", where);
  return m;
}

// The optional assessment members, read strictly: present means written by
// the fitter in its layout; anything else is an InputError naming the member.
void read_assessment_members(const json& j, CalibrationRecord& rec, const std::string& file) {
  if (j.contains("tolerance")) rec.tolerance = tolerance_from_json(j["tolerance"], file);
  if (j.contains("decision")) rec.decision = decision_from_json(j["decision"], file);
  if (j.contains("uncertainty")) rec.uncertainty = uncertainty_from_json(j["uncertainty"], file);
  if (j.contains("warnings")) rec.warnings = warnings_from_json(j["warnings"], file);
  if (j.contains("lack_of_fit")) rec.lack_of_fit = lack_of_fit_from_json(j["lack_of_fit"], file);
}

}  // namespace

json record_to_json(const CalibrationRecord& rec) {
  const Calibration& cal = rec.calibration;
  json j;
  j["format"] = kRecordFormat;
  j["format_version"] = kRecordFormatVersion;
  j["tool_version"] = rec.tool_version;
  if (!rec.created_utc.empty()) j["created_utc"] = rec.created_utc;
  j["cautions"] = rec.cautions;
  j["sensor"] = {{"name", rec.sensor.name},
                 {"reading_unit", rec.sensor.reading_unit},
                 {"reference_unit", rec.sensor.reference_unit}};
  j["input"] = {{"file", rec.input.file},
                {"sha256", rec.input.sha256},
                {"rows", rec.input.rows},
                {"columns",
                 {{"reading", rec.input.columns.reading_column},
                  {"reference", rec.input.columns.reference_column},
                  {"setpoint", rec.input.columns.setpoint_column},
                  {"role", rec.input.columns.role_column},
                  {"delimiter", std::string(1, rec.input.columns.delimiter)}}}};
  json cheb = json::array(), power = json::array();
  for (double c : cal.model.cheb) cheb.push_back(num(c));
  for (double c : cal.model.power_in_x()) power.push_back(num(c));
  j["model"] = {
      {"kind", "polynomial"},
      {"degree", cal.model.degree()},
      {"lambda", cal.lambda},
      {"intercept", cal.intercept},
      {"basis", "chebyshev"},
      {"penalty",
       "minimise (1/n)*sum(error^2) + lambda*sum_{k>=1} c_k^2 over the Chebyshev coefficients c_k "
       "of the scaled reading t=(x-center)/half_width; the intercept is not penalised"},
      {"scaling",
       {{"x_min", cal.model.scaling.x_min},
        {"x_max", cal.model.scaling.x_max},
        {"center", cal.model.scaling.center()},
        {"half_width", cal.model.scaling.half_width()}}},
      {"chebyshev_coefficients", cheb},
      {"power_coefficients", power},
      {"condition_number", num(cal.condition_number)}};
  json grid = json::array();
  for (const GridCell& c : cal.selection.grid) grid.push_back(cell_json(c));
  j["selection"] = {
      {"mode", to_string(cal.selection.mode)},
      {"rule", to_string(cal.selection.rule)},
      {"fold_scheme", to_string(cal.selection.scheme)},
      {"folds", cal.selection.n_folds},
      {"degrees", cal.selection.degrees},
      {"lambdas", cal.selection.lambdas},
      {"grid", grid},
      {"chosen", cal.selection.chosen >= 0
                     ? cell_json(cal.selection.grid[static_cast<std::size_t>(cal.selection.chosen)])
                     : json(nullptr)},
      {"notes", cal.selection.notes}};
  json sps = json::array();
  for (const SetpointResult& sp : cal.setpoints)
    sps.push_back({{"id", sp.id},
                   {"reading", sp.mean_reading},
                   {"reference", sp.mean_reference},
                   {"count", sp.count},
                   {"role", to_string(sp.role)},
                   {"fold", sp.fold}});
  j["split"] = {{"seed", cal.split_options.seed},
                {"test_fraction", cal.split_options.test_fraction},
                {"folds_requested", cal.split_options.folds},
                {"test_named_by_user", cal.user_named_test},
                {"setpoints", sps}};
  j["metrics"] = {{"training", metrics_json(cal.training)},
                  {"validation", metrics_json(cal.validation)},
                  {"test", metrics_json(cal.test)}};
  json pts = json::array();
  for (const PointResult& p : cal.points)
    pts.push_back({{"line", p.line},
                   {"setpoint", p.setpoint},
                   {"reading", p.reading},
                   {"reference", p.reference},
                   {"predicted", num(p.predicted)},
                   {"error", num(p.error)},
                   {"role", to_string(p.role)},
                   {"fold", p.fold},
                   {"cv_predicted", num(p.cv_predicted)}});
  j["points"] = pts;
  add_surface_members(j, rec);
  if (!rec.input.columns.direction_column.empty())
    j["input"]["columns"]["direction"] = rec.input.columns.direction_column;
  if (rec.tolerance) j["tolerance"] = to_json(*rec.tolerance);
  if (rec.decision) j["decision"] = to_json(*rec.decision);
  if (rec.uncertainty) j["uncertainty"] = to_json(*rec.uncertainty);
  if (rec.uncertainty || !rec.warnings.empty()) j["warnings"] = to_json(rec.warnings);
  if (rec.lack_of_fit) j["lack_of_fit"] = to_json(*rec.lack_of_fit);
  j["integrity"] = {{"algorithm", "sha256"}, {"sha256", record_digest(j)}};
  return j;
}

std::string record_digest(const json& j) {
  json copy = j;
  if (copy.is_object()) copy.erase("integrity");
  return sha256_hex(copy.dump(-1, ' ', false, json::error_handler_t::replace));
}

bool record_integrity_ok(const json& j) {
  if (!j.is_object()) return false;
  const auto it = j.find("integrity");
  if (it == j.end() || !it->is_object()) return false;
  const auto d = it->find("sha256");
  return d != it->end() && d->is_string() && d->get<std::string>() == record_digest(j);
}

RecordSeal record_seal(const json& j) {
  RecordSeal s;
  s.computed = record_digest(j);
  if (j.is_object()) {
    const auto it = j.find("integrity");
    if (it != j.end() && it->is_object()) {
      const auto d = it->find("sha256");
      if (d != it->end() && d->is_string()) s.stored = d->get<std::string>();
    }
  }
  return s;
}

CalibrationRecord record_from_json(const json& j, const std::string& file) {
  const Reader r{file};
  if (!j.is_object()) r.fail("(top level)", "is not a JSON object");
  if (r.text(j, "format", "record") != kRecordFormat)
    r.fail("format", fmt::format("is not '{}'", kRecordFormat));
  if (r.integer(j, "format_version", "record") != kRecordFormatVersion)
    r.fail("format_version", fmt::format("is not {} (this ridgecal reads version {})",
                                         kRecordFormatVersion, kRecordFormatVersion));
  CalibrationRecord rec;
  rec.tool_version = r.text(j, "tool_version", "record");
  rec.created_utc = r.text_or(j, "created_utc", "");
  rec.cautions.clear();
  for (const json& c : r.array(j, "cautions", "record"))
    if (c.is_string()) rec.cautions.push_back(c.get<std::string>());
  const json& s = r.member(j, "sensor", "record");
  rec.sensor = {r.text(s, "name", "sensor"), r.text(s, "reading_unit", "sensor"),
                r.text(s, "reference_unit", "sensor")};
  const json& in = r.member(j, "input", "record");
  rec.input.file = r.text(in, "file", "input");
  rec.input.sha256 = r.text(in, "sha256", "input");
  rec.input.rows = r.count(in, "rows", "input");
  const json& cols = r.member(in, "columns", "input");
  rec.input.columns.reading_column = r.text(cols, "reading", "input.columns");
  rec.input.columns.reference_column = r.text(cols, "reference", "input.columns");
  rec.input.columns.setpoint_column = r.text_or(cols, "setpoint", "");
  rec.input.columns.role_column = r.text_or(cols, "role", "");
  rec.input.columns.direction_column = r.text_or(cols, "direction", "");
  const std::string delim = r.text_or(cols, "delimiter", ",");
  rec.input.columns.delimiter = delim.size() == 1 ? delim[0] : ',';

  Calibration& cal = rec.calibration;
  const json& m = r.member(j, "model", "record");
  if (is_surface_record(j))
    read_surface_members(j, rec, file);
  else {
    cal.lambda = r.finite(m, "lambda", "model");
    cal.intercept = r.boolean(m, "intercept", "model");
    cal.condition_number = r.number(m, "condition_number", "model");
    const json& sc = r.member(m, "scaling", "model");
    cal.model.scaling.x_min = r.finite(sc, "x_min", "model.scaling");
    cal.model.scaling.x_max = r.finite(sc, "x_max", "model.scaling");
    if (!(cal.model.scaling.x_max > cal.model.scaling.x_min))
      r.fail("model.scaling", "has x_max <= x_min");
    const json& cheb = r.array(m, "chebyshev_coefficients", "model");
    if (cheb.empty() || cheb.size() > 64)
      r.fail("model.chebyshev_coefficients", "has an invalid length");
    for (const json& c : cheb) {
      if (!c.is_number() || !std::isfinite(c.get<double>()))
        r.fail("model.chebyshev_coefficients", "holds a value that is not a finite number");
      cal.model.cheb.push_back(c.get<double>());
    }
    if (r.integer(m, "degree", "model") != cal.model.degree())
      r.fail("model.degree", "does not match the number of coefficients");
  }

  const json& sel = r.member(j, "selection", "record");
  cal.selection.mode = r.enum_value(sel, "mode", "selection", selection_mode_from_string);
  cal.selection.rule = r.enum_value(sel, "rule", "selection", selection_rule_from_string);
  cal.selection.scheme = r.enum_value(sel, "fold_scheme", "selection", fold_scheme_from_string);
  cal.selection.n_folds = r.small(sel, "folds", "selection", 0);
  for (const json& d : r.array(sel, "degrees", "selection"))
    cal.selection.degrees.push_back(r.small_value(d, "selection.degrees", 0, 64));
  for (const json& l : r.array(sel, "lambdas", "selection"))
    cal.selection.lambdas.push_back(r.number_value(l, "selection.lambdas"));
  for (const json& c : r.array(sel, "grid", "selection")) {
    GridCell g;
    g.degree = r.small(c, "degree", "selection.grid[]", 0, 64);
    g.lambda = r.number(c, "lambda", "selection.grid[]");
    g.cv_rmse = r.number(c, "cv_rmse", "selection.grid[]");
    g.cv_se = r.number(c, "cv_se", "selection.grid[]");
    g.train_rmse = r.number(c, "train_rmse", "selection.grid[]");
    if (g.degree == cal.model.degree() && g.lambda == cal.lambda)
      cal.selection.chosen = static_cast<int>(cal.selection.grid.size());
    cal.selection.grid.push_back(g);
  }
  for (const json& n : r.array(sel, "notes", "selection"))
    if (n.is_string()) cal.selection.notes.push_back(n.get<std::string>());

  const json& sp = r.member(j, "split", "record");
  {
    const json& seed = r.member(sp, "seed", "split");
    if (!seed.is_number_integer() || (!seed.is_number_unsigned() && seed.get<long long>() < 0))
      r.fail("split.seed", "is not an integer >= 0");
    cal.split_options.seed = seed.get<std::uint64_t>();
  }
  cal.split_options.test_fraction = r.finite(sp, "test_fraction", "split");
  cal.split_options.folds = r.small(sp, "folds_requested", "split", 0);
  cal.user_named_test = r.boolean(sp, "test_named_by_user", "split");
  for (const json& g : r.array(sp, "setpoints", "split")) {
    SetpointResult s2;
    s2.id = r.text(g, "id", "split.setpoints[]");
    s2.mean_reading = r.finite(g, "reading", "split.setpoints[]");
    s2.mean_reference = r.finite(g, "reference", "split.setpoints[]");
    s2.count = r.count(g, "count", "split.setpoints[]");
    s2.role = r.enum_value(g, "role", "split.setpoints[]", set_role_from_string);
    s2.fold = r.small(g, "fold", "split.setpoints[]");
    cal.setpoints.push_back(s2);
  }
  const json& met = r.member(j, "metrics", "record");
  cal.training = read_metrics(r, r.member(met, "training", "metrics"), "metrics.training");
  cal.validation = read_metrics(r, r.member(met, "validation", "metrics"), "metrics.validation");
  cal.test = read_metrics(r, r.member(met, "test", "metrics"), "metrics.test");
  for (const json& p : r.array(j, "points", "record")) {
    PointResult pr;
    pr.line = r.count(p, "line", "points[]");
    pr.setpoint = r.text(p, "setpoint", "points[]");
    pr.reading = r.finite(p, "reading", "points[]");
    pr.reference = r.finite(p, "reference", "points[]");
    pr.predicted = r.number(p, "predicted", "points[]");
    pr.error = r.number(p, "error", "points[]");
    pr.role = r.enum_value(p, "role", "points[]", set_role_from_string);
    pr.fold = r.small(p, "fold", "points[]");
    pr.cv_predicted = r.number(p, "cv_predicted", "points[]");
    cal.points.push_back(pr);
  }
  if (cal.surface) read_surface_extras(j, cal);
  read_assessment_members(j, rec, file);
  return rec;
}

json parse_record_json(const std::string& text, const std::string& file) {
  // Nesting depth, counted outside strings, before the parser builds anything.
  int depth = 0;
  bool in_string = false, escaped = false;
  std::size_t line = 1;
  for (const char c : text) {
    if (c == '\n') ++line;
    if (in_string) {
      if (escaped)
        escaped = false;
      else if (c == '\\')
        escaped = true;
      else if (c == '"')
        in_string = false;
    } else if (c == '"') {
      in_string = true;
    } else if (c == '[' || c == '{') {
      if (++depth > kMaxRecordDepth)
        throw InputError(file, line,
                         fmt::format("the JSON nests deeper than {} levels", kMaxRecordDepth),
                         "is it a record written by 'ridgecal fit'?");
    } else if (c == ']' || c == '}') {
      --depth;
    }
  }
  try {
    return json::parse(text);
  } catch (const json::parse_error& e) {
    // e.byte is 1-based offset of the failure; turn it into a line number.
    std::size_t at = 1;
    for (std::size_t i = 0; i + 1 < e.byte && i < text.size(); ++i)
      if (text[i] == '\n') ++at;
    throw InputError(file, at, "the file is not valid JSON",
                     "is it a record written by 'ridgecal fit'?");
  } catch (const json::exception& e) {
    // e.g. out_of_range 406: a number literal beyond the range of a double.
    throw InputError(file, 0, std::string("the file is not a usable JSON document: ") + e.what(),
                     "is it a record written by 'ridgecal fit'?");
  }
}

json read_record_json(const std::string& path) {
  return parse_record_json(
      read_file_bytes_limited(path, kMaxRecordBytes, "a record is never this large"), path);
}

std::string record_text(const json& j) {
  return j.dump(2, ' ', false, json::error_handler_t::replace) + "\n";
}

}  // namespace ridgecal
