#!/usr/bin/env bash
# Removing qemu, simavr, chromium or numpy makes the test that needs it fail
# under CI=true (exit 1) with a message naming the tool, and skip (exit 77,
# which the test command's skip gate still rejects) without CI. Each case runs
# the real test script with a PATH that lacks the one tool: a directory of
# links to the basic programs, plus do-nothing stand-ins for the other tools
# the script asks for first (so that the case does not depend on what else
# this machine has). numpy is hidden by a module that fails to
# import, placed first on PYTHONPATH.
# usage: test_missing_tools.sh [PYTHON_WITH_NUMPY]
set -u
here=$(cd "$(dirname "$0")" && pwd)
tests=$(cd "$here/.." && pwd)
python=${1:-python3}
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
fails=0 passes=0
ok() { passes=$((passes + 1)); }
bad() { echo "FAIL: $*"; fails=$((fails + 1)); }

# farm DIR DROPPED STUBS...: DIR holds links to the basic programs the test
# scripts use (never DROPPED) and stand-ins (exit 0) for STUBS.
BASIC="bash sh env dirname basename cat rm mkdir grep sed head tail tr cut wc cmp sort true false"
farm() {
  local dir=$1 dropped=$2
  shift 2
  mkdir -p "$dir"
  local name path
  for name in $BASIC; do
    path=$(command -v "$name") || { echo "farm: $name not found"; return 1; }
    ln -s "$path" "$dir/$name"
  done
  for name in "$@"; do
    printf '#!/bin/sh\nexit 0\n' >"$dir/$name"
    chmod +x "$dir/$name"
  done
  if PATH=$dir command -v "$dropped" >/dev/null; then echo "farm: $dropped still in $dir"; return 1; fi
}

# expect TOOL FARM COMMAND...: under CI=true exit 1, without CI exit 77, and
# both times a line "MISSING TOOL: TOOL".
expect() {
  local tool=$1 dir=$2
  shift 2
  local ci rc want
  for ci in true ""; do
    want=$([[ $ci == true ]] && echo 1 || echo 77)
    env -u RIDGECAL_CHROMIUM CI="$ci" PATH="$dir" "$@" >"$work/out" 2>&1
    rc=$?
    if [[ $rc -eq $want ]] && grep -q "^MISSING TOOL: $tool\b" "$work/out"; then ok
    else bad "without $tool (CI='$ci'): exit $rc, want $want and 'MISSING TOOL: $tool': $(head -5 "$work/out")"; fi
  done
}

fixtures=$work/fixtures
mkdir -p "$fixtures"
echo "none" >"$fixtures/fixtures.txt"

farm "$work/no-qemu" qemu-system-arm arm-none-eabi-gcc
expect qemu-system-arm "$work/no-qemu" bash "$tests/firmware/run-target.sh" m3 "$fixtures" /bin/false "$work/run-m3"

farm "$work/no-simavr" simavr avr-gcc
expect simavr "$work/no-simavr" bash "$tests/firmware/run-target.sh" avr "$fixtures" /bin/false "$work/run-avr"

farm "$work/no-chromium" chromium node pdfinfo
echo "<!DOCTYPE html><title>t</title>" >"$work/page.html"
expect chromium "$work/no-chromium" sh "$tests/report/browser_test.sh" --html "$work/page.html" "$work/browser"

mkdir -p "$work/no-numpy"
echo 'raise ImportError("numpy hidden by test_missing_tools.sh")' >"$work/no-numpy/numpy.py"
expect numpy "$PATH" env PYTHONPATH="$work/no-numpy" "$python" "$tests/cli/check_surface_budget.py" \
  /bin/false "$work" "$work/budget"

echo "missing_tools_named: $passes passed, $fails failed"
[[ $fails -eq 0 && $passes -eq 8 ]]
