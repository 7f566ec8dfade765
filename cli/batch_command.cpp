#include "batch_command.hpp"

#include <fmt/format.h>
#include <unistd.h>

#include <atomic>
#include <boost/program_options.hpp>
#include <csignal>
#include <iostream>
#include <ostream>
#include <sstream>

#include "cli_common.hpp"
#include "extended_options.hpp"
#include "judgement_options.hpp"
#include "report_command.hpp"
#include "ridgecal/errors.hpp"

namespace po = boost::program_options;

namespace ridgecal::cli {

std::string to_string(ProgressMode m) {
  switch (m) {
    case ProgressMode::Bar:
      return "bar";
    case ProgressMode::Lines:
      return "lines";
    case ProgressMode::None:
      return "none";
    default:
      return "auto";
  }
}
ProgressMode progress_mode_from_string(const std::string& s) {
  if (s == "auto") return ProgressMode::Auto;
  if (s == "bar") return ProgressMode::Bar;
  if (s == "lines") return ProgressMode::Lines;
  if (s == "none") return ProgressMode::None;
  throw std::invalid_argument("progress must be 'auto', 'bar', 'lines' or 'none', got '" + s + "'");
}

namespace {
// A command's error output as one summary-friendly line: the command name
// prefix dropped, lines joined with "; ".
std::string one_line(const std::string& text) {
  std::string s;
  std::istringstream in(text);
  for (std::string line; std::getline(in, line);) {
    for (const char* p : {"ridgecal report: ", "ridgecal export: "})
      if (line.rfind(p, 0) == 0) line.erase(0, std::char_traits<char>::length(p));
    while (!line.empty() && (line.front() == ' ')) line.erase(0, 1);
    if (line.empty()) continue;
    if (!s.empty()) s += "; ";
    s += line;
  }
  return s.empty() ? std::string("failed without a message") : s;
}

// The signal that asks the running batch to stop (0: none). Set by the
// handler, polled by run_batch (BatchOptions::stop).
std::atomic<int> g_stop_signal{0};
static_assert(std::atomic<int>::is_always_lock_free, "the signal handler needs a lock-free atomic");

extern "C" void on_stop_signal(int sig) {
  g_stop_signal.store(sig);
}

// SIGINT and SIGTERM handled while the object lives: the first one stops the
// batch cleanly; SA_RESETHAND restores the default action, so a second one
// kills at once.
class StopSignals {
 public:
  StopSignals() {
    g_stop_signal.store(0);
    struct sigaction sa {};
    sa.sa_handler = on_stop_signal;
    sigemptyset(&sa.sa_mask);
    sa.sa_flags = SA_RESETHAND | SA_RESTART;
    ::sigaction(SIGINT, &sa, &old_int_);
    ::sigaction(SIGTERM, &sa, &old_term_);
  }
  ~StopSignals() {
    ::sigaction(SIGINT, &old_int_, nullptr);
    ::sigaction(SIGTERM, &old_term_, nullptr);
  }
  StopSignals(const StopSignals&) = delete;
  StopSignals& operator=(const StopSignals&) = delete;

