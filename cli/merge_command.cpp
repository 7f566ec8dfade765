#include "merge_command.hpp"

#include <fmt/format.h>

#include <boost/program_options.hpp>
#include <filesystem>
#include <ostream>
#include <sstream>

#include "cli_common.hpp"
#include "ridgecal/atomic_file.hpp"
#include "ridgecal/batch_run.hpp"
#include "ridgecal/errors.hpp"

namespace po = boost::program_options;

namespace ridgecal::cli {

namespace {
po::options_description merge_options() {
  po::options_description d("ridgecal merge-summaries SHARD... --out-dir DIR");
  // clang-format off
  d.add_options()
    ("help,h", "show this help")
    ("out-dir,o", po::value<std::string>(), "directory for the merged summary.json and summary.csv")
    ("allow-mixed-settings", po::bool_switch(), "merge shards fitted with different settings (settings_sha256 becomes 'mixed')");
  // clang-format on
  return d;
}
}  // namespace

std::string merge_usage() {
  std::ostringstream s;
  s << merge_options();
  s << "\nEach SHARD is a summary.json written by 'ridgecal batch', or the batch output directory "
       "holding it.\n"
       "Exit codes: 0 merged and every unit ok, 1 merged with failed or out-of-tolerance units, 2 "
       "bad usage or input\n"
       "(nothing written).\n";
  return s.str();
}

MergeCommand parse_merge_command(const std::vector<std::string>& args) {
  const po::variables_map vm = parse_arguments(args, merge_options(), "inputs");
  MergeCommand cmd;
  if (vm.count("help")) {
    cmd.help = true;
    return cmd;
  }
  if (!vm.count("inputs"))
    throw UsageError(
        "give the shard summaries: ridgecal merge-summaries A/summary.json B/summary.json -o DIR");
  if (!vm.count("out-dir")) throw UsageError("--out-dir is required");
  cmd.inputs = vm["inputs"].as<std::vector<std::string>>();
  cmd.out_dir = vm["out-dir"].as<std::string>();
  cmd.merge.allow_mixed_settings = vm["allow-mixed-settings"].as<bool>();
  return cmd;
}

int run_merge_command(const MergeCommand& cmd, std::ostream& out, std::ostream& err) {
  if (cmd.help) {
    out << merge_usage();
    return kExitOk;
  }
  try {
    std::vector<BatchSummary> shards;
    std::vector<std::string> names;
    for (const std::string& in : cmd.inputs) {
      std::string path = in;
      if (std::filesystem::is_directory(path)) path += "/summary.json";
      // An output that is an input: refused before anything is written.
      for (const char* out_name : {"summary.json", "summary.csv"})
        if (same_file(path, cmd.out_dir + "/" + out_name))
          throw InputError(path, 0,
                           fmt::format("this input is also an output of the merge ({} in the "
                                       "output directory), which would overwrite it",
                                       out_name),
                           "give another --out-dir");
      shards.push_back(read_batch_summary(path));
      names.push_back(path);
    }
    const BatchSummary merged = merge_batch_summaries(shards, names, cmd.merge);
    std::error_code ec;
    std::filesystem::create_directories(cmd.out_dir, ec);
    if (ec)
      throw InputError(cmd.out_dir, 0, "cannot create the output directory: " + ec.message(),
                       "check the path");
    {
      const OutputDirLock lock(cmd.out_dir);  // no batch writes there meanwhile
      write_batch_summary(merged, cmd.out_dir);
    }
    BatchTotals totals;
    for (const auto& u : merged.units) totals.add(u);
    out << fmt::format("{} shards, {}\n", shards.size(), totals.line());
    if (const std::string reasons = totals.reasons_line(); !reasons.empty()) out << reasons << "\n";
    return totals.not_fitted || totals.out_of_tolerance || totals.undecided ? kExitOutOfTolerance
                                                                            : kExitOk;
  } catch (const InputError& e) {
    err << "ridgecal merge-summaries: " << format_input_error(e) << "\n";
    return kExitBadInput;
  }
}

int merge_main(const std::vector<std::string>& args, std::ostream& out, std::ostream& err) {
  return run_subcommand("merge-summaries", args, out, err, parse_merge_command, run_merge_command);
}

}  // namespace ridgecal::cli
