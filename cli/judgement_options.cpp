#include "judgement_options.hpp"

#include <fmt/format.h>

#include "cli_common.hpp"

namespace po = boost::program_options;

namespace ridgecal::cli {

void add_tolerance_options(po::options_description& d) {
  // clang-format off
  d.add_options()
    ("tol-offset", po::value<std::string>(), "tolerance: constant term a of +-(a + b*|reference|), reference units")
    ("tol-proportional", po::value<std::string>(), "tolerance: term b of +-(a + b*|reference|), a fraction (0.005 = 0.5 % of reading)")
    ("tol-percent-span", po::value<std::string>(), "tolerance: percent of span (--span, default the calibrated reference range), added to the terms above")
    ("tol-class", po::value<std::string>(), "tolerance preset: iec60751-AA, iec60751-A, iec60751-B, iec60751-C (degC)")
    ("span", po::value<std::string>(), "declared span of the instrument in reference units, LO..HI (for % of span and the coverage check)")
    ("decision", po::value<std::string>(), "decision rule: simple (default: |error| <= tolerance) or guarded (|error| <= tolerance - U)")
    ("tur-warning", po::value<std::string>(), "warn where the test uncertainty ratio limit/U is below this (default 4, i.e. 4:1, common practice; 1..100)");
  // clang-format on
}

void add_uncertainty_options(po::options_description& d) {
  // clang-format off
  d.add_options()
    ("ref-uncertainty", po::value<std::string>(), "uncertainty of the reference standard, reference units (standard, or expanded with --ref-k)")
    ("ref-k", po::value<std::string>(), "coverage factor --ref-uncertainty is stated with (default 1: a standard uncertainty)")
    ("resolution", po::value<std::string>(), "reading resolution (one digit step), reading units; rectangular distribution")
    ("inadequacy-alpha", po::value<std::string>(), "gate of the model-inadequacy term: included when the lack-of-fit test gives p below this (default 0.05; 0 = no term)")
    ("accept-inadequate-model", po::bool_switch(), "give a PASS although the test error is far beyond the uncertainty budget (recorded; default: UNDECIDED, exit 1)");
  // clang-format on
}

std::pair<double, double> parse_range_option(const std::string& option, const std::string& text) {
  const std::size_t dots = text.find("..", 1);
  if (dots == std::string::npos)
    throw UsageError(
        fmt::format("{}: '{}' is not a range; write LO..HI, e.g. 0..400", option, text));
  const double lo = parse_number_option(option, text.substr(0, dots));
  const double hi = parse_number_option(option, text.substr(dots + 2));
  if (!(hi > lo))
    throw UsageError(fmt::format("{}: '{}' has HI <= LO; write LO..HI with LO < HI", option, text));
  return {lo, hi};
}

JudgementCli parse_judgement_options(const po::variables_map& vm) {
  JudgementCli j;
  auto number = [&vm](const char* name) -> std::optional<double> {
    if (!vm.count(name)) return std::nullopt;
    return parse_number_option(std::string("--") + name, vm[name].as<std::string>());
  };
  const auto offset = number("tol-offset");
  const auto prop = number("tol-proportional");
  const auto pspan = number("tol-percent-span");
  if (vm.count("span")) {
    const auto [lo, hi] = parse_range_option("--span", vm["span"].as<std::string>());
    j.diagnostics.span_low = lo;
    j.diagnostics.span_high = hi;
  }
  if (vm.count("tol-class")) {
    if (offset || prop)
      throw UsageError(
          "--tol-class sets the whole +-(a + b*|reference|) formula; do not combine it with "
          "--tol-offset "
          "or --tol-proportional");
    try {
      j.tolerance =
          preset_tolerance(tolerance_preset_from_string(vm["tol-class"].as<std::string>()));
    } catch (const std::invalid_argument& e) {
      throw UsageError(std::string("--tol-class: ") + e.what());
    }
  }
  if (offset || prop || pspan) {
    ToleranceSpec t = j.tolerance.value_or(ToleranceSpec{});
    if (offset) t.offset = *offset;
    if (prop) t.proportional = *prop;
    if (pspan) t.percent_of_span = *pspan;
    if (j.diagnostics.has_span() && t.percent_of_span > 0) {
      t.span_low = j.diagnostics.span_low;
      t.span_high = j.diagnostics.span_high;
    }
    j.tolerance = t;
  }
  if (j.tolerance) {
    ToleranceSpec check = *j.tolerance;
    if (check.percent_of_span > 0 && !(check.span_high > check.span_low))
      check.span_high = check.span_low + 1;
    if (const std::string e = check.validate(); !e.empty()) throw UsageError("tolerance: " + e);
  }
  if (vm.count("decision")) {
    try {
      j.rule = decision_rule_from_string(vm["decision"].as<std::string>());
    } catch (const std::invalid_argument& e) {
      throw UsageError(std::string("--decision: ") + e.what());
    }
  }
  if (const auto t = number("tur-warning")) {
    if (const std::string e = validate_tur_warning(*t); !e.empty())
      throw UsageError("--tur-warning: " + e);
    j.tur_warning = *t;
  }
  if (const auto u = number("ref-uncertainty")) j.uncertainty.reference_uncertainty = *u;
  if (const auto k = number("ref-k")) j.uncertainty.reference_k = *k;
  if (const auto r = number("resolution")) j.uncertainty.resolution = *r;
  if (const auto a = number("inadequacy-alpha")) j.uncertainty.inadequacy_alpha = *a;
  j.accept_inadequate_model =
      vm.count("accept-inadequate-model") && vm["accept-inadequate-model"].as<bool>();
  if (vm.count("ref-k") && !vm.count("ref-uncertainty"))
    throw UsageError(
        "--ref-k states the coverage factor of --ref-uncertainty; give --ref-uncertainty too");
  if (const std::string e = j.uncertainty.validate(); !e.empty())
    throw UsageError("uncertainty: " + e);
  if (const std::string e = j.diagnostics.validate(); !e.empty())
    throw UsageError("diagnostics: " + e);
  return j;
}

}  // namespace ridgecal::cli
