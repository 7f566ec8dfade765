// Shared helpers for the unit tests: synthetic calibration runs.
#pragma once

#include <stdlib.h>

#include <cmath>
#include <cstdint>
#include <filesystem>
#include <fstream>
#include <functional>
#include <iosfwd>
#include <sstream>
#include <stdexcept>
#include <string>
#include <system_error>
#include <vector>

#include "ridgecal/calibration_csv.hpp"
#include "ridgecal/grouped_split.hpp"

namespace ridgecal::test {

/// Standard normal deviates from the project's portable RNG (Box-Muller).
class Gauss {
 public:
  explicit Gauss(std::uint64_t seed) : rng_(seed) {}
  double next() {
    const double u1 = (static_cast<double>(rng_.next() >> 11) + 0.5) * 0x1.0p-53;
    const double u2 = (static_cast<double>(rng_.next() >> 11) + 0.5) * 0x1.0p-53;
    return std::sqrt(-2.0 * std::log(u1)) * std::cos(6.283185307179586 * u2);
  }

 private:
  SplitRng rng_;
};

/// `setpoints` equally spaced readings over [x0, x1], `repeats` rows each,
/// reference = f(reading) + noise_sd * N(0,1). Setpoints are labelled S01...
inline Dataset synthetic_run(const std::function<double(double)>& f, double x0, double x1,
                             int setpoints, int repeats, double noise_sd, std::uint64_t seed) {
  Gauss g(seed);
  Dataset ds;
  ds.file = "synthetic.csv";
  std::size_t line = 2;
  for (int s = 0; s < setpoints; ++s) {
    const double x = x0 + (x1 - x0) * s / (setpoints - 1);
    for (int r = 0; r < repeats; ++r) {
      Observation ob;
      ob.reading = x + 1e-3 * (x1 - x0) * g.next();
      ob.reference = f(ob.reading) + noise_sd * g.next();
      ob.setpoint = "S" + std::to_string(100 + s).substr(1);
      ob.line = line++;
      ds.rows.push_back(ob);
    }
  }
  return ds;
}

/// A fresh directory of the test's own under the system temporary directory
/// (mkdtemp), removed with its contents at the end. Tests write only there,
/// never into the working directory, so that `ctest -j` is safe.
class TempDir {
 public:
  TempDir() {
    std::string t = (std::filesystem::temp_directory_path() / "ridgecal-test-XXXXXX").string();
    if (::mkdtemp(t.data()) == nullptr) throw std::runtime_error("mkdtemp failed for " + t);
    path_ = t;
  }
  TempDir(const TempDir&) = delete;
  TempDir& operator=(const TempDir&) = delete;
  ~TempDir() {
    std::error_code ec;
    std::filesystem::remove_all(path_, ec);
  }
  const std::filesystem::path& path() const { return path_; }
  std::string operator/(const std::string& name) const { return (path_ / name).string(); }

 private:
  std::filesystem::path path_;
};

/// The whole content of a file (empty when it cannot be read).
inline std::string slurp(const std::filesystem::path& p) {
  std::ifstream in(p, std::ios::binary);
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}

/// A subcommand's entry point (cli/*_command.hpp) called in-process.
using SubcommandMain = int (*)(const std::vector<std::string>&, std::ostream&, std::ostream&);

/// Runs a subcommand; its stdout and stderr go to *text when given.
inline int call_main(SubcommandMain m, const std::vector<std::string>& args,
                     std::string* text = nullptr) {
  std::ostringstream out, err;
  const int rc = m(args, out, err);
  if (text) *text = out.str() + err.str();
  return rc;
}

}  // namespace ridgecal::test
