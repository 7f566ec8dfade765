// ridgecal merge-summaries: joins the summary.json files of the shards of one
// batch (fitted on several machines) into one summary.json and summary.csv.
// Units are sorted by label; a unit found in two shards, or shards fitted
// with different settings, are refused (exit 2) unless --allow-mixed-settings.
//
// Exit codes: 0 merged, every unit ok; 1 merged, some unit failed or is out
// of tolerance; 2 bad usage or input (nothing written).
#pragma once

#include <iosfwd>
#include <string>
#include <vector>

#include "ridgecal/batch_summary.hpp"

namespace ridgecal::cli {

struct MergeCommand {
  std::vector<std::string> inputs;  ///< summary.json files (or directories holding one)
  std::string out_dir;              ///< where summary.json and summary.csv go
  MergeOptions merge;
  bool help = false;
};

MergeCommand parse_merge_command(const std::vector<std::string>& args);  ///< throws UsageError
int run_merge_command(const MergeCommand& cmd, std::ostream& out, std::ostream& err);
int merge_main(const std::vector<std::string>& args, std::ostream& out, std::ostream& err);
std::string merge_usage();

}  // namespace ridgecal::cli
