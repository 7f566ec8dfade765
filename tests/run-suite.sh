#!/usr/bin/env bash
# run-suite.sh BUILD_DIR [CTEST_ARGS...]: the test command's CTest run.
# Runs ctest on BUILD_DIR with CTEST_ARGS and a JUnit report, then fails when
# any test was skipped (or not run) unless tests/allowed-skips.txt lists it with
# a reason (tests/tools/check_skips.py). CTest alone counts a skipped test
# (SKIP_RETURN_CODE) as passed; this does not. Exit 0 only when ctest passed
# and no test was skipped without leave.
set -u
here=$(cd "$(dirname "$0")" && pwd)
build=$1
shift
python=$(command -v python3) || { echo "run-suite: MISSING TOOL: python3 (apt-get install python3)"; exit 1; }
junit=$(mktemp "${TMPDIR:-/tmp}/ridgecal-ctest-XXXXXX.xml")
trap 'rm -f "$junit"' EXIT
ctest --test-dir "$build" --no-tests=error --output-junit "$junit" "$@"
ctest_rc=$?
"$python" "$here/tools/check_skips.py" "$junit" "${RIDGECAL_ALLOWED_SKIPS:-$here/allowed-skips.txt}"
skip_rc=$?
if ((ctest_rc != 0)); then echo "run-suite: ctest failed (exit $ctest_rc)"; exit 1; fi
((skip_rc == 0)) || exit 1
