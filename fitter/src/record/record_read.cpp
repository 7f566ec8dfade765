// The one reader of the record (record.hpp; docs/record-format.md): strict
// (json_read.hpp), every failure an InputError naming the member. The model
// part is read by record_model.cpp.
#include <fmt/format.h>

#include <cmath>
#include <cstdint>
#include <limits>

#include "ridgecal/atomic_file.hpp"
#include "ridgecal/errors.hpp"
#include "ridgecal/json_read.hpp"
#include "ridgecal/record.hpp"
#include "ridgecal/record_model.hpp"

namespace ridgecal {

using nlohmann::json;

namespace {

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

// A member of the extended layout's rows: an integer or null (absent in the
// polynomial layout); `fallback` when it is not an integer.
int integer_or(const json& obj, const char* key, int fallback) {
  const auto it = obj.find(key);
  return it != obj.end() && it->is_number_integer() ? it->get<int>() : fallback;
}

// The aux value of a setpoint or point: a number, or NaN (null or absent).
double aux_value(const json& obj) {
  const auto it = obj.find("aux");
  return it != obj.end() && it->is_number() ? it->get<double>()
                                            : std::numeric_limits<double>::quiet_NaN();
}

GridCell read_cell(const Reader& r, const json& c, const std::string& where) {
  GridCell g;
  g.degree = r.small(c, "degree", where, 0, 64);
  g.lambda = r.number(c, "lambda", where);
  g.cv_rmse = r.number(c, "cv_rmse", where);
  g.cv_se = r.number(c, "cv_se", where);
  g.train_rmse = r.number(c, "train_rmse", where);
  g.aux_degree = integer_or(c, "aux_degree", -1);
  g.terms = integer_or(c, "terms", 0);
  return g;
}

bool same_cell(const GridCell& a, const GridCell& b) {
  return a.degree == b.degree && a.lambda == b.lambda && a.aux_degree == b.aux_degree &&
         a.terms == b.terms;
}

SelectionInfo read_selection(const Reader& r, const json& sel) {
  SelectionInfo s;
  s.mode = r.enum_value(sel, "mode", "selection", selection_mode_from_string);
  s.rule = r.enum_value(sel, "rule", "selection", selection_rule_from_string);
  s.scheme = r.enum_value(sel, "fold_scheme", "selection", fold_scheme_from_string);
  s.n_folds = r.small(sel, "folds", "selection", 0);
  for (const json& d : r.array(sel, "degrees", "selection"))
    s.degrees.push_back(r.small_value(d, "selection.degrees", 0, 64));
  for (const json& l : r.array(sel, "lambdas", "selection"))
    s.lambdas.push_back(r.number_value(l, "selection.lambdas"));
  for (const json& c : r.array(sel, "grid", "selection"))
    s.grid.push_back(read_cell(r, c, "selection.grid[]"));
  // `chosen` is a copy of a grid cell (null: none); the last cell equal to it.
  const auto ch = sel.find("chosen");
  if (ch != sel.end() && !ch->is_null()) {
    const GridCell chosen = read_cell(r, *ch, "selection.chosen");
    for (std::size_t i = 0; i < s.grid.size(); ++i)
      if (same_cell(s.grid[i], chosen)) s.chosen = static_cast<int>(i);
  }
  for (const json& n : r.array(sel, "notes", "selection"))
    if (n.is_string()) s.notes.push_back(n.get<std::string>());
  for (const char* key : {"aux_degrees", "powers"}) {
    const auto it = sel.find(key);
    if (it == sel.end() || !it->is_array()) continue;
    for (const json& v : *it)
      if (v.is_number_integer())
        (std::string(key) == "powers" ? s.powers : s.aux_degrees).push_back(v.get<int>());
  }
  return s;
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
  if (const auto dc = cols.find("decimal_comma"); dc != cols.end()) {
    if (!dc->is_boolean()) r.fail("input.columns.decimal_comma", "is not true or false");
    rec.input.columns.decimal_comma = dc->get<bool>();
  }

  model_from_json(j, rec, file);
  Calibration& cal = rec.calibration;
  cal.selection = read_selection(r, r.member(j, "selection", "record"));

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
    s2.mean_aux = aux_value(g);
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
    pr.aux = aux_value(p);
    cal.points.push_back(pr);
  }
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

}  // namespace ridgecal
