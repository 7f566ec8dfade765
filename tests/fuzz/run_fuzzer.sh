#!/usr/bin/env bash
# Runs one libFuzzer target for a bounded time (a CTest test of the fuzz build).
#
# usage: run_fuzzer.sh FUZZER SECONDS WORK_DIR SEED_DIR REGRESSION_DIR [DICT]
#
# New inputs go to WORK_DIR/corpus (the seed corpus in the repository is only
# read). A crash, leak, timeout or invariant violation fails the test; the
# input is saved as WORK_DIR/crash-* (or leak-*, timeout-*, oom-*). Make it a
# regression test: copy it into REGRESSION_DIR, fix the bug, commit both.
# RIDGECAL_FUZZ_SECONDS in the environment overrides SECONDS.
set -euo pipefail
fuzzer=$1 seconds=${RIDGECAL_FUZZ_SECONDS:-$2} work=$3 seeds=$4 regressions=$5 dict=${6:-}
mkdir -p "$work/corpus"
args=(-max_total_time="$seconds" -timeout=20 -rss_limit_mb=2560 -max_len=8192
      -print_final_stats=1 -artifact_prefix="$work/")
[[ -n $dict ]] && args+=(-dict="$dict")
echo "fuzz: $(basename "$fuzzer") for ${seconds}s"
set +e
"$fuzzer" "${args[@]}" "$work/corpus" "$seeds" "$regressions" 2>"$work/log.txt"
rc=$?
set -e
grep -E '^(stat::|#[0-9]+ +DONE|Done )' "$work/log.txt" || true
if [[ $rc -ne 0 ]]; then
  tail -n 60 "$work/log.txt"
  echo "fuzz: $(basename "$fuzzer") FAILED (exit $rc); inputs: $(ls "$work" | grep -E '^(crash|leak|timeout|oom)-' | tr '\n' ' ')"
  echo "fuzz: copy the input into $regressions, fix the bug, and commit both"
  exit 1
fi
echo "fuzz: $(basename "$fuzzer") passed"
