// ridgecal_bench_gen: writes a synthetic production-line CSV (see
// fitter/include/ridgecal/batch_synthetic.hpp) to stdout or a file.
//   ridgecal_bench_gen UNITS [SETPOINTS REPEATS [SEED]] > units.csv
#include <cstdio>
#include <cstdlib>
#include <string>

#include "ridgecal/batch_synthetic.hpp"

int main(int argc, char** argv) {
  if (argc < 2 || argc > 5) {
    std::fprintf(stderr, "usage: ridgecal_bench_gen UNITS [SETPOINTS REPEATS [SEED]]\n");
    return 2;
  }
  const unsigned long long units = std::strtoull(argv[1], nullptr, 10);
  ridgecal::SyntheticUnitOptions o;
  if (argc >= 4) {
    o.setpoints = std::atoi(argv[2]);
    o.repeats = std::atoi(argv[3]);
  }
  if (argc == 5) o.seed = std::strtoull(argv[4], nullptr, 10);
  if (const std::string e = o.validate(); !e.empty()) {
    std::fprintf(stderr, "ridgecal_bench_gen: %s\n", e.c_str());
    return 2;
  }
  std::string buf = ridgecal::synthetic_csv_header();
  for (unsigned long long i = 0; i < units; ++i) {
    ridgecal::append_synthetic_unit_csv(buf, i, o);
    if (buf.size() > (1u << 20)) {
      std::fwrite(buf.data(), 1, buf.size(), stdout);
      buf.clear();
    }
  }
  std::fwrite(buf.data(), 1, buf.size(), stdout);
  return std::fflush(stdout) == 0 ? 0 : 1;
}
