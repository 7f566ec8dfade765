#!/usr/bin/env bash
# The batch summary a supervisor reads at a glance (issue 16 item 1): the
# totals by outcome, one reason code per unit with its worst setpoint, and
# the hardware-fault checks that refuse a stuck, open or saturated unit (and a
# unit with a missing cell) before any fit. Also: `fit` refuses a stuck sensor
# with file:line and exit 2, and --no-hardware-checks fits it anyway.
# usage: test_batch_reasons.sh RIDGECAL
set -u
RIDGECAL=$1
TMP=$(mktemp -d)
trap 'rm -rf "$TMP"' EXIT
fail() { echo "FAIL: $*"; exit 1; }

# unit LABEL KIND: 9 setpoints x 3 repeats of a gentle RH-like curve with a
# little deterministic scatter; KIND good | stuck | open | clipped | missing | scatter.
unit() {
  awk -v u="$1" -v kind="$2" 'BEGIN {
    for (k = 0; k < 9; ++k) for (r = 0; r < 3; ++r) {
      ref = 10 + 10 * k; x = 400 + 40 * ref + 0.02 * ref * ref + ((k * 3 + r) % 5 - 2) * 2.1;
      if (kind == "scatter") x = 400 + 40 * ref + 0.02 * ref * ref + ((k * 7 + r * 3) % 5 - 2) * 45;
      if (kind == "stuck" && k >= 3 && k <= 5) x = 2000;
      if (kind == "open" && k >= 6) x = 0;
      if (kind == "clipped" && k >= 7) x = 4095;
      cell = sprintf("%.1f", x);
      if (kind == "missing" && k == 4 && r == 1) cell = "";
      printf "%s,S%d,%s,%.2f\n", u, k, cell, ref + ((k + r) % 3 - 1) * 0.01
    }
  }'
}
{
  echo "unit,setpoint,reading,reference"
  unit G1 good; unit G2 good; unit ST stuck; unit OP open; unit CL clipped; unit MI missing
  unit GA scatter
} > "$TMP/line.csv"

"$RIDGECAL" batch "$TMP/line.csv" --unit unit --setpoint setpoint -o "$TMP/out" --timestamp none \
  --tol-offset 0.8 --tol-proportional 0.01 >"$TMP/out.txt" 2>"$TMP/err"; rc=$?
[ $rc -eq 1 ] || fail "a line with faulty units gave exit $rc: $(cat "$TMP/err")"
grep -q "^7 units: 2 passed, 1 out of tolerance, 0 undecided, 0 not judged, 4 not fitted" "$TMP/out.txt" ||
  fail "totals line: $(cat "$TMP/out.txt")"
grep -q "^reasons: " "$TMP/out.txt" || fail "no reasons line: $(cat "$TMP/out.txt")"
for code in "stuck 1" "open-or-short 1" "saturated 1" "missing-cells 1" "out-of-tolerance 1"; do
  grep "^reasons: " "$TMP/out.txt" | grep -q "$code" || fail "reasons line lacks '$code': $(cat "$TMP/out.txt")"
done
S="$TMP/out/summary.csv"
head -1 "$S" | grep -q ",verdict,reason,worst_setpoint,worst_ratio,worst_excess," || fail "header: $(head -1 "$S")"
row() { grep "^$1," "$S"; }
row G1 | grep -q ",PASS,none,S[0-9]," || fail "G1: $(row G1)"
row ST | grep -q ",failed,.*,stuck,," || fail "ST: $(row ST)"
row ST | grep -q "looks stuck" || fail "ST message: $(row ST)"
row OP | grep -q ",open-or-short,," || fail "OP: $(row OP)"
row CL | grep -q ",saturated,," || fail "CL: $(row CL)"
row MI | grep -q ",missing-cells,," || fail "MI: $(row MI)"
# The unit with wide scatter: FAIL, ratio above 1 and a positive excess.
row GA | grep -Eq ",FAIL,out-of-tolerance,S[08],[1-9][0-9.]*,[0-9][0-9.e-]*," || fail "GA: $(row GA)"
# Routine selection notes stay out of the warnings column.
grep -q "dropped" "$S" && fail "a routine note in the warnings column: $(grep dropped "$S")"
# summary.json: format version 2, totals by outcome and reasons.
J="$TMP/out/summary.json"
grep -q '"format_version": 2' "$J" || fail "format version"
grep -q '"totals": {"not_fitted":4,"not_judged":0,"out_of_tolerance":1,"passed":2,"reasons":{' "$J" ||
  fail "totals: $(grep totals "$J")"
