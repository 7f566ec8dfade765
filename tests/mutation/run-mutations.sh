#!/usr/bin/env bash
# run-mutations.sh SOURCE_DIR [WORK_DIR]
#
# Mutation check of the test suite (issue 18): copies the source tree (without
# build directories and .git) to WORK_DIR (default: a new mktemp -d), builds
# the CLI and the relevant tests there once, then for each deliberate fault
# below: applies it to the copy, rebuilds incrementally, runs the relevant
# tests, records which failed, and restores the file. Prints the table
# "mutation -> tests that failed". Exit 0 when every mutation was applied and
# caught by at least one test, 1 otherwise (a mutation that no test catches is
# a finding), 2 on a setup error (baseline build or baseline tests failing, a
# mutation whose code pattern is no longer in the source).
#
# Environment: RIDGECAL_MUTATIONS="name ..." runs only those mutations;
# RIDGECAL_MUTATION_REUSE=1 with an existing WORK_DIR reuses its copy and
# build instead of copying again (the copy's files are restored after each
# mutation); RIDGECAL_MUTATION_JOBS (default 2).
#
# Not part of the default test run (it takes about 15-30 minutes on two
# cores, most of it the first build); see docs/testing.md. ccache is used
# when present (CCACHE_BASEDIR is the copy, so a second run reuses the first
# run's objects).
set -u
src=$(cd "${1:?usage: run-mutations.sh SOURCE_DIR [WORK_DIR]}" && pwd)
work=${2:-$(mktemp -d "${TMPDIR:-/tmp}/ridgecal-mutations.XXXXXX")}
mkdir -p "$work"
tree=$work/src
build=$tree/build
log=$work/log
mkdir -p "$log"
jobs=${RIDGECAL_MUTATION_JOBS:-2}

for tool in cmake ninja python3; do
  command -v "$tool" >/dev/null || { echo "FAIL: $tool not found (needed by the mutation check)"; exit 2; }
done

# The tests that can see the faults below (unit tests, CLI scripts, numpy
# cross-checks without their self-test twins, the host firmware run).
TARGETS="ridgecal fw_fixture fw_compare test_poly_model test_ridge_path test_ridge_grid test_nist_strd
  test_thermometry test_assessment test_grouped_split test_selection test_selection_pins test_record
  test_record_guard test_cli_judgement test_extended_uncertainty test_firmware_export test_export_command"
TESTS='^(fitter\.poly_model|fitter\.ridge_path|fitter\.ridge_grid|fitter\.nist_strd|fitter\.thermometry|fitter\.assessment|fitter\.grouped_split|fitter\.selection|fitter\.selection_pins|fitter\.record|fitter\.record_guard|cli\.judgement|fitter\.surface_uncertainty|firmware\.export|firmware\.export_command|cli\.fit|cli\.verify|cli\.surface_budget_numpy\.check|firmware\.generate_fixtures|firmware\.target\.host-gcc|crosscheck\.cv_selection|crosscheck\.budget_1d|crosscheck\.record_digest|crosscheck\.firmware_model_host)$'

