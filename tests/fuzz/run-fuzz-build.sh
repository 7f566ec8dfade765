#!/usr/bin/env bash
# Builds the libFuzzer targets with clang (ASan + UBSan, assertions on) in
# BUILD_DIR (default: build-fuzz) and runs each for RIDGECAL_FUZZ_SECONDS
# (default 60) seconds through CTest (label `fuzz`). Run from anywhere:
#
#   bash tests/fuzz/run-fuzz-build.sh                       # as CI does
#   RIDGECAL_FUZZ_SECONDS=600 nice -n 10 bash tests/fuzz/run-fuzz-build.sh
#
# Environment: BUILD_DIR, JOBS (default 2), CXX_FUZZ (default clang++),
# CC_FUZZ (default clang).
set -euo pipefail
cd "$(dirname "$0")/../.."
build=${BUILD_DIR:-build-fuzz}
jobs=${JOBS:-2}
seconds=${RIDGECAL_FUZZ_SECONDS:-60}
cmake -S . -B "$build" -G Ninja -DCMAKE_BUILD_TYPE=Debug -DCMAKE_CXX_FLAGS_DEBUG="-O1 -g" -DCMAKE_C_FLAGS_DEBUG="-O1 -g" \
  -DCMAKE_CXX_COMPILER="${CXX_FUZZ:-clang++}" -DCMAKE_C_COMPILER="${CC_FUZZ:-clang}" \
  -DRIDGECAL_FUZZ=ON -DRIDGECAL_BUILD_TESTS=ON -DRIDGECAL_FUZZ_SECONDS="$seconds" >/dev/null
cmake --build "$build" -j "$jobs" --target fuzz_csv_reader fuzz_record fuzz_batch_fast
bash tests/run-suite.sh "$build" -L fuzz --output-on-failure -j "$jobs"
