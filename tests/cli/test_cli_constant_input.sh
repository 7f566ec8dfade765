#!/usr/bin/env bash
# End-to-end tests of issue 13 item 6: a constant or near-constant reference or
# reading is bad input (exit 2, FILE:LINE: message. hint, nothing written) in
# `fit`, `verify` and `batch`; a percent-of-span tolerance on a zero span is a
# usage error, not "no tolerance". The rule is in docs/robustness.md.
# usage: test_cli_constant_input.sh RIDGECAL_BINARY
set -u
bin=$1
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
fails=0 passes=0
ok() { passes=$((passes + 1)); }
bad() { echo "FAIL: $*"; fails=$((fails + 1)); }

# expect CODE PATTERN SUBCOMMAND ARGS...: exit CODE, stdout+stderr match PATTERN
# (an extended regex; empty: not checked).
expect() {
  local code=$1 pattern=$2; shift 2
  rm -f "$work/rec.json" "$work/asfound.json"
  "$bin" "$@" >"$work/stdout" 2>"$work/stderr"
  local rc=$?
  if [[ $rc -ne $code ]]; then bad "$*: exit $rc, expected $code: $(head -c 600 "$work/stderr")"; return 1; fi
  if [[ -n $pattern ]] && ! grep -Eq -- "$pattern" "$work/stderr" "$work/stdout"; then
    bad "$*: output does not match '$pattern': $(head -c 600 "$work/stderr")"; return 1
  fi
  ok
}
# not_matching PATTERN: the last run's output does not match PATTERN.
not_matching() {
  if grep -Eq -- "$1" "$work/stderr" "$work/stdout"; then bad "output matches '$1'"; else ok; fi
}
no_file() { if [[ -e $1 ]]; then bad "$1 was written"; else ok; fi; }

# ---- fit: the issue's repro, references all 20.0 while readings span 100..700 ----
{ echo "setpoint,reading,reference"
  for i in 0 1 2 3 4 5 6; do for r in 0 1; do echo "S$i,$((100 + 100 * i)).$r,20.0"; done; done
} >"$work/frozen.csv"
expect 2 "^ridgecal fit: .*frozen\.csv:2: the references do not vary: all 14 lie within 20 \.\. 20 \(a spread up to 2e-08 counts as constant\) while the readings span 100 \.\. 700\.1\. check the reference column" \
  fit "$work/frozen.csv" --setpoint setpoint -o "$work/rec.json" --tol-offset 0.5
no_file "$work/rec.json"
not_matching "PASS"

# near-constant by the relative rule: the references agree to 12 significant digits
sed 's/,20\.0$/,20.0000000000/; 3s/,20\.0000000000$/,20.0000000001/' "$work/frozen.csv" >"$work/near.csv"
expect 2 "near\.csv:2: the references do not vary: all 14 lie within 20 \.\. 20\.0000000001" \
  fit "$work/near.csv" --setpoint setpoint -o "$work/rec.json"
no_file "$work/rec.json"

# near-constant by the reference standard's uncertainty: references 20.000..20.009
# against U_ref = 0.005 (k = 1), i.e. 0.01 expanded (k = 2); without it the same data fit.
{ echo "setpoint,reading,reference"
  for i in 0 1 2 3 4 5 6 7 8 9; do for r in 0 1; do echo "S$i,$((100 + 60 * i)).$r,20.00$i"; done; done
} >"$work/narrow.csv"
expect 2 "narrow\.csv:2: the references do not vary: all 20 lie within 20 \.\. 20\.009 \(a spread up to 0\.01 counts as constant\)" \
  fit "$work/narrow.csv" --setpoint setpoint --ref-uncertainty 0.005 -o "$work/rec.json"
no_file "$work/rec.json"
expect 0 "" fit "$work/narrow.csv" --setpoint setpoint --degree 1 --lambda 0 -o "$work/rec.json" --timestamp none
not_matching "do not vary"

# readings near-constant against the stated resolution (stuck sensor)
{ echo "setpoint,reading,reference"
  for i in 0 1 2 3 4 5; do for r in 0 1; do echo "S$i,500.$((i % 2)),$((10 * i))"; done; done
} >"$work/stuck.csv"
expect 2 "stuck\.csv:2: the readings do not vary: all 12 lie within 500 \.\. 500\.1 \(a spread up to 0\.5 counts as constant\) while the references span 0 \.\. 50\. check the reading column" \
  fit "$work/stuck.csv" --setpoint setpoint --resolution 0.5 -o "$work/rec.json"
