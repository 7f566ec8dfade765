#include "export_command.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <boost/program_options.hpp>
#include <cmath>
#include <limits>
#include <ostream>
#include <sstream>

#include "cli_common.hpp"
#include "record_header.hpp"
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
    RecordHeaderRequest request;
    request.options = cmd.options;
    request.tolerance = cmd.tolerance;
    request.tolerance_text = cmd.tolerance_text;
    request.allow_unpassed = cmd.allow_unpassed;
    const RecordHeaderResult made = make_record_header(guarded, cmd.record_path, request);
    if (made.status != RecordHeaderStatus::Written) {
      err << "ridgecal export: " << made.refusal << "\n";
      return kExitOutOfTolerance;
    }
    const firmware::ExportResult& r = made.exported;
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
