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

# guarded rule on a tolerance only a little above the errors (U ~ 0.035): simple PASS
# with a low test uncertainty ratio warning, guarded UNDECIDED (points in the guard band)
"$bin" fit "$ntc" --setpoint setpoint --tol-offset 0.045 --ref-uncertainty 0.02 --ref-k 2 --timestamp none >"$work/out" 2>&1
check "simple acceptance passes at 0.045 with U ~ 0.035" test $? -eq 0
check "simple acceptance warns of a TUR below 4:1" grep -q 'test uncertainty ratio (limit / U) below 4:1 at' "$work/out"
"$bin" fit "$ntc" --setpoint setpoint --tol-offset 0.045 --ref-uncertainty 0.02 --ref-k 2 --decision guarded \
  --timestamp none >"$work/out" 2>&1
check "guarded acceptance at 0.045 with U ~ 0.035 exits 1" test $? -eq 1
check "guarded acceptance: UNDECIDED, not out of tolerance" grep -q '^UNDECIDED: no point is outside the tolerance' "$work/out"
# U (~0.058) above the limit: no plain PASS under simple acceptance either (issue 14 item 5)
"$bin" fit "$ntc" --setpoint setpoint --tol-offset 0.045 --ref-uncertainty 0.05 --ref-k 2 --timestamp none >"$work/out" 2>&1
check "U above the limit: simple acceptance exits 1" test $? -eq 1
check "U above the limit: UNDECIDED" grep -q '^decision: UNDECIDED (simple acceptance)' "$work/out"
check "U above the limit: the points say U >= limit" grep -q 'conformity not shown (inside the tolerance, U >= limit): line' "$work/out"
check "--tur-warning on fit is validated" sh -c '"$1" fit "$2" --setpoint setpoint --tol-offset 1 --tur-warning 200 >/dev/null 2>&1; test $? -eq 2' _ "$bin" "$ntc"

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
check "verify FAIL names the points that do not conform" grep -q '^  does not conform: line [0-9]' "$work/out"
# without --full the list stops at 10 points and says how many more; with --full it does not stop
check "verify lists 10 points without --full" test "$(grep -c '^  does not conform: line' "$work/out")" -eq 10
check "verify says how many more and how to see them" grep -q '^  \.\.\. and [0-9]* more .*--full lists all' "$work/out"
"$bin" verify "$work/pass.json" "$ntc" --tol-offset 0.001 --full >"$work/out" 2>"$work/err"
nfail=$(grep -c '^  does not conform: line' "$work/out")
check "verify --full lists every point that does not conform (got $nfail)" test "$nfail" -gt 10
check "verify --full does not cut the list" test "$(grep -c 'more points that do not conform' "$work/out")" -eq 0
check "verify --full: FAIL line in decision-rule terms" grep -q '^FAIL: as found, at least one point does not conform' "$work/out"
"$bin" verify "$work/pass.json" "$ntc" --full >"$work/out" 2>"$work/err"
check "verify --full lists every point" test "$(grep -c '^ *[0-9][0-9]* S[0-9]' "$work/out")" -eq 60
check "verify --full table has limit and conformity columns" grep -q 'error, limit, U, limit/U, conformity' "$work/out"
check "verify --full rows end with the conformity" test "$(grep -c '^ *[0-9][0-9]* S[0-9].* conforms$' "$work/out")" -eq 60

# guarded acceptance with every error inside the tolerance but some in the guard band
# (issue 14): UNDECIDED, exit 1, and never "out of tolerance" for such a point
maxerr=$(python3 -c 'import json,sys; d=json.load(open(sys.argv[1])); print(max(abs(p["error"]) for p in d["as_found"]["points"]))' "$work/af.json")
tol=$(python3 -c "print(round(float('$maxerr') * 1.05 + 1e-6, 6))")
"$bin" verify "$work/pass.json" "$ntc" --tol-offset "$tol" --decision guarded --timestamp none \
  -o "$work/afg.json" >"$work/out" 2>"$work/err"
rc=$?
check "guard band only: exit 1 (got $rc)" test $rc -eq 1
check "guard band only: UNDECIDED" grep -q '^UNDECIDED: as found, no point is outside the tolerance' "$work/out"
check "guard band only: the points say conformity not shown" grep -q '^  conformity not shown (inside the tolerance, in the guard band): line' "$work/out"
check "guard band only: never 'out of tolerance'" test "$(grep -c 'out of tolerance' "$work/out")" -eq 0
check "guard band only: result says UNDECIDED" test "$(jq_verdict "$work/afg.json")" = UNDECIDED
check "guard band only: points carry their conformity" grep -q '"conformity": "not-shown-guard-band"' "$work/afg.json"

# the test uncertainty ratio threshold is validated
"$bin" verify "$work/pass.json" "$ntc" --tur-warning 0.5 >"$work/out" 2>"$work/err"
check "--tur-warning 0.5 exits 2" test $? -eq 2
check "--tur-warning names the option and the rule" grep -q -- '--tur-warning: tur_warning is 0.5; it must be' "$work/err"

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