no_file "$work/rec.json"

# ---- fit: a percent-of-span tolerance on a zero span ----
# The training setpoints A and C share reference 5 (B, at 9, is a user-named check point).
printf 'setpoint,reading,reference,role\nA,1,5,fit\nA,1.01,5,fit\nB,2,9,check\nB,2.01,9,check\nC,3,5,fit\nC,3.01,5,fit\n' >"$work/zerospan.csv"
expect 2 "zerospan\.csv: the tolerance is 1 % of the span, but the training references span 5 \.\. 5: a zero span\. declare the instrument's span" \
  fit "$work/zerospan.csv" --setpoint setpoint --role role --degree 1 --lambda 0 --tol-percent-span 1 -o "$work/rec.json"
no_file "$work/rec.json"
not_matching "no tolerance given"
# with the span declared, the same run is judged (FAIL: B is far off the line)
expect 1 "FAIL" fit "$work/zerospan.csv" --setpoint setpoint --role role --degree 1 --lambda 0 --tol-percent-span 1 --span 0..10 --timestamp none

# ---- verify: the record of a good calibration, then new data ----
{ echo "setpoint,reading,reference"
  for i in 0 1 2 3 4 5 6 7; do for r in 0 1; do echo "S$i,$((100 + 100 * i)).$r,$((10 * i)).0$r"; done; done
} >"$work/good.csv"
expect 0 "" fit "$work/good.csv" --setpoint setpoint --degree 1 --lambda 0 -o "$work/good.json" --timestamp none --tol-offset 0.5
# frozen reference in the as-found data
expect 2 "^ridgecal verify: .*frozen\.csv:2: the references do not vary: all 14 lie within 20 \.\. 20 \(a spread up to 7 counts as constant\)" \
  verify "$work/good.json" "$work/frozen.csv" -o "$work/asfound.json"
no_file "$work/asfound.json"
# stuck sensor in the as-found data
printf 'setpoint,reading,reference\nA,420,0\nB,420,20\nC,420.1,40\nD,420,60\n' >"$work/stuck-af.csv"
expect 2 "stuck-af\.csv:2: the readings do not vary: all 4 lie within 420 \.\. 420\.1 \(a spread up to 70 counts as constant\) while the references span 0 \.\. 60" \
  verify "$work/good.json" "$work/stuck-af.csv" -o "$work/asfound.json"
no_file "$work/asfound.json"
# a one-point check (one reference, readings scattered by noise) stays legitimate
printf 'setpoint,reading,reference\nP,300.0,20\nP,300.3,20\nP,299.8,20\n' >"$work/onepoint.csv"
expect 0 "PASS" verify "$work/good.json" "$work/onepoint.csv" --timestamp none
not_matching "do not vary"

# ---- batch: the unit fails with the message; the batch exits 1 ----
{ echo "unit,setpoint,reading,reference"
  tail -n +2 "$work/good.csv" | sed 's/^/U1,/'
  tail -n +2 "$work/frozen.csv" | sed 's/^/U2,/'
} >"$work/batch.csv"
expect 1 "1 failed" batch "$work/batch.csv" --unit unit --setpoint setpoint --out-dir "$work/out" --tol-offset 0.5 --timestamp none --progress none
if grep -q '^U2,.*the references do not vary: all 14 lie within 20 \.\. 20' "$work/out/summary.csv"; then ok; else bad "batch summary: $(cat "$work/out/summary.csv")"; fi
no_file "$work/out/records/U2.json"
# percent-of-span on a unit whose training span is zero: not verdict n/a with exit 0
{ echo "unit,setpoint,reading,reference,role"
  tail -n +2 "$work/good.csv" | sed 's/^/U1,/; s/$/,fit/'
  tail -n +2 "$work/zerospan.csv" | sed 's/^/U2,/'
} >"$work/batch2.csv"
expect 1 "1 failed" batch "$work/batch2.csv" --unit unit --setpoint setpoint --role role --degree 1 --lambda 0 --out-dir "$work/out2" --tol-percent-span 1 --timestamp none --progress none
if grep -q '^U2,.*a zero span' "$work/out2/summary.csv"; then ok; else bad "batch zero span summary: $(cat "$work/out2/summary.csv")"; fi

echo "$passes passed, $fails failed"
[[ $fails -eq 0 ]]
