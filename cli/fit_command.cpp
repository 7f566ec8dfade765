#include "fit_command.hpp"

#include <fmt/format.h>

#include <boost/program_options.hpp>
#include <ostream>
#include <sstream>

#include "cli_common.hpp"
#include "extended_options.hpp"
#include "judgement_options.hpp"
#include "ridgecal/atomic_file.hpp"
#include "ridgecal/calibrate.hpp"
#include "ridgecal/errors.hpp"
#include "ridgecal/report/html_report.hpp"
#include "ridgecal/text_check.hpp"

namespace po = boost::program_options;

namespace ridgecal::cli {

namespace {
po::options_description fit_options() {
  po::options_description d("ridgecal fit DATA.csv [-o RECORD.json] [options]");
  // clang-format off
  d.add_options()
    ("help,h", "show this help")
    ("output,o", po::value<std::string>(), "write the calibration record (JSON) to this file")
    ("report", po::value<std::string>(), "also write the QA calibration report (HTML) to this file")
    ("reading", po::value<std::string>()->default_value("reading"), "column holding the raw sensor reading")
    ("reference", po::value<std::string>()->default_value("reference"), "column holding the reference value")
    ("setpoint", po::value<std::string>(), "column naming the setpoint of repeated readings (default: equal reference values form a setpoint)")
    ("role", po::value<std::string>(), "column with 'fit' or 'check' per row: the check setpoints become the test set")
    ("delimiter", po::value<std::string>()->default_value(","), "field delimiter: ',', ';' or 'tab'")
    ("decimal-comma", po::bool_switch(), "numbers use ',' as the decimal point (12,5); needs --delimiter ';' or tab")
    ("max-rows", po::value<std::size_t>()->default_value(CsvLimits{}.max_rows), "refuse input with more data rows than this (memory: see docs/robustness.md)")
    ("max-bytes", po::value<std::size_t>()->default_value(CsvLimits{}.max_bytes), "refuse an input file larger than this many bytes")
    ("max-fields", po::value<std::size_t>()->default_value(CsvLimits{}.max_fields), "refuse rows with more fields than this")
    ("max-field-bytes", po::value<std::size_t>()->default_value(CsvLimits{}.max_field_bytes), "refuse fields (cells, column names, labels) longer than this many bytes")
    ("degrees", po::value<std::string>()->default_value("1..7"), "candidate degrees, e.g. 1..7 or 1,2,3")
    ("lambdas", po::value<std::string>()->default_value("default"), "candidate penalties: 'default' (0 and 30 values from 1e-12 to 10), or a list like 0,1e-9:1e-1:20")
    ("rule", po::value<std::string>()->default_value("one-se"), "selection rule: one-se (simplest model within one standard error of the lowest CV error) or min-cv (lowest CV error)")
    ("folds", po::value<int>()->default_value(5), "K of grouped K-fold cross-validation (leave-one-setpoint-out below 10 interior setpoints)")
    ("test-fraction", po::value<double>()->default_value(0.2), "share of setpoints held out as the final test set (0 to 0.5)")
    ("seed", po::value<std::uint64_t>()->default_value(1), "seed of the reproducible split")
    ("degree", po::value<int>(), "fixed model: this degree (with --lambda), no selection")
    ("lambda", po::value<double>(), "fixed model: this penalty (0 = ordinary least squares)")
    ("through-origin", po::bool_switch(), "no intercept: force the curve through reading 0 -> reference 0")
    ("sensor", po::value<std::string>()->default_value(""), "sensor name for the record")
    ("reading-unit", po::value<std::string>()->default_value(""), "unit of the reading, e.g. counts")
    ("reference-unit", po::value<std::string>()->default_value(""), "unit of the reference, e.g. degC")
    ("timestamp", po::value<std::string>()->default_value(""), "creation time to record (ISO 8601), 'none' to omit; default: now or SOURCE_DATE_EPOCH")
    ("full", po::bool_switch(), "print the full summary (coefficients, notes)")
    ("direction", po::value<std::string>(), "column with 'up' or 'down' per row: the sweep direction (hysteresis check)")
    ("no-hardware-checks", po::bool_switch(), "fit even when two or more setpoints in a row read exactly the same value (a stuck, open, shorted or saturated sensor; see docs/robustness.md)");
  // clang-format on
  add_extended_options(d);
  add_tolerance_options(d);
  add_uncertainty_options(d);
  return d;
}
}  // namespace

std::string fit_usage() {
  std::ostringstream s;
  s << fit_options();
  s << "\nExit codes: 0 done (PASS, or no tolerance given), 1 out of tolerance (FAIL; the record "
       "is still written,\n"
       "marked FAIL; or UNDECIDED: the test error is far beyond the uncertainty budget, see\n"
       "--accept-inadequate-model), 2 bad input or usage (nothing written).\n";
  return s.str();
}

FitCommand parse_fit_command(const std::vector<std::string>& args) {
  const po::variables_map vm = parse_arguments(args, fit_options(), "data");
  FitCommand cmd;
  if (vm.count("help")) {
    cmd.data_path = "--help";
    return cmd;
  }
  if (!vm.count("data"))
    throw UsageError("give the calibration data file: ridgecal fit DATA.csv -o RECORD.json");
  const auto& data = vm["data"].as<std::vector<std::string>>();
  if (data.size() != 1)
    throw UsageError(fmt::format("give exactly one data file, not {}", data.size()));
  cmd.data_path = data[0];
  if (vm.count("output")) cmd.output_path = vm["output"].as<std::string>();
  if (vm.count("report")) cmd.report_path = vm["report"].as<std::string>();
  cmd.csv.reading_column = vm["reading"].as<std::string>();
  cmd.csv.reference_column = vm["reference"].as<std::string>();
  if (vm.count("setpoint")) cmd.csv.setpoint_column = vm["setpoint"].as<std::string>();
  if (vm.count("role")) cmd.csv.role_column = vm["role"].as<std::string>();
  if (vm.count("direction")) cmd.csv.direction_column = vm["direction"].as<std::string>();
  cmd.csv.delimiter = parse_delimiter(vm["delimiter"].as<std::string>());
  cmd.csv.decimal_comma = vm["decimal-comma"].as<bool>();
  cmd.csv.limits.max_rows = vm["max-rows"].as<std::size_t>();
  cmd.csv.limits.max_bytes = vm["max-bytes"].as<std::size_t>();
  cmd.csv.limits.max_fields = vm["max-fields"].as<std::size_t>();
  cmd.csv.limits.max_field_bytes = vm["max-field-bytes"].as<std::size_t>();
  if (const std::string e = cmd.csv.validate(); !e.empty()) throw UsageError(e);

  cmd.fit.degrees = parse_degree_list(vm["degrees"].as<std::string>());
  cmd.fit.lambdas = parse_lambda_list(vm["lambdas"].as<std::string>());
  try {
    cmd.fit.rule = selection_rule_from_string(vm["rule"].as<std::string>());
  } catch (const std::invalid_argument& e) {
    throw UsageError(std::string("--rule: ") + e.what());
  }
  cmd.fit.split.folds = vm["folds"].as<int>();
  cmd.fit.split.test_fraction = vm["test-fraction"].as<double>();
  cmd.fit.split.seed = vm["seed"].as<std::uint64_t>();
  if (vm.count("degree") != vm.count("lambda"))
    throw UsageError(
        "--degree and --lambda go together: give both for a fixed model, or neither to select one");
  if (vm.count("degree")) {
    cmd.fit.fixed_degree = vm["degree"].as<int>();
    cmd.fit.fixed_lambda = vm["lambda"].as<double>();
  }
  cmd.fit.intercept = !vm["through-origin"].as<bool>();
  if (const std::string e = cmd.fit.validate(); !e.empty()) throw UsageError(e);
  parse_extended_options(vm, cmd.csv, cmd.comp);
  if (const std::string e = cmd.csv.validate(); !e.empty()) throw UsageError(e);
  if (cmd.comp.active())
    if (const std::string e = cmd.comp.validate(cmd.fit); !e.empty()) throw UsageError(e);
  cmd.sensor.name = vm["sensor"].as<std::string>();
  cmd.sensor.reading_unit = vm["reading-unit"].as<std::string>();
  cmd.sensor.reference_unit = vm["reference-unit"].as<std::string>();
  const std::pair<const char*, const std::string*> texts[] = {
      {"--sensor", &cmd.sensor.name},
      {"--reading-unit", &cmd.sensor.reading_unit},
      {"--reference-unit", &cmd.sensor.reference_unit}};
  for (const auto& [option, value] : texts)
    if (const std::string why = name_problem(*value, kMaxRecordNameBytes); !why.empty())
      throw UsageError(fmt::format("{}: '{}' {}", option, shown_text(*value), why));
  if (!is_valid_utf8(cmd.data_path) || cmd.data_path.size() > 4096)
    throw UsageError(
        fmt::format("the data file name '{}' is not valid UTF-8 or too long; rename the file",
                    shown_text(cmd.data_path)));
  cmd.timestamp = vm["timestamp"].as<std::string>();
  cmd.full = vm["full"].as<bool>();
  cmd.hardware.enabled = !vm["no-hardware-checks"].as<bool>();
  const JudgementCli jc = parse_judgement_options(vm);
  cmd.assess.tolerance = jc.tolerance;
  cmd.assess.rule = jc.rule.value_or(DecisionRule::SimpleAcceptance);
  cmd.assess.uncertainty = jc.uncertainty;
  cmd.assess.diagnostics = jc.diagnostics;
  cmd.assess.accept_inadequate_model = jc.accept_inadequate_model;
  cmd.assess.tur_warning = jc.tur_warning;
  if (jc.rule && !jc.tolerance)
    throw UsageError(
        "--decision needs a tolerance: give --tol-offset, --tol-proportional, --tol-percent-span "
        "or --tol-class");
  if (const std::string e = cmd.assess.validate(); !e.empty()) throw UsageError(e);
  return cmd;
}

int run_fit_command(const FitCommand& cmd, std::ostream& out, std::ostream& err) {
  if (cmd.data_path == "--help") {
    out << fit_usage();
    return kExitOk;
  }
  try {
    refuse_output_clashes({cmd.data_path}, {cmd.output_path, cmd.report_path},
                          {"record", "report"});
    const Dataset data = read_calibration_csv(cmd.data_path, cmd.csv);
    CalibrateOptions options;
    options.fit = cmd.fit;
    options.comp = cmd.comp;
    options.assess = cmd.assess;
    options.sensor = cmd.sensor;
    options.hardware = cmd.hardware;
    options.created_utc = creation_time(cmd.timestamp);
    const CalibrateResult result = calibrate(data, options);
    if (!result.status.ok)
      throw InputError(cmd.data_path, 0, result.status.message, "see 'ridgecal fit --help'");
    const CalibrationRecord& rec = result.record;
    const nlohmann::json j = record_to_json(rec);
    // The report is made from the record as any reader parses it.
    const std::string report_html =
        cmd.report_path.empty()
            ? std::string()
            : report::render_html_report(record_from_json(j, cmd.data_path), record_seal(j));
    // The record and the report are written together, all or none.
    std::vector<OutputFile> outputs;
    if (!cmd.output_path.empty()) outputs.push_back({cmd.output_path, record_text(j)});
    if (!cmd.report_path.empty()) outputs.push_back({cmd.report_path, report_html});
    write_outputs_atomic(outputs);
    if (!cmd.sensor.name.empty() || !cmd.sensor.reading_unit.empty() ||
        !cmd.sensor.reference_unit.empty())
      out << fmt::format(
          "sensor: {} (reading in {}, reference in {})\n",
          cmd.sensor.name.empty() ? "unnamed" : cmd.sensor.name,
          cmd.sensor.reading_unit.empty() ? "unstated units" : cmd.sensor.reading_unit,
          cmd.sensor.reference_unit.empty() ? "unstated units" : cmd.sensor.reference_unit);
    out << (cmd.full ? rec.calibration.full() : rec.calibration.brief());
    out << (cmd.full ? rec.uncertainty->full(cmd.sensor.reference_unit)
                     : rec.uncertainty->brief(cmd.sensor.reference_unit));
    if (rec.tolerance) out << "tolerance: " << rec.tolerance->describe() << "\n";
    if (rec.decision)
      out << (cmd.full ? rec.decision->full() : rec.decision->brief());
    else
      out << "decision: none (no tolerance given)\n";
    err << format_warnings(rec.warnings);
    if (!cmd.output_path.empty()) out << "record: " << cmd.output_path << "\n";
    if (!cmd.report_path.empty()) out << "report: " << cmd.report_path << "\n";
    // The verdict is the record's (computed once, in the assessment).
    if (result.out_of_tolerance()) {
      out << "FAIL: out of tolerance; the record is written and marked FAIL\n";
      return kExitOutOfTolerance;
    }
    if (result.undecided()) {
      const bool far = rec.decision && rec.decision->adequacy.far;
      out << (far ? "UNDECIDED: the test error is far beyond what the uncertainty budget allows; "
                    "no PASS without --accept-inadequate-model. The record is written and marked "
                    "UNDECIDED\n"
                  : "UNDECIDED: no point is outside the tolerance, but conformity is not shown at "
                    "every point (guard band or U >= limit). The record is written and marked "
                    "UNDECIDED\n");
      return kExitOutOfTolerance;
    }
    if (rec.decision) out << "PASS\n";
    return kExitOk;
  } catch (const InputError& e) {
    err << "ridgecal fit: " << format_input_error(e) << "\n";
    return kExitBadInput;
  }
}

int fit_main(const std::vector<std::string>& args, std::ostream& out, std::ostream& err) {
  return run_subcommand("fit", args, out, err, parse_fit_command, run_fit_command);
}

}  // namespace ridgecal::cli
