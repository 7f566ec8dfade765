// ridgecal: calibration curves for sensors, from the command line.
#include <cstring>
#include <iostream>
#include <string>
#include <vector>

#include "batch_command.hpp"
#include "cli_common.hpp"
#include "export_command.hpp"
#include "fit_command.hpp"
#include "merge_command.hpp"
#include "report_command.hpp"
#include "ridgecal/record.hpp"
#include "verify_command.hpp"

namespace {

struct Subcommand {
  const char* name;
  const char* summary;
  ridgecal::cli::SubcommandMain main;
};

// Every subcommand: one file pair in cli/, one line here.
const Subcommand kSubcommands[] = {
    {"fit", "fit a calibration curve to a CSV run and write a calibration record",
     ridgecal::cli::fit_main},
    {"batch", "calibrate every unit of a production batch: records and a summary",
     ridgecal::cli::batch_main},
    {"merge-summaries", "merge the batch summaries of several shards", ridgecal::cli::merge_main},
    {"verify", "as-found check: apply a calibration record to fresh readings, PASS/FAIL",
     ridgecal::cli::verify_main},
    {"export", "write a freestanding C header (float, double or fixed point) from a record",
     ridgecal::cli::export_main},
    {"report", "write the QA calibration report (HTML) of a calibration record",
     ridgecal::cli::report_main},
};

void usage(std::ostream& os) {
  os << "ridgecal " << ridgecal::tool_version() << ": calibration curves for sensors\n\n"
     << "usage: ridgecal COMMAND [options]   (ridgecal COMMAND --help for details)\n\ncommands:\n";
  for (const auto& s : kSubcommands)
    os << "  " << s.name
       << std::string(std::strlen(s.name) < 10 ? 10 - std::strlen(s.name) : 1, ' ') << s.summary
       << "\n";
  os << "\nexit codes: 0 pass, 1 out of tolerance, 2 bad input or usage\n"
     << "Safety-relevant calibration must follow local codes and certified procedures.\n";
}

}  // namespace

int main(int argc, char** argv) {
  if (argc < 2) {
    usage(std::cerr);
    return ridgecal::cli::kExitBadInput;
  }
  const std::string name = argv[1];
  if (name == "--help" || name == "-h" || name == "help") {
    usage(std::cout);
    return 0;
  }
  if (name == "--version") {
    std::cout << "ridgecal " << ridgecal::tool_version() << "\n";
    return 0;
  }
  const std::vector<std::string> args(argv + 2, argv + argc);
  for (const auto& s : kSubcommands)
    if (name == s.name) {
      try {
        return s.main(args, std::cout, std::cerr);
      } catch (const std::exception& e) {
        std::cerr << "ridgecal " << name << ": internal error: " << e.what() << "\n";
        return 3;
      }
    }
  std::cerr << "ridgecal: unknown command '" << name << "'\n";
  usage(std::cerr);
  return ridgecal::cli::kExitBadInput;
}