grep -q '"reason":"stuck","worst_setpoint":"","worst_ratio":null' "$J" || fail "ST in json"
# merge-summaries reads its own output back and prints the same totals.
"$RIDGECAL" merge-summaries "$J" -o "$TMP/merged" >"$TMP/m.txt" 2>&1; rc=$?
[ $rc -eq 1 ] || fail "merge of a failing batch gave $rc: $(cat "$TMP/m.txt")"
grep -q "^1 shards, 7 units: 2 passed, 1 out of tolerance, 0 undecided, 0 not judged, 4 not fitted" "$TMP/m.txt" ||
  fail "merge totals: $(cat "$TMP/m.txt")"
cmp -s <(cut -d, -f1-13 "$S" | LC_ALL=C sort) <(cut -d, -f1-13 "$TMP/merged/summary.csv" | LC_ALL=C sort) || fail "merged rows differ (merge sorts units by label)"
# A version-1 summary (no reason members) is still read.
sed 's/"format_version": 2/"format_version": 1/; s/"reason":"[^"]*","worst_setpoint":"[^"]*","worst_ratio":[^,]*,"worst_excess":[^,]*,//' "$J" >"$TMP/v1.json"
"$RIDGECAL" merge-summaries "$TMP/v1.json" -o "$TMP/merged1" >"$TMP/m1.txt" 2>&1; rc=$?
[ $rc -eq 1 ] || fail "merge of a v1 summary gave $rc: $(cat "$TMP/m1.txt")"
grep -q "bad-input 4" "$TMP/m1.txt" || fail "v1 reasons: $(cat "$TMP/m1.txt")"

# fit: a stuck sensor is bad input (exit 2, file:line, nothing written).
{ echo "setpoint,reading,reference"; unit ST stuck | cut -d, -f2-; } >"$TMP/stuck.csv"
"$RIDGECAL" fit "$TMP/stuck.csv" --setpoint setpoint -o "$TMP/stuck.json" 2>"$TMP/err"; rc=$?
[ $rc -eq 2 ] || fail "fit of a stuck sensor gave $rc"
grep -Eq "stuck.csv:[0-9]+: every reading of the 3 setpoints from 'S3' to 'S5'.* is 2000: the sensor output looks stuck" "$TMP/err" ||
  fail "fit message: $(cat "$TMP/err")"
grep -q -- "--no-hardware-checks" "$TMP/err" || fail "no override named"
[ ! -e "$TMP/stuck.json" ] || fail "a record was written for a stuck sensor"
"$RIDGECAL" fit "$TMP/stuck.csv" --setpoint setpoint --no-hardware-checks -o "$TMP/stuck.json" >/dev/null 2>&1; rc=$?
[ $rc -eq 0 ] || fail "--no-hardware-checks gave $rc"
# A good unit whose rows are grouped by reference value (no setpoint column):
# repeats 0.01 apart are one nominal setpoint, not a plateau.
{ echo "reading,reference"; awk 'BEGIN{for(k=0;k<9;++k)for(r=0;r<3;++r)printf "%d,%.2f\n",400+400*k,10+10*k+r*0.01}'; } >"$TMP/q.csv"
"$RIDGECAL" fit "$TMP/q.csv" >/dev/null 2>"$TMP/err"; rc=$?
[ $rc -eq 0 ] || fail "quantised repeats refused: $(cat "$TMP/err")"
echo "batch reasons: all checks passed"
