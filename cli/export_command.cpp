#include "export_command.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <boost/program_options.hpp>
#include <cmath>
#include <limits>
#include <ostream>
#include <sstream>

#include "cli_common.hpp"
#include "ridgecal/atomic_file.hpp"
#include "ridgecal/errors.hpp"
#include "ridgecal/firmware/export.hpp"
#include "ridgecal/record.hpp"
#include "ridgecal/record_guard.hpp"

namespace po = boost::program_options;

namespace ridgecal::cli {

namespace {
po::options_description export_options() {
  po::options_description d(
      "ridgecal export RECORD.json --prefix NAME --numeric float|double|fixed -o NAME.h [options]");
  // clang-format off
  d.add_options()
    ("help,h", "show this help")
    ("output,o", po::value<std::string>(), "header file to write (replaced only when the export succeeds)")
    ("prefix", po::value<std::string>(), "prefix of the generated C symbols: [A-Za-z][A-Za-z0-9_]*, at most 40 characters, no '__', no trailing '_'")
    ("numeric", po::value<std::string>()->default_value("float"), "arithmetic of the header: float, double or fixed (integer only)")
    ("max-deviation-fraction", po::value<std::string>()->default_value("0.1"), "refuse when the header deviates from the model by more than this fraction of the tolerance")
    ("tolerance", po::value<std::string>(), "absolute tolerance in reference units for the refusal rule only (default: the record's; without one, the validation RMSE); the header's result is always the record's verdict")
    ("tolerance-text", po::value<std::string>()->default_value(""), "tolerance description for the header's QA block")
    ("allow-modified", po::bool_switch(), allow_modified_option_help())
    ("allow-unpassed", po::bool_switch(), "write a header for a record whose verdict is not PASS (FAIL, not judged, or modified with --allow-modified); without it such a record is refused, exit 1. The header's PREFIX_VERDICT macro states the verdict")
    ("grid-points", po::value<int>()->default_value(2001), "points of the proof grid over the calibrated range")
    ("raw-min", po::value<std::int64_t>(), "fixed: smallest raw integer input (default: ceil(x_min * input-scale))")
    ("raw-max", po::value<std::int64_t>(), "fixed: largest raw integer input (default: floor(x_max * input-scale))")
    ("input-scale", po::value<std::string>()->default_value("1"), "fixed: raw counts per reading unit (reading = raw / input-scale)")
    ("output-scale", po::value<std::string>()->default_value("1000"), "fixed: output units per reference unit (1000: milli-units)")
    ("aux-scale", po::value<std::string>()->default_value("1"), "fixed, extended records with an aux input: raw aux counts per aux unit (aux = raw_aux / aux-scale)")
    ("aux-raw-min", po::value<std::int64_t>(), "fixed, aux input: smallest raw aux integer (default: ceil(aux_min * aux-scale))")
    ("aux-raw-max", po::value<std::int64_t>(), "fixed, aux input: largest raw aux integer (default: floor(aux_max * aux-scale))");
  // clang-format on
  return d;
}

// The record's optional assessment (rec.tolerance, rec.decision; see
// tolerance.hpp and decision.hpp). The refusal rule needs one absolute number:
// the strictest tolerance limit over the calibrated range, the minimum of
// limit(model) on a grid over the calibrated reading (and aux) range.
struct RecordAssessment {
  std::optional<double> tolerance_abs;
  std::string tolerance_text;
  std::string verdict;
};

RecordAssessment record_assessment(const CalibrationRecord& rec,
                                   const firmware::FirmwareModel& fm) {
  RecordAssessment a;
  if (rec.tolerance) {
    double strictest = std::numeric_limits<double>::infinity();
    // grid: 2001 readings for the one-input model, 401 x 41 (reading, aux)
    // for the extended one (41 only with an aux input)
    const auto [lo, hi] = firmware::raw_reading_range(fm);
    const int nx = fm.extended ? 401 : 2001, na = fm.has_aux() ? 41 : 1;
    for (int j = 0; j < na; ++j) {
      const double amin = na > 1 ? fm.inputs[1].min : 0.0, amax = na > 1 ? fm.inputs[1].max : 0.0;
      const double aux = na > 1 ? amin + (amax - amin) * j / (na - 1) : 0.0;
      for (int i = 0; i < nx; ++i) {
        const double y = fm.reference(lo + (hi - lo) * i / (nx - 1), aux);
        if (std::isfinite(y)) strictest = std::min(strictest, rec.tolerance->limit(y));
      }
    }
    if (std::isfinite(strictest) && strictest > 0) a.tolerance_abs = strictest;
    a.tolerance_text = fmt::format("{} ({}); strictest over the range {:.6g}",
                                   rec.tolerance->describe(), rec.tolerance->source, strictest);
  }
  if (rec.decision) {
    a.verdict = to_string(rec.decision->verdict);
    if (!rec.decision->statement.empty())
      a.verdict += ": " + rec.decision->statement;  // the statement names the rule
    else
      a.verdict += " (" + to_string(rec.decision->rule) + " acceptance)";
  }
  return a;
}
// "ntc" -> "NTC", "not-judged" -> "NOT_JUDGED": the spelling of a macro.
std::string upper_prefix(std::string s) {
  for (char& c : s)
    if (c >= 'a' && c <= 'z')
      c = static_cast<char>(c - 'a' + 'A');
    else if (c == '-')
      c = '_';
  return s;
}
}  // namespace

std::string export_usage() {
  std::ostringstream s;
  s << export_options();
  s << "\nExit codes: 0 written, 1 refused (the record's verdict is not PASS, or the header's\n"
       "arithmetic deviates more than allowed; nothing written), 2 bad input or usage (nothing\n"
       "written).\n"
       "Build firmware that includes the header with -ffp-contract=off.\n";
  return s.str();
}

ExportCommand parse_export_command(const std::vector<std::string>& args) {
  const po::variables_map vm = parse_arguments(args, export_options(), "record");
  ExportCommand cmd;
  if (vm.count("help")) {
    cmd.help = true;
    return cmd;
  }
  if (!vm.count("record"))
    throw UsageError(
        "give the calibration record: ridgecal export RECORD.json --prefix NAME -o NAME.h");
  const auto& rec = vm["record"].as<std::vector<std::string>>();
  if (rec.size() != 1) throw UsageError(fmt::format("give exactly one record, not {}", rec.size()));
  cmd.record_path = rec[0];
  if (!vm.count("output")) throw UsageError("--output (-o) is required: the header file to write");
  cmd.output_path = vm["output"].as<std::string>();
  if (!vm.count("prefix")) throw UsageError("--prefix is required: the prefix of the C symbols");
  cmd.options.prefix = vm["prefix"].as<std::string>();
  const std::string mode = vm["numeric"].as<std::string>();
  const auto m = firmware::numeric_mode_from_string(mode);
  if (!m) throw UsageError(fmt::format("--numeric '{}': must be float, double or fixed", mode));
  cmd.options.mode = *m;
  cmd.options.max_deviation_fraction = parse_number_option(
      "--max-deviation-fraction", vm["max-deviation-fraction"].as<std::string>());
  if (vm.count("tolerance")) {
    cmd.tolerance = parse_number_option("--tolerance", vm["tolerance"].as<std::string>());
    if (!(*cmd.tolerance > 0))
      throw UsageError(fmt::format("--tolerance {}: must be > 0", *cmd.tolerance));
  }
  cmd.tolerance_text = vm["tolerance-text"].as<std::string>();
  cmd.allow_modified = vm["allow-modified"].as<bool>();
  cmd.allow_unpassed = vm["allow-unpassed"].as<bool>();
  cmd.options.grid_points = vm["grid-points"].as<int>();
  if (vm.count("raw-min")) cmd.options.raw_min = vm["raw-min"].as<std::int64_t>();
  if (vm.count("raw-max")) cmd.options.raw_max = vm["raw-max"].as<std::int64_t>();
  cmd.options.input_scale =
      parse_number_option("--input-scale", vm["input-scale"].as<std::string>());
  cmd.options.output_scale =
      parse_number_option("--output-scale", vm["output-scale"].as<std::string>());
  cmd.options.aux_input_scale =
      parse_number_option("--aux-scale", vm["aux-scale"].as<std::string>());
  if (vm.count("aux-raw-min")) cmd.options.aux_raw_min = vm["aux-raw-min"].as<std::int64_t>();
  if (vm.count("aux-raw-max")) cmd.options.aux_raw_max = vm["aux-raw-max"].as<std::int64_t>();
  if (const std::string e = cmd.options.validate(); !e.empty()) throw UsageError(e);
  return cmd;
}

int run_export_command(const ExportCommand& cmd, std::ostream& out, std::ostream& err) {
  if (cmd.help) {
    out << export_usage();
    return kExitOk;
  }
  try {
    // Refuses a record edited by hand unless --allow-modified (record_guard.hpp).
    refuse_output_clashes({cmd.record_path}, {cmd.output_path}, {"header"});
    const GuardedRecord guarded = load_record_checked(cmd.record_path, cmd.allow_modified);
    const CalibrationRecord& rec = guarded.record;
    const Calibration& cal = rec.calibration;
    // The one adapter: the general model, in the dialect is_extended(cal) picks.
    const firmware::FirmwareModel fm = firmware::firmware_model(cal);
    firmware::HeaderMeta meta;
    meta.sensor_name = rec.sensor.name;
    meta.reading_unit = rec.sensor.reading_unit;
    meta.reference_unit = rec.sensor.reference_unit;
    meta.degree = general_model(cal).total_degree();
    meta.lambda = cal.lambda;
    meta.validation_rmse =
        cal.validation.empty() ? firmware::HeaderMeta::kUnset : cal.validation.rmse;
    meta.validation_max_abs_error =
        cal.validation.empty() ? firmware::HeaderMeta::kUnset : cal.validation.max_abs_error;
    meta.test_rmse = cal.test.empty() ? firmware::HeaderMeta::kUnset : cal.test.rmse;
    meta.test_max_abs_error =
        cal.test.empty() ? firmware::HeaderMeta::kUnset : cal.test.max_abs_error;
    const RecordAssessment assessed = record_assessment(rec, fm);
    // The verdict is the record's, computed once by the assessment when the
    // record was made: the header states it verbatim and never judges again.
    // --tolerance only feeds the refusal rule (header arithmetic vs model).
    meta.tolerance_abs = cmd.tolerance ? cmd.tolerance : assessed.tolerance_abs;
    if (cmd.tolerance) meta.tolerance_abs_source = "--tolerance, for the refusal rule only";
    meta.tolerance_description = !cmd.tolerance_text.empty() ? cmd.tolerance_text
                                 : !assessed.tolerance_text.empty()
                                     ? assessed.tolerance_text
                                     : std::string("none in the record");
    meta.pass_fail = !assessed.verdict.empty()
                         ? assessed.verdict
                         : std::string("not assessed (no tolerance in the record)");
    if (guarded.modified)
      meta.pass_fail =
          "RECORD MODIFIED after ridgecal wrote it (integrity SHA-256 does not match; exported "
          "with "
          "--allow-modified); " +
          meta.pass_fail;
    meta.verdict = guarded.modified ? firmware::HeaderVerdict::RecordModified
                   : !rec.decision  ? firmware::HeaderVerdict::NotJudged
                   : rec.decision->verdict == Verdict::Pass ? firmware::HeaderVerdict::Pass
                   : rec.decision->verdict == Verdict::Undecided
                       ? firmware::HeaderVerdict::Undecided
                       : firmware::HeaderVerdict::Fail;
    meta.calibration_date = rec.created_utc;
    meta.record_sha256 = guarded.seal.computed;
    meta.tool_version = std::string("ridgecal ") + tool_version();
    for (const auto& p : cal.points) {
      meta.calibration_readings.push_back(p.reading);
      meta.calibration_aux.push_back(p.aux);
    }
    // The record names the aux column, not its unit.
    meta.aux_unit = rec.input.columns.aux_column.empty() ? std::string()
                                                         : rec.input.columns.aux_column + " units";

    const firmware::ExportResult r = firmware::generate_header(fm, meta, cmd.options);
    if (r.status == firmware::ExportStatus::InvalidInput)
      throw InputError(cmd.record_path, 0, r.message, "see 'ridgecal export --help'");
    if (r.status == firmware::ExportStatus::Refused) {
      err << "ridgecal export: " << r.message << "; nothing written\n"
          << "  try --numeric double, or for fixed a larger --output-scale\n";
      return kExitOutOfTolerance;
    }
    // After the header is proved, so that bad input (exit 2) is reported first.
    if (meta.verdict != firmware::HeaderVerdict::Pass && !cmd.allow_unpassed) {
      const char* why = meta.verdict == firmware::HeaderVerdict::Fail ? "its verdict is FAIL"
                        : meta.verdict == firmware::HeaderVerdict::NotJudged
                            ? "it has no verdict (no tolerance was given when it was fitted)"
                        : meta.verdict == firmware::HeaderVerdict::Undecided
                            ? "its verdict is UNDECIDED (the test error is far beyond what the "
                              "uncertainty budget allows)"
                            : "it was modified after ridgecal wrote it";
      err << "ridgecal export: " << cmd.record_path << ": refused: " << why
          << "; nothing written. A header is written for a PASS record only; to write one anyway "
             "(e.g. for a test bench), add --allow-unpassed: its "
          << upper_prefix(cmd.options.prefix) << "_VERDICT macro is then "
          << upper_prefix(cmd.options.prefix) << "_VERDICT_"
          << upper_prefix(firmware::to_string(meta.verdict)) << "\n";
      return kExitOutOfTolerance;
    }
    write_file_atomic(cmd.output_path, r.header);
    if (guarded.modified) out << modified_record_note(cmd.record_path) << "\n";
    out << "header: " << cmd.output_path << " (" << r.message << ")\n"
        << "formats: " << r.formats << "\n"
        << "table CRC-32: " << fmt::format("0x{:08X}", r.table_crc32) << ", "
        << r.stats.header_lines << " lines\n";
    return kExitOk;
  } catch (const InputError& e) {
    err << "ridgecal export: " << format_input_error(e) << "\n";
    return kExitBadInput;
  }
}

int export_main(const std::vector<std::string>& args, std::ostream& out, std::ostream& err) {
  return run_subcommand("export", args, out, err, parse_export_command, run_export_command);
}

}  // namespace ridgecal::cli