# name | file | exact text | replacement | what the fault is
MUTATIONS=$(cat <<'LIST'
cheb-coef|fitter/src/model/poly_model.cpp|    const double b0 = c[k] + 2.0 * t * b1 - b2;|    const double b0 = (k == 1 ? c[k] * (1.0 + 1e-6) : c[k]) + 2.0 * t * b1 - b2;|evaluation uses c_1 (1 + 1e-6) instead of c_1
tolerance-abs|fitter/src/assess/tolerance.cpp|  return offset + proportional * std::fabs(reference) + percent_of_span / 100.0 * span();|  return offset + proportional * reference + percent_of_span / 100.0 * span();|tolerance limit a + b*r instead of a + b*abs(r)
cv-fold-stride|fitter/src/fit/grouped_split.cpp|  for (std::size_t start = 0; start < candidates.size(); start += K) {|  for (std::size_t start = 0; start < candidates.size(); start += K - 1) {|K-fold blocks of K-1 setpoints (labels overwritten, folds uneven)
coverage-k|fitter/src/assess/uncertainty.cpp|  b.k = options.coverage_k;|  b.k = options.coverage_k * 1.25;|coverage factor k = 2.5 where 2 is asked for
digest-ascii|fitter/src/record/record_write.cpp|  return sha256_hex(copy.dump(-1, ' ', false, json::error_handler_t::replace));|  return sha256_hex(copy.dump(-1, ' ', true, json::error_handler_t::replace));|digest over ASCII-escaped JSON (differs from the documented form for non-ASCII text)
header-literal|firmware-export/src/c_literals.cpp|  for (int digits = 6; digits <= 9; ++digits) {|  for (int digits = 6; digits <= 7; ++digits) {|float literals with at most 7 digits (do not round-trip)
LIST
)

if [ "${RIDGECAL_MUTATION_REUSE:-0}" = 1 ] && [ -f "$build/CMakeCache.txt" ]; then
  echo "== reusing the copy in $tree"
else
  echo "== copying $src to $tree"
  rm -rf "$tree"
  mkdir -p "$tree"
  (cd "$src" && tar --exclude='./build*' --exclude='./.git' -cf - .) | (cd "$tree" && tar -xf -)
fi

export CCACHE_BASEDIR=$tree CCACHE_NOHASHDIR=1
launcher=()
if command -v ccache >/dev/null; then
  launcher=(-DCMAKE_CXX_COMPILER_LAUNCHER=ccache -DCMAKE_C_COMPILER_LAUNCHER=ccache)
fi
echo "== configuring and building the baseline (log: $log/baseline-build.txt)"
if ! { cmake -S "$tree" -B "$build" -G Ninja -DCMAKE_BUILD_TYPE=RelWithDebInfo -DRIDGECAL_BUILD_TESTS=ON \
         "${launcher[@]}" && nice -n 10 cmake --build "$build" -j"$jobs" --target $TARGETS; } > "$log/baseline-build.txt" 2>&1; then
  tail -30 "$log/baseline-build.txt"; echo "FAIL: the baseline does not build"; exit 2
fi

run_tests() {  # run_tests LABEL: prints the failed tests (space-separated) or "-"
  ctest --test-dir "$build" -R "$TESTS" -j"$jobs" --timeout 900 > "$log/$1-tests.txt" 2>&1
  local failed
  failed=$(sed -n 's/^[[:space:]]*[0-9]* - \([^ ]*\) (.*)$/\1/p' "$log/$1-tests.txt" | sort | tr '\n' ' ')
  echo "${failed:--}"
}

echo "== baseline tests"
ntests=$(ctest --test-dir "$build" -R "$TESTS" -N | sed -n 's/^Total Tests: //p')
base=$(run_tests baseline)
if [ "$base" != "-" ]; then
  echo "FAIL: the baseline already fails: $base (see $log/baseline-tests.txt)"; exit 2
fi
echo "   $ntests tests pass"

rows=()
status=0
while IFS='|' read -r name file from to what; do
  [ -n "$name" ] || continue
  if [ -n "${RIDGECAL_MUTATIONS:-}" ] && [[ " $RIDGECAL_MUTATIONS " != *" $name "* ]]; then continue; fi
  f=$tree/$file
  cp "$f" "$work/orig"
  if ! python3 - "$f" "$from" "$to" <<'PY'
import sys
path, old, new = sys.argv[1:4]
text = open(path).read()
if text.count(old) != 1:
    sys.exit(f"pattern found {text.count(old)} times")
open(path, "w").write(text.replace(old, new))
PY
  then
    echo "FAIL: mutation $name: its code is no longer in $file (update this script)"; status=2
    rows+=("$name|$what|NOT APPLIED (pattern not found)"); continue
  fi
  echo "== $name: $what"
  if nice -n 10 cmake --build "$build" -j"$jobs" --target $TARGETS > "$log/$name-build.txt" 2>&1; then
    failed=$(run_tests "$name")
  else
    failed="(build failed: see $log/$name-build.txt)"
  fi
  echo "   failed: $failed"
  [ "$failed" = "-" ] && { echo "   NOT CAUGHT"; [ $status -eq 0 ] && status=1; }
  rows+=("$name|$what|$failed")
  cp "$work/orig" "$f"
  touch "$f"
done <<< "$MUTATIONS"

echo
echo "| mutation | fault | tests that failed |"
echo "|---|---|---|"
for r in "${rows[@]}"; do
  IFS='|' read -r n w f <<< "$r"
  [ "$f" = "-" ] && f="**none: not caught**"
  echo "| $n | $w | $f |"
done
echo
echo "($ntests tests run per mutation; logs in $log)"
exit $status