 private:
  struct sigaction old_int_ {
  }, old_term_{};
};

po::options_description batch_options() {
  po::options_description d("ridgecal batch DATA.csv|DIR --unit COL --out-dir DIR [options]");
  // clang-format off
  d.add_options()
    ("help,h", "show this help")
    ("unit", po::value<std::string>(), "column naming the unit of each row (rows of a unit must be contiguous); without it, each CSV file of a directory is one unit")
    ("out-dir,o", po::value<std::string>(), "output directory: records/UNIT.json, summary.csv, summary.json")
    ("jobs,j", po::value<int>()->default_value(0), "worker threads (0 = all cores); results do not depend on it")
    ("no-records", po::bool_switch(), "write the summaries only")
    ("no-sync", po::bool_switch(), "do not fsync each record before renaming it (still atomic, not crash-durable)")
    ("reports", po::bool_switch(), "also write reports/UNIT.html, the HTML report of each fitted unit (as 'ridgecal report')")
    ("headers", po::value<std::string>(), "also write headers/UNIT.h, the C header of each fitted unit (as 'ridgecal export'), with this symbol prefix (the same for every unit, so firmware code does not depend on the unit)")
    ("header-numeric", po::value<std::string>()->default_value("float"), "arithmetic of the headers: float, double or fixed")
    ("header-output-scale", po::value<std::string>()->default_value("1000"), "fixed headers: output units per reference unit")
    ("progress", po::value<std::string>()->default_value("auto"), "progress on stderr: auto (bar on a terminal, else lines), bar, lines, none")
    ("progress-interval", po::value<double>()->default_value(0.0), "seconds between progress updates (0: 0.2 for the bar, 5 for lines)")
    ("reading", po::value<std::string>()->default_value("reading"), "column holding the raw sensor reading")
    ("reference", po::value<std::string>()->default_value("reference"), "column holding the reference value")
    ("setpoint", po::value<std::string>(), "column naming the setpoint of repeated readings (default: equal reference values form a setpoint)")
    ("role", po::value<std::string>(), "column with 'fit' or 'check' per row: the check setpoints become the test set")
    ("delimiter", po::value<std::string>()->default_value(","), "field delimiter: ',', ';' or 'tab'")
    ("decimal-comma", po::bool_switch(), "numbers use ',' as the decimal point (12,5); needs --delimiter ';' or tab")
    ("max-rows", po::value<std::size_t>()->default_value(CsvLimits{}.max_rows), "a unit with more data rows than this fails (as 'ridgecal fit' refuses such a file)")
    ("max-bytes", po::value<std::size_t>()->default_value(CsvLimits{}.max_bytes), "a unit whose rows take more bytes than this fails")
    ("max-fields", po::value<std::size_t>()->default_value(CsvLimits{}.max_fields), "refuse rows with more fields than this; a line may hold max-fields x (max-field-bytes + 3) bytes")
    ("max-field-bytes", po::value<std::size_t>()->default_value(CsvLimits{}.max_field_bytes), "refuse fields (cells, column names, labels) longer than this many bytes")
    ("direction", po::value<std::string>(), "column with 'up' or 'down' per row: the sweep direction (hysteresis check, as in 'ridgecal fit')")
    ("degrees", po::value<std::string>()->default_value("1..7"), "candidate degrees, e.g. 1..7 or 1,2,3")
    ("lambdas", po::value<std::string>()->default_value("default"), "candidate penalties: 'default' (0 and 30 values from 1e-12 to 10), or a list like 0,1e-9:1e-1:20")
    ("rule", po::value<std::string>()->default_value(to_string(FitOptions{}.rule)), "selection rule: one-se (simplest model within one standard error of the lowest CV error) or min-cv (lowest CV error)")
    ("folds", po::value<int>()->default_value(5), "K of grouped K-fold cross-validation")
    ("loso-below", po::value<int>()->default_value(10), "leave-one-setpoint-out when fewer interior training setpoints than this (0: always K-fold when possible)")
    ("test-fraction", po::value<double>()->default_value(0.2), "share of setpoints held out as the final test set (0 to 0.5)")
    ("seed", po::value<std::uint64_t>()->default_value(1), "seed of the reproducible split (the same for every unit)")
    ("degree", po::value<int>(), "fixed model: this degree (with --lambda), no selection")
    ("lambda", po::value<double>(), "fixed model: this penalty")
    ("through-origin", po::bool_switch(), "no intercept: force the curve through reading 0 -> reference 0")
    ("sensor", po::value<std::string>()->default_value(""), "sensor name for the records (the unit label is appended)")
    ("reading-unit", po::value<std::string>()->default_value(""), "unit of the reading, e.g. counts")
    ("reference-unit", po::value<std::string>()->default_value(""), "unit of the reference, e.g. degC")
    ("timestamp", po::value<std::string>()->default_value(""), "creation time for records and summary (ISO 8601), 'none' to omit; default: now or SOURCE_DATE_EPOCH")
    ("no-hardware-checks", po::bool_switch(), "fit a unit even when two or more of its setpoints in a row read exactly the same value (stuck, open, shorted or saturated; see docs/batch.md)");
  // clang-format on
  add_extended_options(d);
  add_tolerance_options(d);
  add_uncertainty_options(d);
  return d;
}
}  // namespace

std::string batch_usage() {
  std::ostringstream s;
  s << batch_options();
  s << "\nOutputs are written atomically. Units that fail are listed in the summary with their "
       "error;\n"
       "the others are unaffected.\n"
       "With --reports / --headers, a unit whose report or header cannot be made (e.g. a header "
       "the\n"
       "export proof refuses) gets a warning in the summary, and no stale file of an earlier run "
       "is left.\n"
       "Only one batch (or merge) writes into an output directory at a time (a lock file "
       ".ridgecal.lock\n"
       "inside it); an input that is also an output (e.g. an input named summary.csv in DIR "
       "with -o DIR)\n"
       "is refused before anything is written.\n"
       "SIGINT or SIGTERM stops the batch cleanly: units in flight are finished, no temporary "
       "file is left,\n"
       "and the summaries list the units completed, marked partial. A second signal kills at "
       "once.\n"
       "Exit codes: 0 every unit fitted (and PASS, with a tolerance, and every report/header "
       "written),\n"
       "1 at least one unit failed, is out of tolerance or UNDECIDED, or lacks a requested "
       "report/header,\n"
       "2 bad usage or unusable input (no summary written), 130 / 143 stopped by SIGINT / "
       "SIGTERM\n"
       "(partial summary written).\n";
  return s.str();
}

BatchCommand parse_batch_command(const std::vector<std::string>& args) {
  const po::variables_map vm = parse_arguments(args, batch_options(), "data");
  BatchCommand cmd;
  if (vm.count("help")) {
    cmd.help = true;
    return cmd;
  }
  if (!vm.count("data"))
    throw UsageError(
        "give the batch file or directory: ridgecal batch DATA.csv --unit COL --out-dir DIR");
  const auto& data = vm["data"].as<std::vector<std::string>>();
  if (data.size() != 1)
    throw UsageError(fmt::format("give exactly one batch file or directory, not {}", data.size()));
  cmd.data_path = data[0];
  if (!vm.count("out-dir"))
    throw UsageError("--out-dir is required: the directory for the records and the summary");
  BatchOptions& b = cmd.batch;
  b.out_dir = vm["out-dir"].as<std::string>();
  if (vm.count("unit")) b.input.unit_column = vm["unit"].as<std::string>();
  b.input.csv.reading_column = vm["reading"].as<std::string>();
  b.input.csv.reference_column = vm["reference"].as<std::string>();
  if (vm.count("setpoint")) b.input.csv.setpoint_column = vm["setpoint"].as<std::string>();
  if (vm.count("role")) b.input.csv.role_column = vm["role"].as<std::string>();
  if (vm.count("direction")) b.input.csv.direction_column = vm["direction"].as<std::string>();
  b.input.csv.delimiter = parse_delimiter(vm["delimiter"].as<std::string>());
  b.input.csv.decimal_comma = vm["decimal-comma"].as<bool>();
  b.input.csv.limits.max_rows = vm["max-rows"].as<std::size_t>();
  b.input.csv.limits.max_bytes = vm["max-bytes"].as<std::size_t>();
  b.input.csv.limits.max_fields = vm["max-fields"].as<std::size_t>();
  b.input.csv.limits.max_field_bytes = vm["max-field-bytes"].as<std::size_t>();
  b.jobs = vm["jobs"].as<int>();
  b.write_records = !vm["no-records"].as<bool>();
  b.sync_records = !vm["no-sync"].as<bool>();
  cmd.reports = vm["reports"].as<bool>();
  if (vm.count("headers")) {
    ExportCommand h;
    h.options.prefix = vm["headers"].as<std::string>();
    const std::string mode = vm["header-numeric"].as<std::string>();
    const auto m = firmware::numeric_mode_from_string(mode);
    if (!m)
      throw UsageError(fmt::format("--header-numeric '{}': must be float, double or fixed", mode));
    h.options.mode = *m;
    h.options.output_scale =
        parse_number_option("--header-output-scale", vm["header-output-scale"].as<std::string>());
    if (const std::string e = h.options.validate(); !e.empty()) throw UsageError("--headers: " + e);
    cmd.header = std::move(h);
  } else if (!vm["header-numeric"].defaulted() || !vm["header-output-scale"].defaulted()) {
    throw UsageError("--header-numeric and --header-output-scale go with --headers PREFIX");
  }
  if ((cmd.reports || cmd.header) && !b.write_records)
    throw UsageError("--reports and --headers are made from the records: drop --no-records");
  try {
    cmd.progress = progress_mode_from_string(vm["progress"].as<std::string>());
  } catch (const std::invalid_argument& e) {
    throw UsageError(std::string("--progress: ") + e.what());
  }
  cmd.progress_interval_s = vm["progress-interval"].as<double>();
  if (!(cmd.progress_interval_s >= 0.0 && cmd.progress_interval_s <= 3600.0))
    throw UsageError("--progress-interval: give seconds between 0 and 3600");

  FitOptions& f = b.fit;
  f.degrees = parse_degree_list(vm["degrees"].as<std::string>());
  f.lambdas = parse_lambda_list(vm["lambdas"].as<std::string>());
  try {
    f.rule = selection_rule_from_string(vm["rule"].as<std::string>());
  } catch (const std::invalid_argument& e) {
    throw UsageError(std::string("--rule: ") + e.what());
  }
  f.split.folds = vm["folds"].as<int>();
  f.split.loso_below = vm["loso-below"].as<int>();
  f.split.test_fraction = vm["test-fraction"].as<double>();
  f.split.seed = vm["seed"].as<std::uint64_t>();
  if (vm.count("degree") != vm.count("lambda"))
    throw UsageError(
        "--degree and --lambda go together: give both for a fixed model, or neither to select one");
  if (vm.count("degree")) {
    f.fixed_degree = vm["degree"].as<int>();
    f.fixed_lambda = vm["lambda"].as<double>();
  }
  f.intercept = !vm["through-origin"].as<bool>();
  parse_extended_options(vm, b.input.csv, b.comp);
  b.sensor.name = vm["sensor"].as<std::string>();
  b.hardware.enabled = !vm["no-hardware-checks"].as<bool>();
  b.sensor.reading_unit = vm["reading-unit"].as<std::string>();
  b.sensor.reference_unit = vm["reference-unit"].as<std::string>();
  cmd.timestamp = vm["timestamp"].as<std::string>();
  const JudgementCli jc = parse_judgement_options(vm);
  b.assess.tolerance = jc.tolerance;
  b.assess.rule = jc.rule.value_or(DecisionRule::SimpleAcceptance);
  b.assess.uncertainty = jc.uncertainty;
  b.assess.diagnostics = jc.diagnostics;
  b.assess.accept_inadequate_model = jc.accept_inadequate_model;
  b.assess.tur_warning = jc.tur_warning;
  if (jc.rule && !jc.tolerance)
    throw UsageError(
        "--decision needs a tolerance: give --tol-offset, --tol-proportional, --tol-percent-span "
        "or --tol-class");
  if (const std::string e = b.validate(); !e.empty()) throw UsageError(e);
  return cmd;
}

std::string progress_text(const BatchProgress& p) {
  const double rate = p.seconds > 0 ? static_cast<double>(p.units_done) / p.seconds : 0.0;
  std::string s = fmt::format("units {}", p.units_done);
  if (p.units_failed) s += fmt::format(" ({} failed)", p.units_failed);
  if (p.bytes_total > 0)
    s += fmt::format(", {:.0f}% of input", 100.0 * static_cast<double>(p.bytes_read) /
                                               static_cast<double>(p.bytes_total));
  s += fmt::format(", {:.0f} units/s, {:.1f} s", rate, p.seconds);
  return s;
}

int run_batch_command(const BatchCommand& cmd, std::ostream& out, std::ostream& err,
                      bool stderr_is_tty) {
  if (cmd.help) {
    out << batch_usage();
    return kExitOk;
  }
  BatchOptions opt = cmd.batch;
  opt.created_utc = creation_time(cmd.timestamp);
  // Per-unit report and header: the same code as `ridgecal report` and
  // `ridgecal export`, run on the record just written (thread-safe: each call
  // has its own streams and writes its own file atomically).
  if (cmd.reports)
    opt.unit_outputs.push_back({"report", "reports", ".html",
                                [](const std::string& rec, const std::string& path) {
                                  ReportCommand rc;
                                  rc.record_path = rec;
                                  rc.output_path = path;
                                  std::ostringstream o, e;
                                  return run_report_command(rc, o, e) == kExitOk
                                             ? std::string()
                                             : one_line(e.str());
                                },
                                false});
  if (cmd.header) {
    const ExportCommand proto = *cmd.header;
    opt.unit_outputs.push_back({"header", "headers", ".h",
                                [proto](const std::string& rec, const std::string& path) {
                                  ExportCommand ec = proto;
                                  ec.record_path = rec;
                                  ec.output_path = path;
                                  std::ostringstream o, e;
                                  return run_export_command(ec, o, e) == kExitOk
                                             ? std::string()
                                             : one_line(e.str());
                                },
                                true});  // a header for a PASS unit only
  }
  ProgressMode mode = cmd.progress;
  if (mode == ProgressMode::Auto) mode = stderr_is_tty ? ProgressMode::Bar : ProgressMode::Lines;
  const double interval = cmd.progress_interval_s > 0 ? cmd.progress_interval_s
                                                      : (mode == ProgressMode::Bar ? 0.2 : 5.0);
  ProgressCallback cb;
  if (mode == ProgressMode::Bar) {
    cb = [&err](const BatchProgress& p) {
      const double frac =
          p.bytes_total ? static_cast<double>(p.bytes_read) / static_cast<double>(p.bytes_total)
                        : 0.0;
      const int width = 30;
      const int filled = std::min(width, static_cast<int>(frac * width + 0.5));
      err << "\r[" << std::string(static_cast<std::size_t>(filled), '#')
          << std::string(static_cast<std::size_t>(width - filled), '.') << "] " << progress_text(p)
          << "\x1b[K";
      if (p.finished) err << "\n";
      err.flush();
    };
  } else if (mode == ProgressMode::Lines) {
    cb = [&err](const BatchProgress& p) {
      err << "ridgecal batch: " << progress_text(p) << "\n" << std::flush;
    };
  } else {
    cb = [&err](const BatchProgress& p) {
      if (p.finished) err << "ridgecal batch: " << progress_text(p) << "\n";
    };
  }
  // Installed before the inputs are listed and kept until the command returns,
  // so that a signal during the set-up or the closing message is a clean stop too.
  const StopSignals stop_signals;
  try {
    const std::vector<std::string> inputs = batch_input_files(cmd.data_path);
    opt.stop = &g_stop_signal;
    const BatchResult r = run_batch(inputs, opt, cb, interval);
    if (r.interrupted_by != 0) {
      err << "\nridgecal batch: interrupted by "
          << (r.interrupted_by == SIGINT    ? "SIGINT"
              : r.interrupted_by == SIGTERM ? "SIGTERM"
                                            : "a signal")
          << ": " << r.units << " units completed (" << r.ok << " ok, " << r.failed
          << " failed); the units after them were not processed. The summary is partial: "
          << opt.out_dir << "/summary.csv, " << opt.out_dir << "/summary.json\n";
      return 128 + r.interrupted_by;
    }
    out << r.totals.line();
    if (!opt.unit_outputs.empty())
      out << fmt::format(", {} with a report or header not written", r.outputs_failed);
    if (r.outputs_withheld > 0)
      out << fmt::format(
          ", {} without a header (verdict not PASS: the warnings column of summary.csv says "
          "\"header withheld\")",
          r.outputs_withheld);
    if (const std::string reasons = r.totals.reasons_line(); !reasons.empty())
      out << "\n" << reasons;
    out << "\nsummary: " << opt.out_dir << "/summary.csv, " << opt.out_dir << "/summary.json\n";
    return r.failed > 0 || r.out_of_tolerance > 0 || r.undecided > 0 || r.outputs_failed > 0
               ? kExitOutOfTolerance
               : kExitOk;
  } catch (const InputError& e) {
    err << "\nridgecal batch: " << format_input_error(e) << "\n";
    return kExitBadInput;
  }
}

int batch_main(const std::vector<std::string>& args, std::ostream& out, std::ostream& err) {
  return run_subcommand("batch", args, out, err, parse_batch_command,
                        [&](const BatchCommand& cmd, std::ostream& o, std::ostream& e) {
                          return run_batch_command(cmd, o, e,
                                                   &e == &std::cerr && ::isatty(STDERR_FILENO));
                        });
}

}  // namespace ridgecal::cli
