#include "ridgecal/as_found.hpp"

#include <fmt/format.h>

#include <cassert>
#include <cmath>

#include "ridgecal/json_read.hpp"

namespace ridgecal {

CheckedRecord read_checked_record(const std::string& path, bool allow_modified) {
  const nlohmann::json j = read_record_json(path);
  CheckedRecord c;
  c.file = path;
  c.integrity_ok = record_integrity_ok(j);
  if (j.is_object() && j.contains("integrity") && j["integrity"].is_object() &&
      j["integrity"].contains("sha256") && j["integrity"]["sha256"].is_string())
    c.digest = j["integrity"]["sha256"].get<std::string>();
  if (!c.integrity_ok && !allow_modified)
    throw InputError(
        path, 0,
        c.digest.empty()
            ? "the record has no integrity digest, so it cannot be trusted"
            : "the record's integrity digest does not match its content: the record was "
              "modified after 'ridgecal fit' wrote it",
        "re-create it with 'ridgecal fit DATA.csv -o RECORD.json' from the original data, or pass "
        "--allow-modified to use it anyway (the output will say so)");
  c.modified_allowed = !c.integrity_ok;
  // Strict for every member, the tolerance and uncertainty verify relies on
  // included: a member in another layout is an error, not a silent "no tolerance".
  c.record = record_from_json(j, path);
  return c;
}

std::string AsFoundOptions::validate() const {
  if (tolerance)
    if (std::string e = tolerance->validate(); !e.empty()) return "tolerance: " + e;
  return validate_tur_warning(tur_warning);
}

AsFoundResult evaluate_as_found(const CheckedRecord& rec, const Dataset& data,
                                const AsFoundOptions& options) {
  assert(options.validate().empty());
  const Calibration& cal = rec.record.calibration;
  AsFoundResult r;
  r.record_file = rec.file;
  r.record_digest = rec.digest;
  r.integrity_ok = rec.integrity_ok;
  r.modified_allowed = rec.modified_allowed;
  r.data_file = data.file;
  r.data_sha256 = data.sha256;
  r.rows = data.rows.size();
  r.uncertainty = rec.record.uncertainty;
  if (rec.modified_allowed) {
    Warning w;
    w.code = DiagnosticCode::RecordModified;
    w.message = fmt::format(
        "The record {} does not match its integrity digest (modified after it was written); it "
        "was used only because --allow-modified was given.",
        rec.file);
    r.warnings.push_back(w);
  }

  // One model for every record: the general model (N = 1 for one input).
  const Model m = general_model(cal);
  std::vector<double> refs, preds, xs, as;
  std::vector<std::size_t> lines;
  for (const Observation& ob : data.rows) {
    AsFoundPoint p;
    p.line = ob.line;
    p.setpoint = ob.setpoint;
    p.reading = ob.reading;
    p.reference = ob.reference;
    const double u = m.transforms.input(ob.reading);
    if (!std::isfinite(u))
      throw InputError(
          data.file, ob.line,
          fmt::format(
              "the reading {} is outside the domain of the record's reading transforms ({})",
              ob.reading, m.transforms.describe()),
          "check the reading column and the record");
    p.predicted = m.eval(ob.reading, ob.aux);
    p.error = p.predicted - p.reference;
    p.in_range = m.input.contains(u) && (!m.has_aux || m.aux.contains(ob.aux));
    refs.push_back(p.reference);
    preds.push_back(p.predicted);
    xs.push_back(p.reading);
    as.push_back(ob.aux);
    lines.push_back(p.line);
    r.points.push_back(p);
  }
  r.degree = m.total_degree();
  r.range = Scaling{m.input.min, m.input.max};  // of the transformed reading
  r.metrics = compute_metrics(refs, preds, static_cast<int>(m.terms.size()) - 1, cal.intercept);
  for (Warning& w : check_extrapolation(m, xs, as, lines, "as-found readings"))
    r.warnings.push_back(w);

  if (options.tolerance) {
    r.tolerance = options.tolerance;
    r.tolerance_source = "command line";
  } else if (rec.record.tolerance) {
    r.tolerance = rec.record.tolerance;
    r.tolerance_source = "record";
  }
  if (r.tolerance) {
    const DecisionRule rule = options.rule ? *options.rule
                                           : (rec.record.decision ? rec.record.decision->rule
                                                                  : DecisionRule::SimpleAcceptance);
    if (rule == DecisionRule::GuardedAcceptance && !r.uncertainty)
      throw InputError(
          rec.file, 0, "guarded acceptance needs the record's uncertainty, and the record has none",
          "use --decision simple, or re-create the record with a current 'ridgecal fit'");
    std::vector<PointToJudge> pts;
    for (const AsFoundPoint& p : r.points)
      pts.push_back({p.line, "as-found", p.reference, p.error,
                     r.uncertainty ? r.uncertainty->expanded_at(p.reading) : 0.0, p.setpoint});
    r.decision = judge(pts, *r.tolerance, rule, {}, options.tur_warning);
  }
  return r;
}

namespace {
// The lines brief() and full() share: the record, the metrics, the tolerance.
std::string as_found_head(const AsFoundResult& r, const std::string& unit) {
  std::string s = fmt::format(
      "as-found: {} points of {} against the record {} (degree {}, range {:g}..{:g})\n",
      r.points.size(), r.data_file, r.record_file, r.degree, r.range.x_min, r.range.x_max);
  if (!r.integrity_ok)
    s += "record: MODIFIED (integrity digest does not match; used with --allow-modified)\n";
  s += "as-found:   " + r.metrics.brief() + "\n";
  if (r.tolerance)
    s += fmt::format("tolerance: {}{} (from the {})\n", r.tolerance->describe(),
                     unit.empty() ? "" : " " + unit, r.tolerance_source);
  if (r.uncertainty && r.uncertainty->inadequacy.included)
    s += fmt::format(
        "uncertainty: the record's U includes a model-inadequacy term of up to {:.3g}{} (the "
        "curve family cannot follow the sensor everywhere; see the record's budget)\n",
        r.uncertainty->inadequacy.largest(), unit.empty() ? "" : " " + unit);
  return s;
}
}  // namespace

std::string AsFoundResult::brief(const std::string& unit) const {
  std::string s = as_found_head(*this, unit);
  if (decision)
    s += decision->brief();  // the first points that do not conform or are not shown
  else
    s += "decision: none (no tolerance in the record or on the command line)\n";
  return s;
}

std::string AsFoundResult::full(const std::string& unit) const {
  std::string s = as_found_head(*this, unit);
  if (decision)
    s += decision->full();  // the statement and every point that does not conform or is not shown
  else
    s += "decision: none (no tolerance in the record or on the command line)\n";
  // The judged points are the as-found points in the same order (evaluate_as_found).
  const bool judged = decision && decision->points.size() == points.size();
  s += judged ? "points (line, setpoint, reading, reference, calibrated value, error, limit, U, "
                "limit/U, conformity):\n"
              : "points (line, setpoint, reading, reference, calibrated value, error):\n";
  for (std::size_t i = 0; i < points.size(); ++i) {
    const AsFoundPoint& p = points[i];
    s += fmt::format("  {:>6} {:<10} {:<14g} {:<14g} {:<14.8g} {:<+11.4g}", p.line, p.setpoint,
                     p.reading, p.reference, p.predicted, p.error);
    if (judged) {
      const PointJudgement& pj = decision->points[i];
      s += fmt::format(" {:<10.4g} {:<10.3g} {:<7} {}", pj.limit, pj.uncertainty,
                       std::isfinite(pj.tur) ? fmt::format("{:.2g}", pj.tur) : std::string("-"),
                       conformity_statement(pj.conformity));
    }
    s += p.in_range ? "\n" : "  (outside the calibrated range)\n";
  }
  return s;
}

nlohmann::json as_found_to_json(const AsFoundResult& r, const std::string& created_utc) {
  using detail::num;
  nlohmann::json j;
  j["format"] = kAsFoundFormat;
  j["format_version"] = kAsFoundFormatVersion;
  j["tool_version"] = tool_version();
  if (!created_utc.empty()) j["created_utc"] = created_utc;
  j["record"] = {{"file", r.record_file},
                 {"sha256", r.record_digest},
                 {"integrity_ok", r.integrity_ok},
                 {"modified_allowed", r.modified_allowed},
                 {"degree", r.degree},
                 {"x_min", r.range.x_min},
                 {"x_max", r.range.x_max}};
  j["input"] = {{"file", r.data_file}, {"sha256", r.data_sha256}, {"rows", r.rows}};
  const Metrics& m = r.metrics;
  nlohmann::json pts = nlohmann::json::array();
  for (const AsFoundPoint& p : r.points)
    pts.push_back({{"line", p.line},
                   {"setpoint", p.setpoint},
                   {"reading", p.reading},
                   {"reference", p.reference},
                   {"predicted", num(p.predicted)},
                   {"error", num(p.error)},
                   {"in_range", p.in_range}});
  j["as_found"] = {{"metrics",
                    {{"n", m.n},
                     {"rmse", num(m.rmse)},
                     {"max_abs_error", num(m.max_abs_error)},
                     {"bias", num(m.bias)},
                     {"r2", num(m.r2)}}},
                   {"points", pts}};
  if (r.tolerance) {
    j["tolerance"] = to_json(*r.tolerance);
    j["tolerance_source"] = r.tolerance_source;
  }
  if (r.decision) j["decision"] = to_json(*r.decision);
  if (r.uncertainty) j["uncertainty"] = to_json(*r.uncertainty);
  j["warnings"] = to_json(r.warnings);
  j["integrity"] = {{"algorithm", "sha256"}, {"sha256", record_digest(j)}};
  return j;
}

}  // namespace ridgecal
