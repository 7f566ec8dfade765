// The one writer of the record (record.hpp; docs/record-format.md): the
// common members, the model part from record_model.cpp, the assessment
// members, and the integrity seal.
#include <cmath>

#include "ridgecal/json_read.hpp"
#include "ridgecal/record.hpp"
#include "ridgecal/record_model.hpp"
#include "ridgecal/sha256.hpp"

namespace ridgecal {

using detail::num;
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

// A grid cell; the extended layout adds its aux degree limit and term count.
json cell_json(const GridCell& c, bool extended) {
  json o{{"degree", c.degree},
         {"lambda", c.lambda},
         {"cv_rmse", num(c.cv_rmse)},
         {"cv_se", num(c.cv_se)},
         {"train_rmse", num(c.train_rmse)}};
  if (extended) {
    o["aux_degree"] = c.aux_degree >= 0 ? json(c.aux_degree) : json(nullptr);
    o["terms"] = c.terms;
  }
  return o;
}

json columns_json(const CsvOptions& c, bool extended) {
  json o{{"reading", c.reading_column},
         {"reference", c.reference_column},
         {"setpoint", c.setpoint_column},
         {"role", c.role_column},
         {"delimiter", std::string(1, c.delimiter)}};
  if (!c.direction_column.empty()) o["direction"] = c.direction_column;
  // only when set: records read with a decimal point keep their bytes and digest
  if (c.decimal_comma) o["decimal_comma"] = true;
  if (extended && !c.aux_column.empty()) o["aux"] = c.aux_column;
  if (extended && !c.aux_setpoint_column.empty()) o["aux_setpoint"] = c.aux_setpoint_column;
  return o;
}

json selection_json(const SelectionInfo& s, bool extended) {
  json grid = json::array();
  for (const GridCell& c : s.grid) grid.push_back(cell_json(c, extended));
  json o{{"mode", to_string(s.mode)},
         {"rule", to_string(s.rule)},
         {"fold_scheme", to_string(s.scheme)},
         {"folds", s.n_folds},
         {"degrees", s.degrees},
         {"lambdas", s.lambdas},
         {"grid", grid},
         {"chosen", s.chosen >= 0 ? cell_json(s.grid[static_cast<std::size_t>(s.chosen)], extended)
                                  : json(nullptr)},
         {"notes", s.notes}};
  if (extended) {
    o["aux_degrees"] = s.aux_degrees;
    o["powers"] = s.powers;
  }
  return o;
}

json split_json(const Calibration& cal, bool has_aux) {
  json sps = json::array();
  for (const SetpointResult& sp : cal.setpoints) {
    json o{{"id", sp.id},       {"reading", sp.mean_reading}, {"reference", sp.mean_reference},
           {"count", sp.count}, {"role", to_string(sp.role)}, {"fold", sp.fold}};
    if (has_aux) o["aux"] = num(sp.mean_aux);
    sps.push_back(std::move(o));
  }
  return json{{"seed", cal.split_options.seed},
              {"test_fraction", cal.split_options.test_fraction},
              {"folds_requested", cal.split_options.folds},
              {"test_named_by_user", cal.user_named_test},
              {"setpoints", sps}};
}

json points_json(const std::vector<PointResult>& points, bool has_aux) {
  json pts = json::array();
  for (const PointResult& p : points) {
    json o{{"line", p.line},
           {"setpoint", p.setpoint},
           {"reading", p.reading},
           {"reference", p.reference},
           {"predicted", num(p.predicted)},
           {"error", num(p.error)},
           {"role", to_string(p.role)},
           {"fold", p.fold},
           {"cv_predicted", num(p.cv_predicted)}};
    if (has_aux) o["aux"] = num(p.aux);
    pts.push_back(std::move(o));
  }
  return pts;
}

}  // namespace

json record_to_json(const CalibrationRecord& rec) {
  const Calibration& cal = rec.calibration;
  const ModelParts model = model_to_json(rec);
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
                {"columns", columns_json(rec.input.columns, model.extended)}};
  j["model"] = model.model;
  if (model.extended) j["compensation"] = model.compensation;
  j["selection"] = selection_json(cal.selection, model.extended);
  j["split"] = split_json(cal, model.has_aux);
  j["metrics"] = {{"training", metrics_json(cal.training)},
                  {"validation", metrics_json(cal.validation)},
                  {"test", metrics_json(cal.test)}};
  j["points"] = points_json(cal.points, model.has_aux);
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
  const RecordSeal s = record_seal(j);
  return j.is_object() && s.intact();
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

std::string record_text(const json& j) {
  return j.dump(2, ' ', false, json::error_handler_t::replace) + "\n";
}

}  // namespace ridgecal
