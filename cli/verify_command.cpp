#include "verify_command.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <boost/program_options.hpp>
#include <ostream>
#include <sstream>

#include "cli_common.hpp"
#include "judgement_options.hpp"
#include "ridgecal/atomic_file.hpp"
#include "ridgecal/errors.hpp"

namespace po = boost::program_options;

namespace ridgecal::cli {

namespace {
po::options_description verify_options() {
  po::options_description d("ridgecal verify RECORD.json NEWDATA.csv [-o ASFOUND.json] [options]");
  // clang-format off
  d.add_options()
    ("help,h", "show this help")
    ("output,o", po::value<std::string>(), "write the as-found result (JSON) to this file")
    ("reading", po::value<std::string>(), "column holding the raw reading (default: the record's)")
    ("reference", po::value<std::string>(), "column holding the reference value (default: the record's)")
    ("setpoint", po::value<std::string>(), "column naming the setpoint (default: the record's)")
    ("delimiter", po::value<std::string>(), "field delimiter: ',', ';' or 'tab' (default: the record's)")
    ("decimal-comma", po::bool_switch(), "numbers use ',' as the decimal point (12,5); needs --delimiter ';' or tab (default: the record's)")
    ("decimal-point", po::bool_switch(), "numbers use '.' as the decimal point, whatever the record says")
    ("full", po::bool_switch(), "print every point's error, not only those out of tolerance")
    ("allow-modified", po::bool_switch(), "use a record whose integrity digest does not match (the output says so)")
    ("timestamp", po::value<std::string>()->default_value(""), "creation time to record (ISO 8601), 'none' to omit");
  // clang-format on
  add_tolerance_options(d);
  return d;
}

}  // namespace

// A check with new data (declared in verify_command.hpp) is judged against the calibrated ranges: a
// column spreading less than 10 % of its calibrated range counts as constant (the scatter of a
// one-point check stays well inside that; our judgement). Both constant is a one-point check; only
// one of them is a frozen reference or a stuck sensor.
VariationFloors verify_variation_floors(const Calibration& cal) {
  double xlo = 0, xhi = 0, ylo = 0, yhi = 0;
  bool any = false;
  for (const SetpointResult& sp : cal.setpoints) {
    if (sp.role != SetRole::Train) continue;
    xlo = any ? std::min(xlo, sp.mean_reading) : sp.mean_reading;
    xhi = any ? std::max(xhi, sp.mean_reading) : sp.mean_reading;
    ylo = any ? std::min(ylo, sp.mean_reference) : sp.mean_reference;
    yhi = any ? std::max(yhi, sp.mean_reference) : sp.mean_reference;
    any = true;
  }
  VariationFloors f;
  f.reading = 0.1 * (xhi - xlo);
  f.reference = 0.1 * (yhi - ylo);
  return f;
}

std::string verify_usage() {
  std::ostringstream s;
  s << verify_options();
  s << "\nWithout tolerance options the record's tolerance and decision rule apply.\n"
       "Exit codes: 0 PASS (or no tolerance to judge against), 1 FAIL or UNDECIDED (the result "
       "is still\n"
       "written, so marked), 2 bad input or usage, or a modified record (nothing written).\n";
  return s.str();
}

VerifyCommand parse_verify_command(const std::vector<std::string>& args) {
  const po::variables_map vm = parse_arguments(args, verify_options(), "files");
  VerifyCommand cmd;
  if (vm.count("help")) {
    cmd.help = true;
    return cmd;
  }
  const std::vector<std::string> files =
      vm.count("files") ? vm["files"].as<std::vector<std::string>>() : std::vector<std::string>{};
  if (files.size() != 2)
    throw UsageError(
        fmt::format("give a record and a data file (got {} file(s)): ridgecal verify RECORD.json "
                    "NEWDATA.csv -o ASFOUND.json",
                    files.size()));
  cmd.record_path = files[0];
  cmd.data_path = files[1];
  if (vm.count("output")) cmd.output_path = vm["output"].as<std::string>();
  if (vm.count("reading")) cmd.reading_column = vm["reading"].as<std::string>();
  if (vm.count("reference")) cmd.reference_column = vm["reference"].as<std::string>();
  if (vm.count("setpoint")) cmd.setpoint_column = vm["setpoint"].as<std::string>();
  if (vm.count("delimiter")) cmd.delimiter = parse_delimiter(vm["delimiter"].as<std::string>());
  if (vm["decimal-comma"].as<bool>() && vm["decimal-point"].as<bool>())
    throw UsageError("--decimal-comma and --decimal-point contradict each other: give one of them");
  if (vm["decimal-comma"].as<bool>()) cmd.decimal_comma = true;
  if (vm["decimal-point"].as<bool>()) cmd.decimal_comma = false;
  cmd.allow_modified = vm["allow-modified"].as<bool>();
  cmd.full = vm["full"].as<bool>();
  cmd.timestamp = vm["timestamp"].as<std::string>();
  const JudgementCli jc = parse_judgement_options(vm);
  cmd.as_found.tolerance = jc.tolerance;
  cmd.as_found.rule = jc.rule;
  cmd.as_found.tur_warning = jc.tur_warning;
  if (jc.tolerance && jc.tolerance->percent_of_span > 0 &&
      !(jc.tolerance->span_high > jc.tolerance->span_low))
    throw UsageError(
        "--tol-percent-span needs --span LO..HI with verify (the span of the new data is not the "
        "instrument's span)");
  if (const std::string e = cmd.as_found.validate(); !e.empty()) throw UsageError(e);
  return cmd;
}

int run_verify_command(const VerifyCommand& cmd, std::ostream& out, std::ostream& err) {
  if (cmd.help) {
    out << verify_usage();
    return kExitOk;
  }
  try {
    refuse_output_clashes({cmd.record_path, cmd.data_path}, {cmd.output_path}, {"as-found result"});
    const CheckedRecord rec = read_checked_record(cmd.record_path, cmd.allow_modified);
    CsvOptions csv;
    csv.reading_column = cmd.reading_column.value_or(rec.record.input.columns.reading_column);
    csv.reference_column = cmd.reference_column.value_or(rec.record.input.columns.reference_column);
    csv.setpoint_column = cmd.setpoint_column.value_or(rec.record.input.columns.setpoint_column);
    csv.delimiter = cmd.delimiter.value_or(rec.record.input.columns.delimiter);
    csv.decimal_comma = cmd.decimal_comma.value_or(rec.record.input.columns.decimal_comma);
    csv.aux_column = rec.record.input.columns.aux_column;  // extended records with a second input
    if (const std::string e = csv.validate(); !e.empty())
      throw InputError("", 0, "invalid column options: " + e, "see 'ridgecal verify --help'");
    const Dataset data = read_calibration_csv(cmd.data_path, csv);
    require_variation(data, verify_variation_floors(rec.record.calibration), true);
    const AsFoundResult res = evaluate_as_found(rec, data, cmd.as_found);
    const nlohmann::json j = as_found_to_json(res, creation_time(cmd.timestamp));
    if (!cmd.output_path.empty()) write_file_atomic(cmd.output_path, record_text(j));
    out << (cmd.full ? res.full(rec.record.sensor.reference_unit)
                     : res.brief(rec.record.sensor.reference_unit));
    err << format_warnings(res.warnings);
    if (!cmd.output_path.empty()) out << "as-found result: " << cmd.output_path << "\n";
    if (res.decision && res.decision->verdict == Verdict::Fail) {
      out << "FAIL: as found, at least one point does not conform (outside the tolerance)\n";
      return kExitOutOfTolerance;
    }
    if (res.decision && res.decision->verdict == Verdict::Undecided) {
      out << "UNDECIDED: as found, no point is outside the tolerance, but conformity is not "
             "shown at every point (guard band or U >= limit)\n";
      return kExitOutOfTolerance;
    }
    if (res.decision) out << "PASS\n";
    return kExitOk;
  } catch (const InputError& e) {
    err << "ridgecal verify: " << format_input_error(e) << "\n";
    return kExitBadInput;
  }
}

int verify_main(const std::vector<std::string>& args, std::ostream& out, std::ostream& err) {
  return run_subcommand("verify", args, out, err, parse_verify_command, run_verify_command);
}

}  // namespace ridgecal::cli
