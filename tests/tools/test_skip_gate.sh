#!/usr/bin/env bash
# The test command's skip gate (check_skips.py) must fail on a skipped test
# that the allow-list does not excuse, name it and show its output (the missing
# tool), accept a listed test only with a reason, and fail on a report in which
# no test ran. Also checks that the committed allow-list is empty.
# usage: test_skip_gate.sh
set -u
here=$(cd "$(dirname "$0")" && pwd)
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
fails=0 passes=0
ok() { passes=$((passes + 1)); }
bad() { echo "FAIL: $*"; fails=$((fails + 1)); }

# A CTest JUnit report (the format of ctest --output-junit): one passed, one
# failed, one skipped by SKIP_RETURN_CODE, one disabled test.
cat >"$work/junit.xml" <<'XML'
<?xml version="1.0" encoding="UTF-8"?>
<testsuite name="x" tests="4" failures="1" disabled="1" skipped="2" hostname="" time="0" timestamp="2026-12-02T09:00:00">
	<testcase name="a.pass" classname="a.pass" time="0.1" status="run"><system-out></system-out></testcase>
	<testcase name="a.fail" classname="a.fail" time="0.1" status="fail"><failure message=""/><system-out></system-out></testcase>
	<testcase name="a.skip" classname="a.skip" time="0.1" status="notrun">
		<skipped message="SKIP_RETURN_CODE=77"/>
		<system-out>MISSING TOOL: qemu-system-arm (hint)
SKIP: qemu-system-arm is missing</system-out>
	</testcase>
	<testcase name="a.off" classname="a.off" time="0" status="disabled"><system-out>Disabled</system-out></testcase>
</testsuite>
XML
printf '<?xml version="1.0"?>\n<testsuite name="x" tests="0"></testsuite>\n' >"$work/empty.xml"
printf '# comment only\n\n' >"$work/none.txt"
printf 'a.skip   no emulator on this laptop\na.off  switched off on purpose # note\n' >"$work/both.txt"
printf 'a.skip\na.off reason\n' >"$work/noreason.txt"

# run ALLOW WANT_RC TEXT...: the gate's exit code and the lines it must print.
run() {
  local allow=$1 junit=$2 want=$3
  shift 3
  python3 "$here/check_skips.py" "$work/$junit" "$work/$allow" >"$work/out" 2>&1
  local rc=$?
  local miss=""
  for t in "$@"; do grep -qF -- "$t" "$work/out" || miss="$miss [$t]"; done
  if [[ $rc -eq $want && -z $miss ]]; then ok
  else bad "$allow/$junit: exit $rc (want $want), missing:$miss; output: $(cat "$work/out")"; fi
}
run none.txt junit.xml 1 "test a.skip did not run (SKIP_RETURN_CODE=77)" "MISSING TOOL: qemu-system-arm" \
  "test a.off did not run (disabled)" "2 skipped without leave"
run both.txt junit.xml 0 "allowed by" "a.skip: no emulator on this laptop" "0 skipped without leave, 2 allowed skips"
run noreason.txt junit.xml 1 "'a.skip' has no reason" "test a.skip did not run"
run none.txt empty.xml 1 "no test ran at all"
# A failed test is ctest's business (it exits non-zero), not the gate's.
grep -q "a.fail" "$work/out" && bad "the gate reported a failed test as skipped" || ok

# The committed allow-list excuses nothing.
if grep -v '^[[:space:]]*\(#\|$\)' "$here/../allowed-skips.txt" | grep -q .; then
  bad "tests/allowed-skips.txt is not empty: $(grep -v '^[[:space:]]*\(#\|$\)' "$here/../allowed-skips.txt")"
else ok; fi

echo "skip_gate: $passes passed, $fails failed"
[[ $fails -eq 0 && $passes -eq 6 ]]
