// ridgecal CLI: pieces shared by the subcommands.
//
// Exit codes (documented in README.md and docs/cli.md):
//   0  success; calibration within tolerance (or no tolerance given)
//   1  out of tolerance, or an export refused because its arithmetic deviates too much
//   2  bad input or usage (nothing is written)
#pragma once

#include <boost/program_options.hpp>
#include <cstdint>
#include <iosfwd>
#include <ostream>
#include <stdexcept>
#include <string>
#include <vector>

namespace ridgecal::cli {

enum ExitCode : int { kExitOk = 0, kExitOutOfTolerance = 1, kExitBadInput = 2 };

/// A bad command line. The CLI prints "ridgecal SUB: message" and exits 2.
class UsageError : public std::runtime_error {
 public:
  using std::runtime_error::runtime_error;
};

/// "1..7", "1-7", "1,2,5", "2,4..6" -> sorted distinct degrees.
std::vector<int> parse_degree_list(const std::string& text);
/// Comma-separated items, each a number or A:B:N (N values log-spaced from A
/// to B inclusive, A and B > 0); "default" gives the default grid.
std::vector<double> parse_lambda_list(const std::string& text);
/// A finite number (the whole string), or UsageError naming the option.
double parse_number_option(const std::string& option, const std::string& text);
/// ",", ";", "tab" or "\t" -> the delimiter character.
char parse_delimiter(const std::string& text);

/// The creation time for records: `injected` if not empty ("none" gives an
/// empty string), else SOURCE_DATE_EPOCH if set, else the current UTC time,
/// as ISO 8601 "YYYY-MM-DDTHH:MM:SSZ".
std::string creation_time(const std::string& injected);

/// Parses a subcommand's arguments: `options`, plus every positional argument
/// collected as a std::vector<std::string> under the name `positional`.
/// Throws UsageError with program_options' message.
boost::program_options::variables_map parse_arguments(
    const std::vector<std::string>& args,
    const boost::program_options::options_description& options, const std::string& positional);

/// The entry point every subcommand shares: `parse(args)` (a UsageError
/// becomes "ridgecal NAME: message" and "Try 'ridgecal NAME --help'." on err,
/// exit 2), then `run(command, out, err)`.
template <class Parse, class Run>
int run_subcommand(const char* name, const std::vector<std::string>& args, std::ostream& out,
                   std::ostream& err, Parse parse, Run run) {
  decltype(parse(args)) cmd;
  try {
    cmd = parse(args);
  } catch (const UsageError& e) {
    err << "ridgecal " << name << ": " << e.what() << "\nTry 'ridgecal " << name << " --help'.\n";
    return kExitBadInput;
  }
  return run(cmd, out, err);
}

/// Subcommand entry point: args exclude the program and subcommand names.
using SubcommandMain = int (*)(const std::vector<std::string>& args, std::ostream& out,
                               std::ostream& err);

}  // namespace ridgecal::cli
