#include "ridgecal/batch_summary.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <charconv>
#include <cmath>
#include <limits>
#include <map>

#include "ridgecal/atomic_file.hpp"
#include "ridgecal/errors.hpp"
#include "ridgecal/record.hpp"
#include "ridgecal/sha256.hpp"

namespace ridgecal {

using nlohmann::json;

std::string to_string(UnitStatus s) {
  return s == UnitStatus::Ok ? "ok" : "failed";
}
UnitStatus unit_status_from_string(const std::string& s) {
  if (s == "ok") return UnitStatus::Ok;
  if (s == "failed") return UnitStatus::Failed;
  throw std::invalid_argument("unit status must be 'ok' or 'failed', got '" + s + "'");
}

std::string to_string(UnitVerdict v) {
  switch (v) {
    case UnitVerdict::Pass:
      return "PASS";
    case UnitVerdict::Fail:
      return "FAIL";
    case UnitVerdict::Undecided:
      return "UNDECIDED";
    default:
      return "n/a";
  }
}
UnitVerdict unit_verdict_from_string(const std::string& s) {
  if (s == "n/a") return UnitVerdict::NotAssessed;
  if (s == "PASS") return UnitVerdict::Pass;
  if (s == "FAIL") return UnitVerdict::Fail;
  if (s == "UNDECIDED") return UnitVerdict::Undecided;
  throw std::invalid_argument("verdict must be 'n/a', 'PASS', 'FAIL' or 'UNDECIDED', got '" + s +
                              "'");
}

namespace {

json num(double v) {
  return std::isfinite(v) ? json(v) : json(nullptr);
}
std::string csv_num(double v) {
  return std::isfinite(v) ? fmt::format("{}", v) : std::string();
}

std::string csv_field(const std::string& s) {
  if (s.find_first_of(",\"\r\n") == std::string::npos) return s;
  std::string q = "\"";
  for (char c : s) {
    if (c == '"') q += '"';
    q += c;
  }
  return q + '"';
}

// The whole cell is a plain finite number (an optional sign, as
// calibration_csv.cpp reads numbers).
bool plain_number(const std::string& s) {
  const char* b = s.data();
  const char* e = b + s.size();
  if (b != e && *b == '+') ++b;
  double v = 0;
  const auto r = std::from_chars(b, e, v, std::chars_format::general);
  return b != e && r.ec == std::errc() && r.ptr == e && std::isfinite(v);
}

std::string joined(const std::vector<std::string>& v) {
  std::string s;
  for (const auto& w : v) s += (s.empty() ? "" : "; ") + w;
  return s;
}

[[noreturn]] void bad(const std::string& file, const std::string& what) {
  throw InputError(file, 0, "not a valid batch summary: " + what,
                   "give summary.json files written by 'ridgecal batch'");
}

double number_or_nan(const json& j, const char* key, const std::string& file) {
  const auto it = j.find(key);
  if (it == j.end()) bad(file, fmt::format("a unit has no '{}'", key));
  if (it->is_null()) return std::numeric_limits<double>::quiet_NaN();
  if (!it->is_number()) bad(file, fmt::format("'{}' is not a number", key));
  return it->get<double>();
}

std::string text(const json& j, const char* key, const std::string& file) {
  const auto it = j.find(key);
  if (it == j.end() || !it->is_string()) bad(file, fmt::format("'{}' is missing or not text", key));
  return it->get<std::string>();
}

}  // namespace

std::string csv_text_cell(const std::string& s) {
  if (s.empty()) return s;
  const char c = s[0];
  const bool formula = c == '=' || c == '@' || c == '\t' || c == '\r' ||
                       ((c == '+' || c == '-') && !plain_number(s));
  return csv_field(formula ? "'" + s : s);
}

void BatchTotals::add(const UnitSummary& u) {
  ++units;
  if (u.status != UnitStatus::Ok)
    ++not_fitted;
  else if (u.verdict == UnitVerdict::Pass)
    ++passed;
  else if (u.verdict == UnitVerdict::Fail)
    ++out_of_tolerance;
  else if (u.verdict == UnitVerdict::Undecided)
    ++undecided;
  else
    ++not_judged;
  if (u.reason != UnitReason::None) ++reasons[to_string(u.reason)];
}

std::string BatchTotals::line() const {
  return fmt::format(
      "{} units: {} passed, {} out of tolerance, {} undecided, {} not judged, {} not "
      "fitted",
      units, passed, out_of_tolerance, undecided, not_judged, not_fitted);
}

std::string BatchTotals::reasons_line() const {
  std::vector<std::pair<std::string, std::uint64_t>> v(reasons.begin(), reasons.end());
  std::stable_sort(v.begin(), v.end(), [](const auto& a, const auto& b) {
    return a.second > b.second;  // by count; the map gave code order for ties
  });
  std::string s;
  for (const auto& [code, n] : v)
    s += fmt::format("{}{} {}", s.empty() ? "reasons: " : ", ", code, n);
  return s;
}

json BatchTotals::to_json() const {
  json r = json::object();
  for (const auto& [code, n] : reasons) r[code] = n;
  return json{{"units", units},
              {"passed", passed},
              {"out_of_tolerance", out_of_tolerance},
              {"undecided", undecided},
              {"not_judged", not_judged},
              {"not_fitted", not_fitted},
              {"reasons", r}};
}

std::string summary_csv_header() {
  return "unit,status,rows,degree,lambda,validation_rmse,test_rmse,max_abs_error,verdict,reason,"
         "worst_setpoint,worst_ratio,worst_excess,warnings,error,record\n";
}

std::string summary_csv_row(const UnitSummary& u) {
  return fmt::format(
      "{},{},{},{},{},{},{},{},{},{},{},{},{},{},{},{}\n", csv_text_cell(u.unit),
      to_string(u.status), u.rows, u.degree >= 0 ? std::to_string(u.degree) : std::string(),
      csv_num(u.lambda), csv_num(u.validation_rmse), csv_num(u.test_rmse), csv_num(u.max_abs_error),
      to_string(u.verdict), to_string(u.reason), csv_text_cell(u.worst.setpoint),
      csv_num(u.worst.ratio), csv_num(u.worst.excess), csv_text_cell(joined(u.warnings)),
      csv_text_cell(u.error), csv_text_cell(u.record));
}

json unit_summary_to_json(const UnitSummary& u) {
  return json{{"unit", u.unit},
              {"status", to_string(u.status)},
              {"rows", u.rows},
              {"degree", u.degree >= 0 ? json(u.degree) : json(nullptr)},
              {"lambda", num(u.lambda)},
              {"validation_rmse", num(u.validation_rmse)},
              {"test_rmse", num(u.test_rmse)},
              {"max_abs_error", num(u.max_abs_error)},
              {"verdict", to_string(u.verdict)},
              {"reason", to_string(u.reason)},
              {"worst_setpoint", u.worst.setpoint},
              {"worst_ratio", num(u.worst.ratio)},
              {"worst_excess", num(u.worst.excess)},
              {"warnings", u.warnings},
              {"error", u.error},
              {"record", u.record}};
}

UnitSummary unit_summary_from_json(const json& j, const std::string& file) {
  if (!j.is_object()) bad(file, "a unit entry is not an object");
  UnitSummary u;
  u.unit = text(j, "unit", file);
  try {
    u.status = unit_status_from_string(text(j, "status", file));
    u.verdict = unit_verdict_from_string(text(j, "verdict", file));
  } catch (const std::invalid_argument& e) {
    bad(file, e.what());
  }
  const auto rows = j.find("rows");
  if (rows == j.end() || !rows->is_number_unsigned()) bad(file, "'rows' is missing or not a count");
  u.rows = rows->get<std::size_t>();
  const auto deg = j.find("degree");
  if (deg == j.end() || !(deg->is_null() || deg->is_number_integer()))
    bad(file, "'degree' is not an integer");
  u.degree = deg->is_null() ? -1 : deg->get<int>();
  u.lambda = number_or_nan(j, "lambda", file);
  u.validation_rmse = number_or_nan(j, "validation_rmse", file);
  u.test_rmse = number_or_nan(j, "test_rmse", file);
  u.max_abs_error = number_or_nan(j, "max_abs_error", file);
  if (j.contains("reason")) {  // format version 2
    try {
      u.reason = unit_reason_from_string(text(j, "reason", file));
    } catch (const std::invalid_argument& e) {
      bad(file, e.what());
    }
    u.worst.setpoint = text(j, "worst_setpoint", file);
    u.worst.ratio = number_or_nan(j, "worst_ratio", file);
    u.worst.excess = number_or_nan(j, "worst_excess", file);
  } else {  // version 1: the reason the verdict alone gives
    u.reason = u.status != UnitStatus::Ok            ? UnitReason::BadInput
               : u.verdict == UnitVerdict::Pass      ? UnitReason::None
               : u.verdict == UnitVerdict::Fail      ? UnitReason::OutOfTolerance
               : u.verdict == UnitVerdict::Undecided ? UnitReason::Undecided
                                                     : UnitReason::NotJudged;
  }
  const auto w = j.find("warnings");
  if (w == j.end() || !w->is_array()) bad(file, "'warnings' is not a list");
  for (const auto& x : *w) {
    if (!x.is_string()) bad(file, "a warning is not text");
    u.warnings.push_back(x.get<std::string>());
  }
  u.error = text(j, "error", file);
  u.record = text(j, "record", file);
  return u;
}

std::string summary_json_head(const std::string& created_utc, const json& settings,
                              const std::vector<std::string>& inputs) {
  std::string s = "{\n";
  s += fmt::format("  \"format\": {},\n", json(kBatchSummaryFormat).dump());
  s += fmt::format("  \"format_version\": {},\n", kBatchSummaryFormatVersion);
  s += fmt::format("  \"tool_version\": {},\n", json(tool_version()).dump());
  if (!created_utc.empty()) s += fmt::format("  \"created_utc\": {},\n", json(created_utc).dump());
  s += fmt::format("  \"settings\": {},\n",
                   settings.dump(-1, ' ', false, json::error_handler_t::replace));
  s += fmt::format("  \"settings_sha256\": \"{}\",\n",
                   sha256_hex(settings.dump(-1, ' ', false, json::error_handler_t::replace)));
  s += fmt::format("  \"inputs\": {},\n",
                   json(inputs).dump(-1, ' ', false, json::error_handler_t::replace));
  s += "  \"units\": [";
  return s;
}

std::string summary_json_unit(const UnitSummary& u, bool first) {
  // Written directly (this runs once per unit on the batch's main thread);
  // the same members and values as unit_summary_to_json, in a fixed order.
  auto str = [](const std::string& v) {
    return json(v).dump(-1, ' ', false, json::error_handler_t::replace);
  };
  auto jnum = [](double v) {
    return std::isfinite(v) ? fmt::format("{}", v) : std::string("null");
  };
  std::string w = "[";
  for (std::size_t i = 0; i < u.warnings.size(); ++i) w += (i ? "," : "") + str(u.warnings[i]);
  w += "]";
  return fmt::format(
      "{}{{\"unit\":{},\"status\":\"{}\",\"rows\":{},\"degree\":{},\"lambda\":{},\"validation_"
      "rmse\":{},"
      "\"test_rmse\":{},\"max_abs_error\":{},\"verdict\":\"{}\",\"reason\":\"{}\","
      "\"worst_setpoint\":{},\"worst_ratio\":{},\"worst_excess\":{},\"warnings\":{},\"error\":{},"
      "\"record\":{}}}",
      first ? "\n    " : ",\n    ", str(u.unit), to_string(u.status), u.rows,
      u.degree >= 0 ? std::to_string(u.degree) : std::string("null"), jnum(u.lambda),
      jnum(u.validation_rmse), jnum(u.test_rmse), jnum(u.max_abs_error), to_string(u.verdict),
      to_string(u.reason), str(u.worst.setpoint), jnum(u.worst.ratio), jnum(u.worst.excess), w,
      str(u.error), str(u.record));
}

std::string summary_json_tail(const BatchTotals& totals, const std::string& partial) {
  return fmt::format("\n  ],\n  \"totals\": {}{}\n}}\n", totals.to_json().dump(),
                     partial.empty() ? std::string() : ",\n  \"partial\": " + partial);
}

BatchSummary read_batch_summary(const std::string& path) {
  json j;
  try {
    j = json::parse(read_file_bytes(path));
  } catch (const json::exception& e) {
    throw InputError(path, 0, std::string("not valid JSON: ") + e.what(),
                     "give summary.json files written by 'ridgecal batch'");
  }
  if (!j.is_object()) bad(path, "the top level is not an object");
  if (const auto p = j.find("partial"); p != j.end()) {
    std::string what = "it was interrupted";
    if (p->is_object() && p->contains("signal") && (*p)["signal"].is_string() &&
        p->contains("units_completed") && (*p)["units_completed"].is_number_unsigned())
      what =
          fmt::format("it was interrupted by {} after {} units", (*p)["signal"].get<std::string>(),
                      (*p)["units_completed"].get<std::uint64_t>());
    throw InputError(path, 0, "the summary of an unfinished batch is partial: " + what,
                     "run the batch of this shard again to the end, then merge");
  }
  if (text(j, "format", path) != kBatchSummaryFormat)
    bad(path, "'format' is not ridgecal-batch-summary");
  const auto v = j.find("format_version");
  if (v == j.end() || !v->is_number_integer() || v->get<int>() < 1 ||
      v->get<int>() > kBatchSummaryFormatVersion)
    bad(path, fmt::format("'format_version' is not 1 .. {}", kBatchSummaryFormatVersion));
  BatchSummary s;
  s.tool_version = text(j, "tool_version", path);
  if (j.contains("created_utc") && j["created_utc"].is_string())
    s.created_utc = j["created_utc"].get<std::string>();
  if (!j.contains("settings") || !j["settings"].is_object()) bad(path, "'settings' is missing");
  s.settings = j["settings"];
  s.settings_sha256 = text(j, "settings_sha256", path);
  if (!j.contains("inputs") || !j["inputs"].is_array()) bad(path, "'inputs' is missing");
  for (const auto& x : j["inputs"])
    if (x.is_string()) s.inputs.push_back(x.get<std::string>());
  if (!j.contains("units") || !j["units"].is_array()) bad(path, "'units' is missing");
  for (const auto& u : j["units"]) s.units.push_back(unit_summary_from_json(u, path));
  return s;
}

BatchSummary merge_batch_summaries(const std::vector<BatchSummary>& shards,
                                   const std::vector<std::string>& names,
                                   const MergeOptions& options) {
  BatchSummary out;
  if (shards.empty()) return out;
  out.tool_version = shards.front().tool_version;
  out.settings = shards.front().settings;
  out.settings_sha256 = shards.front().settings_sha256;
  for (const auto& s : shards) out.created_utc = std::max(out.created_utc, s.created_utc);
  std::map<std::string, std::size_t> where;  // unit -> shard
  for (std::size_t i = 0; i < shards.size(); ++i) {
    const BatchSummary& s = shards[i];
    const std::string& name = i < names.size() ? names[i] : fmt::format("shard {}", i + 1);
    if (s.settings_sha256 != out.settings_sha256 && !options.allow_mixed_settings)
      throw InputError(
          name, 0,
          fmt::format("its fit settings differ from those of {} (settings_sha256 {} vs {})",
                      names.empty() ? "the first shard" : names.front(), s.settings_sha256,
                      out.settings_sha256),
          "shard one batch with the same options everywhere, or pass --allow-mixed-settings");
    out.inputs.insert(out.inputs.end(), s.inputs.begin(), s.inputs.end());
    for (const UnitSummary& u : s.units) {
      const auto [it, fresh] = where.emplace(u.unit, i);
      // (within one shard the batch itself reported a unit that appears again)
      if (!fresh && it->second != i)
        throw InputError(
            name, 0,
            fmt::format("unit '{}' is also in {}", u.unit,
                        it->second < names.size() ? names[it->second] : "another shard"),
            "each unit must be fitted in exactly one shard");
      out.units.push_back(u);
    }
  }
  std::stable_sort(out.units.begin(), out.units.end(),
                   [](const UnitSummary& a, const UnitSummary& b) { return a.unit < b.unit; });
  if (options.allow_mixed_settings) {
    bool mixed = false;
    for (const auto& s : shards) mixed = mixed || s.settings_sha256 != out.settings_sha256;
    if (mixed) out.settings_sha256 = "mixed";
  }
  return out;
}

void write_batch_summary(const BatchSummary& s, const std::string& dir) {
  std::string js = summary_json_head(s.created_utc, s.settings, s.inputs);
  std::string csv = summary_csv_header();
  BatchTotals totals;
  for (std::size_t i = 0; i < s.units.size(); ++i) {
    js += summary_json_unit(s.units[i], i == 0);
    csv += summary_csv_row(s.units[i]);
    totals.add(s.units[i]);
  }
  js += summary_json_tail(totals);
  if (s.settings_sha256 == "mixed") {
    const std::string key = "\"settings_sha256\": \"";
    const auto p = js.find(key);
    if (p != std::string::npos) js.replace(p + key.size(), 64, "mixed");
  }
  write_file_atomic(dir + "/summary.json", js);
  write_file_atomic(dir + "/summary.csv", csv);
}

}  // namespace ridgecal
