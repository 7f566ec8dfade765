#include "report_command.hpp"

#include <fmt/format.h>

#include <boost/program_options.hpp>
#include <ostream>
#include <sstream>

#include "cli_common.hpp"
#include "ridgecal/atomic_file.hpp"
#include "ridgecal/errors.hpp"
#include "ridgecal/record.hpp"
#include "ridgecal/record_guard.hpp"
#include "ridgecal/report/html_report.hpp"

namespace po = boost::program_options;

namespace ridgecal::cli {

namespace {
po::options_description report_options() {
  po::options_description d("ridgecal report RECORD.json -o REPORT.html [options]");
  // clang-format off
  d.add_options()
    ("help,h", "show this help")
    ("output,o", po::value<std::string>(), "write the HTML report to this file ('-' for standard output)")
    ("date", po::value<std::string>(), "report date/time to print (any text, e.g. 2026-12-02T09:00Z); default: the record's creation time")
    ("allow-modified", po::bool_switch(), allow_modified_option_help());
  // clang-format on
  return d;
}
}  // namespace

std::string report_usage() {
  std::ostringstream s;
  s << report_options();
  s << "\nThe report is one self-contained HTML file (inline CSS and SVG, no scripts, no\n"
       "external resources) that prints to 1-3 A4 or Letter pages.\n"
       "Exit codes: 0 written, 2 bad input or usage (nothing written).\n";
  return s.str();
}

ReportCommand parse_report_command(const std::vector<std::string>& args) {
  const po::variables_map vm = parse_arguments(args, report_options(), "record");
  ReportCommand cmd;
  if (vm.count("help")) {
    cmd.help = true;
    return cmd;
  }
  if (!vm.count("record"))
    throw UsageError("give the calibration record: ridgecal report RECORD.json -o REPORT.html");
  const auto& rec = vm["record"].as<std::vector<std::string>>();
  if (rec.size() != 1)
    throw UsageError(fmt::format("give exactly one record file, not {}", rec.size()));
  cmd.record_path = rec[0];
  if (!vm.count("output"))
    throw UsageError("give the report file: -o REPORT.html (or -o - for standard output)");
  cmd.output_path = vm["output"].as<std::string>();
  if (cmd.output_path.empty()) throw UsageError("-o: the report file name is empty");
  if (vm.count("date")) cmd.date = vm["date"].as<std::string>();
  cmd.allow_modified = vm["allow-modified"].as<bool>();
  return cmd;
}

int run_report_command(const ReportCommand& cmd, std::ostream& out, std::ostream& err) {
  if (cmd.help) {
    out << report_usage();
    return kExitOk;
  }
  try {
    // Validates the layout and the integrity digest: an edited record is refused
    // unless --allow-modified, and then the report itself says so.
    refuse_output_clashes({cmd.record_path}, {cmd.output_path}, {"report"});
    const GuardedRecord guarded = load_record_checked(cmd.record_path, cmd.allow_modified);
    if (guarded.modified)
      err << "ridgecal report: warning: " << modified_record_note(cmd.record_path)
          << " (the integrity digest does not match the record content; the report says so)\n";
    report::ReportOptions opt;
    opt.date = cmd.date;
    const std::string html = report::render_html_report(guarded.record, guarded.seal, opt);
    if (cmd.output_path == "-") {
      out << html;
    } else {
      write_file_atomic(cmd.output_path, html);
      out << "report: " << cmd.output_path << "\n";
    }
    return kExitOk;
  } catch (const InputError& e) {
    err << "ridgecal report: " << format_input_error(e) << "\n";
    return kExitBadInput;
  }
}

int report_main(const std::vector<std::string>& args, std::ostream& out, std::ostream& err) {
  return run_subcommand("report", args, out, err, parse_report_command, run_report_command);
}

}  // namespace ridgecal::cli
