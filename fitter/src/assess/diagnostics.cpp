#include "ridgecal/diagnostics.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <stdexcept>

#include "ridgecal/diag_common.hpp"
#include "ridgecal/json_read.hpp"
#include "ridgecal/lack_of_fit.hpp"

namespace ridgecal {

namespace {
struct CodeName {
  DiagnosticCode code;
  const char* name;
};
constexpr CodeName kCodes[] = {
    {DiagnosticCode::TestMuchWorseThanValidation, "test-much-worse-than-validation"},
    {DiagnosticCode::DegreeAtGridEdge, "degree-at-grid-edge"},
    {DiagnosticCode::LambdaAtGridEdge, "lambda-at-grid-edge"},
    {DiagnosticCode::FewSetpointsPerCoefficient, "few-setpoints-per-coefficient"},
    {DiagnosticCode::RangeNotCovered, "range-not-covered"},
    {DiagnosticCode::CoverageGap, "coverage-gap"},
    {DiagnosticCode::Outlier, "outlier"},
    {DiagnosticCode::ResidualPattern, "residual-pattern"},
    {DiagnosticCode::NonMonotonic, "non-monotonic"},
    {DiagnosticCode::Hysteresis, "hysteresis"},
    {DiagnosticCode::HighConditionNumber, "high-condition-number"},
    {DiagnosticCode::Extrapolation, "extrapolation"},
    {DiagnosticCode::RecordModified, "record-modified"},
    {DiagnosticCode::ValidationMuchWorseThanTraining, "validation-much-worse-than-training"},
    {DiagnosticCode::LackOfFit, "lack-of-fit"},
    {DiagnosticCode::DriftBetweenRepeats, "drift-between-repeats"},
};

}  // namespace

namespace detail {
std::string line_list(const std::vector<std::size_t>& lines, std::size_t max_shown) {
  std::string s;
  for (std::size_t i = 0; i < lines.size() && i < max_shown; ++i)
    s += (i ? ", " : "") + std::to_string(lines[i]);
  if (lines.size() > max_shown) s += fmt::format(" and {} more", lines.size() - max_shown);
  return s;
}

Warning make_warning(DiagnosticCode c, std::string msg, std::vector<std::size_t> lines,
                     double value) {
  Warning w;
  w.code = c;
  w.message = std::move(msg);
  w.lines = std::move(lines);
  w.value = value;
  return w;
}
}  // namespace detail

std::string to_string(DiagnosticCode c) {
  for (const CodeName& cn : kCodes)
    if (cn.code == c) return cn.name;
  return "unknown";
}

DiagnosticCode diagnostic_code_from_string(const std::string& s) {
  for (const CodeName& cn : kCodes)
    if (s == cn.name) return cn.code;
  throw std::invalid_argument("unknown diagnostic code '" + s + "'");
}

std::vector<DiagnosticCode> all_diagnostic_codes() {
  std::vector<DiagnosticCode> v;
  for (const CodeName& cn : kCodes) v.push_back(cn.code);
  return v;
}

std::string DiagnosticOptions::validate() const {
  if (!(std::isfinite(cv_training_ratio) && cv_training_ratio > 1.0))
    return fmt::format("cv_training_ratio is {}; it must be a finite number > 1",
                       cv_training_ratio);
  if (!(coverage_end_fraction >= 0.0 && coverage_end_fraction <= 0.5))
    return fmt::format("coverage_end_fraction is {}; it must be between 0 and 0.5",
                       coverage_end_fraction);
  if (!(std::isfinite(gap_factor) && gap_factor > 1.0))
    return fmt::format("gap_factor is {}; it must be a finite number > 1", gap_factor);
  if (!(std::isfinite(runs_z) && runs_z > 0.0))
    return fmt::format("runs_z is {}; it must be a finite number > 0", runs_z);
  if (runs_min_setpoints < 4)
    return fmt::format("runs_min_setpoints is {}; it must be >= 4", runs_min_setpoints);
  if (!(condition_limit > 1.0))
    return fmt::format("condition_limit is {}; it must be > 1", condition_limit);
  for (const auto& [name, v] :
       {std::pair<const char*, double>{"lack_of_fit_alpha", lack_of_fit_alpha},
        {"outlier_alpha", outlier_alpha},
        {"drift_alpha", drift_alpha},
        {"test_alpha", test_alpha}})
    if (!(v > 0.0 && v < 1.0))
      return fmt::format("{} is {}; it must be between 0 and 1 (exclusive)", name, v);
  if (!(std::isfinite(min_spare_setpoints) && min_spare_setpoints >= 0.0))
    return fmt::format("min_spare_setpoints is {}; it must be a finite number >= 0",
                       min_spare_setpoints);
  if (std::isnan(span_low) != std::isnan(span_high))
    return "span_low and span_high go together; give both or neither";
  if (has_span() && !(span_high > span_low))
    return fmt::format("span is {}..{}; span_high must be greater than span_low", span_low,
                       span_high);
  return {};
}

namespace {
void append(std::vector<Warning>& to, std::vector<Warning> from) {
  for (Warning& w : from) to.push_back(std::move(w));
}
}  // namespace

// The registration point of the checks: every check runs here, for every
// model, in this order (the order of the record's warnings). A check that is
// defined along one input only returns nothing for a model with an aux input.
// A new check: a check_* function in a diag_*.cpp file, declared in
// diagnostics.hpp, and one line below.
std::vector<Warning> diagnose_fit(const Dataset& data, const Calibration& cal,
                                  const UncertaintyBudget& uncertainty,
                                  const ToleranceSpec* tolerance,
                                  const DiagnosticOptions& options) {
  std::vector<Warning> out;
  // Issue 13: the calibrated checks (calibrated_checks.cpp, lack_of_fit.hpp)
  // replace the fixed-limit test-vs-validation, grid-edge,
  // setpoints-per-coefficient and outlier checks.
  const LackOfFit lof = lack_of_fit_test(data, cal, options.lack_of_fit_alpha);
  append(out, check_test_vs_validation_f(cal, options));
  append(out, check_cv_vs_training(cal, options));
  append(out, check_grid_edges_feasible(cal, &lof));
  append(out, check_spare_setpoints(cal, options));
  append(out, check_coverage(cal, options));
  append(out, check_outliers_bonferroni(data, cal, options));
  append(out, check_lack_of_fit(lof));
  append(out, check_repeat_drift(data, cal, options));
  append(out, check_residual_runs(cal, options));
  append(out, check_monotonic(cal));
  append(out, check_hysteresis(data, cal, uncertainty, tolerance));
  append(out, check_condition(cal, options));
  std::vector<double> xs, as;
  std::vector<std::size_t> ls;
  for (const PointResult& p : cal.points)
    if (p.role == SetRole::Test) {
      xs.push_back(p.reading);
      as.push_back(p.aux);
      ls.push_back(p.line);
    }
  append(out, check_extrapolation(general_model(cal), xs, as, ls, "check points"));
  return out;
}

nlohmann::json to_json(const Warning& w) {
  nlohmann::json j{{"code", to_string(w.code)}, {"message", w.message}};
  if (!w.lines.empty()) j["lines"] = w.lines;
  if (std::isfinite(w.value)) j["value"] = w.value;
  return j;
}

nlohmann::json to_json(const std::vector<Warning>& ws) {
  nlohmann::json a = nlohmann::json::array();
  for (const Warning& w : ws) a.push_back(to_json(w));
  return a;
}

std::vector<Warning> warnings_from_json(const nlohmann::json& j, const std::string& file) {
  const detail::JsonReader r{file};
  if (!j.is_array()) r.fail("warnings", "is not an array");
  std::vector<Warning> out;
  for (const nlohmann::json& e : j) {
    Warning w;
    w.code = r.enum_value(e, "code", "warnings[]", diagnostic_code_from_string);
    w.message = r.text(e, "message", "warnings[]");
    if (e.contains("lines"))
      for (const nlohmann::json& l : r.array(e, "lines", "warnings[]")) {
        if (!l.is_number_unsigned())
          r.fail("warnings[].lines", "holds a value that is not a line number");
        w.lines.push_back(l.get<std::size_t>());
      }
    if (e.contains("value")) w.value = r.number(e, "value", "warnings[]");
    out.push_back(std::move(w));
  }
  return out;
}

std::string format_warnings(const std::vector<Warning>& ws) {
  std::string s;
  for (const Warning& w : ws) s += fmt::format("warning [{}]: {}\n", to_string(w.code), w.message);
  return s;
}

}  // namespace ridgecal
