// ridgecal fuzzing: an invariant that must hold for every input. A violation
// aborts, which libFuzzer reports as a crash (and the replay test as a failure).
#pragma once

#include <cstdio>
#include <cstdlib>

#define RIDGECAL_FUZZ_CHECK(cond)                                                               \
  do {                                                                                          \
    if (!(cond)) {                                                                              \
      std::fprintf(stderr, "fuzz invariant violated: %s (%s:%d)\n", #cond, __FILE__, __LINE__); \
      std::abort();                                                                             \
    }                                                                                           \
  } while (0)
