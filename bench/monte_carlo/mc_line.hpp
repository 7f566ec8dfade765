// ridgecal Monte Carlo harness: a production line of invented capacitive RH
// probes, each unit's data written as CSV text and read back by the library's
// parser (so that a missing cell is the parse error it would be in a batch).
#pragma once

#include <cstdint>
#include <string>
#include <vector>

namespace ridgecal::mc {

struct LineRow {
  std::string kind;  ///< `good`, `stuck`, `open-circuit`, `spike`, `missing-cell`
  int units = 0;
  int rejected = 0;     ///< refused (parse or fit error) or verdict FAIL
  int undecided = 0;    ///< verdict UNDECIDED (not passed, not failed)
  int undecided_u = 0;  ///< of those: U >= limit at some counted point
  int flagged = 0;      ///< fitted with at least one warning
  int rejected_or_flagged = 0;
  int hardware = 0;  ///< refused by the hardware-fault check (stuck, open or short, saturated)
  int reasoned = 0;  ///< given the batch reason code the defect should get (batch_run.cpp)
};

struct LineStats {
  std::vector<LineRow> rows;
};

/// `good_units` good units, and max(50, good_units / 10) units of each gross
/// defect. `no_inadequacy`: without the model-inadequacy term and the
/// adequacy check (the method before them).
LineStats run_line(int good_units, std::uint64_t seed, bool no_inadequacy = false);

}  // namespace ridgecal::mc
