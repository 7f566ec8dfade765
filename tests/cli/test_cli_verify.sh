#!/usr/bin/env bash
# End-to-end tests of the decision on `ridgecal fit` and of `ridgecal verify`:
# PASS exits 0, FAIL exits 1 with the record (or as-found result) still written
# and marked FAIL, a modified record is refused with exit 2 unless
# --allow-modified, warnings go to stderr with their codes.
# usage: test_cli_verify.sh RIDGECAL_BINARY SAMPLES_DIR
set -u
bin=$1 samples=$2
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
fails=0 passes=0
check() { # check DESCRIPTION CONDITION...
  local what=$1; shift
  if "$@"; then passes=$((passes + 1)); else echo "FAIL: $what"; fails=$((fails + 1)); fi
}
# The decision's verdict: the only "verdict" member two levels deep in the pretty JSON.
jq_verdict() { sed -n 's/^    "verdict": "\([A-Z]*\)",\{0,1\}$/\1/p' "$1"; }

ntc=$samples/ntc-coldstore/ntc-coldstore.csv
lc=$samples/loadcell-hopper/loadcell-hopper.csv

# fit, PASS
"$bin" fit "$ntc" --setpoint setpoint --tol-offset 0.2 --ref-uncertainty 0.02 --ref-k 2 --resolution 1 \
  --timestamp none -o "$work/pass.json" >"$work/out" 2>"$work/err"
rc=$?
check "fit PASS exits 0 (got $rc)" test $rc -eq 0
check "fit PASS printed" grep -q '^PASS$' "$work/out"
check "fit prints U with k = 2" grep -q 'U = .*(k = 2)' "$work/out"
check "record says PASS" test "$(jq_verdict "$work/pass.json")" = PASS
# A straight line through the thermistor: the lack-of-fit test warns (issue 13;
# the sample's own fit no longer warns since few-setpoints-per-coefficient was reworked).
"$bin" fit "$ntc" --setpoint setpoint --degrees 1 --timestamp none -o "$work/line.json" \
  >/dev/null 2>"$work/err_line"
check "warnings carry codes on stderr" grep -Eq '^warning \[lack-of-fit\]: ' "$work/err_line"

# fit, FAIL: a tolerance far below the errors
"$bin" fit "$ntc" --setpoint setpoint --tol-offset 0.001 --timestamp none -o "$work/fail.json" >"$work/out" 2>"$work/err"
rc=$?
check "fit FAIL exits 1 (got $rc)" test $rc -eq 1
check "fit FAIL still writes the record" test -s "$work/fail.json"
check "record says FAIL" test "$(jq_verdict "$work/fail.json")" = FAIL
check "stdout says FAIL" grep -q '^FAIL' "$work/out"

# guarded rule on a tolerance only a little above the errors: simple PASS, guarded FAIL
"$bin" fit "$ntc" --setpoint setpoint --tol-offset 0.045 --ref-uncertainty 0.05 --ref-k 2 --timestamp none >"$work/out" 2>&1
check "simple acceptance passes at 0.045" test $? -eq 0
"$bin" fit "$ntc" --setpoint setpoint --tol-offset 0.045 --ref-uncertainty 0.05 --ref-k 2 --decision guarded \
  --timestamp none >"$work/out" 2>&1
check "guarded acceptance fails at 0.045 with U ~ 0.06" test $? -eq 1

# hysteresis: the load cell sample has a direction column
"$bin" fit "$lc" --setpoint setpoint --direction direction --tol-offset 0.0001 --timestamp none >"$work/out" 2>"$work/err"
check "hysteresis warning with a tight tolerance" grep -q 'warning \[hysteresis\]' "$work/err"
"$bin" fit "$lc" --setpoint setpoint --direction nosuchcol --timestamp none >"$work/out" 2>"$work/err"
check "missing direction column exits 2" test $? -eq 2

# usage errors
"$bin" fit "$ntc" --tol-class iec60751-Z >"$work/out" 2>"$work/err"
check "bad --tol-class exits 2" test $? -eq 2
check "bad --tol-class names the option" grep -q -- '--tol-class' "$work/err"
"$bin" fit "$ntc" --decision guarded >"$work/out" 2>"$work/err"
check "--decision without a tolerance exits 2" test $? -eq 2
"$bin" fit "$ntc" --ref-uncertainty -1 >"$work/out" 2>"$work/err"
check "negative --ref-uncertainty exits 2" test $? -eq 2

# verify: the record's own tolerance
"$bin" verify "$work/pass.json" "$ntc" --timestamp none -o "$work/af.json" >"$work/out" 2>"$work/err"
rc=$?
check "verify PASS exits 0 (got $rc)" test $rc -eq 0
check "as-found result written" test -s "$work/af.json"
check "as-found says PASS" test "$(jq_verdict "$work/af.json")" = PASS
check "tolerance from the record" grep -q 'from the record' "$work/out"
# verify with a new, tighter tolerance: FAIL, result still written
"$bin" verify "$work/pass.json" "$ntc" --tol-offset 0.001 -o "$work/af2.json" >"$work/out" 2>"$work/err"
check "verify FAIL exits 1" test $? -eq 1
check "verify FAIL still writes the result" test "$(jq_verdict "$work/af2.json")" = FAIL
check "verify FAIL names the points out of tolerance" grep -q 'out of tolerance: line [0-9]' "$work/out"
"$bin" verify "$work/pass.json" "$ntc" --full >"$work/out" 2>"$work/err"
check "verify --full lists every point" test "$(grep -c '^ *[0-9][0-9]* S[0-9]' "$work/out")" -eq 60

# a modified record is refused
sed 's/"tool_version": "/"tool_version": "x/' "$work/pass.json" >"$work/mod.json"
rm -f "$work/af3.json"
"$bin" verify "$work/mod.json" "$ntc" -o "$work/af3.json" >"$work/out" 2>"$work/err"
check "modified record exits 2" test $? -eq 2
check "modified record: message says how to re-create it" grep -q "re-create it with 'ridgecal fit" "$work/err"
check "modified record: nothing written" test ! -e "$work/af3.json"
"$bin" verify "$work/mod.json" "$ntc" --allow-modified -o "$work/af3.json" >"$work/out" 2>"$work/err"
check "--allow-modified runs (got $?)" test -s "$work/af3.json"
check "--allow-modified is noted on stdout" grep -q 'MODIFIED' "$work/out"
check "--allow-modified is noted in the result" grep -q '"record-modified"' "$work/af3.json"

# verify usage errors
"$bin" verify "$work/pass.json" >"$work/out" 2>"$work/err"
check "verify with one file exits 2" test $? -eq 2

echo "cli verify: $passes passed, $fails failed"
[[ $fails -eq 0 ]]
