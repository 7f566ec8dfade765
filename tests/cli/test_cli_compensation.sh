#!/usr/bin/env bash
# End-to-end tests of `ridgecal fit` with a second input and transforms:
# the pressure demo fits in two inputs; the NTC demo fits through the divider,
# ln and the reciprocal-kelvin transform with powers 0,1,3; bad options and
# readings outside a transform's domain exit 2 and write nothing.
# usage: test_cli_compensation.sh RIDGECAL_BINARY SAMPLES_DIR
set -u
bin=$1 samples=$2
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
fails=0 passes=0
ok() { passes=$((passes + 1)); }
bad() { echo "FAIL: $*"; fails=$((fails + 1)); }

pt=$samples/pressure-tempco/pressure-tempco.csv
ntc=$samples/ntc-coldstore/ntc-coldstore.csv

"$bin" fit "$pt" --setpoint setpoint --aux temperature --aux-setpoint chamber --aux-degree 0..3 \
  -o "$work/pt.json" --timestamp none >"$work/stdout" 2>"$work/stderr"
if [[ $? -eq 0 ]] && grep -q "^model: degree [0-9], aux degree [0-9]" "$work/stdout" &&
   grep -q '"kind": "surface"' "$work/pt.json" && grep -q '"aux_grouping": "aux setpoint column' "$work/pt.json"; then ok
else bad "pressure demo: $(cat "$work/stdout" "$work/stderr")"; fi

# Grouping by rounded aux value instead of the chamber column: same number of groups (54).
"$bin" fit "$pt" --setpoint setpoint --aux temperature --aux-step 5 -o "$work/pt2.json" --timestamp none >"$work/stdout" 2>&1
if [[ $? -eq 0 ]] && grep -q "^setpoints: [0-9]* training, [0-9]* test" "$work/stdout" &&
   [[ $(grep -c '"count": 3' "$work/pt2.json") -eq 54 ]]; then ok
else bad "pressure demo by --aux-step: $(cat "$work/stdout")"; fi

"$bin" fit "$ntc" --setpoint setpoint --divider-resistor 47000 --divider-full-scale 4095 --divider-position sensor-low \
  --reading-transform ln --reference-transform reciprocal-kelvin --powers 0,1,3 --degree 3 --lambda 0 \
  -o "$work/ntc.json" --timestamp none >"$work/stdout" 2>"$work/stderr"
if [[ $? -eq 0 ]] && grep -q "^model: powers 0,1,3" "$work/stdout" && grep -q '"reference": "reciprocal-kelvin"' "$work/ntc.json"; then ok
else bad "ntc demo with transforms: $(cat "$work/stdout" "$work/stderr")"; fi

# expect_bad PATTERN args...: exit 2, stderr matches, nothing written.
expect_bad() {
  local pattern=$1; shift
  rm -f "$work/out.json"
  "$bin" fit "$@" -o "$work/out.json" >"$work/stdout" 2>"$work/stderr"
  local rc=$?
  if [[ $rc -ne 2 ]]; then bad "$*: exit $rc, expected 2"; return; fi
  if ! grep -Eq -- "$pattern" "$work/stderr"; then bad "$*: stderr '$(cat "$work/stderr")' does not match '$pattern'"; return; fi
  if [[ -e "$work/out.json" ]]; then bad "$*: wrote an output file"; return; fi
  ok
}
expect_bad "ntc-coldstore.csv:4: the reading 3315 is outside the domain" "$ntc" --setpoint setpoint \
  --divider-resistor 47000 --divider-full-scale 3000
expect_bad "powers and an aux input need aux_degrees" "$pt" --aux temperature --powers 0,1,2
expect_bad "--aux-setpoint and --aux-step need --aux" "$pt" --aux-step 2
expect_bad "--divider-resistor and --divider-full-scale go together" "$ntc" --divider-resistor 47000
expect_bad "--reading-transform: reading transform must be" "$ntc" --reading-transform log10
expect_bad "the header has no aux column 'nope'" "$pt" --aux nope
printf 'reading,reference\n100,20\n200,-300\n300,40\n' >"$work/cold.csv"
expect_bad "cold.csv:3: the reference -300 is outside the domain of the reference transform" "$work/cold.csv" \
  --reference-transform reciprocal-kelvin

# A tolerance is judged on the extended model (simple acceptance by default).
"$bin" fit "$pt" --setpoint setpoint --aux temperature --aux-setpoint chamber --aux-degree 0..3 --tol-offset 0.01 \
  -o "$work/pt-tol.json" --timestamp none >"$work/stdout" 2>"$work/stderr"
if [[ $? -eq 0 ]] && grep -q "^PASS" "$work/stdout" && grep -q '"decision"' "$work/pt-tol.json"; then ok
else bad "pressure demo with a tolerance: $(cat "$work/stdout" "$work/stderr")"; fi
"$bin" fit "$pt" --setpoint setpoint --aux temperature --aux-setpoint chamber --tol-offset 0.0005 \
  -o "$work/pt-fail.json" --timestamp none >"$work/stdout" 2>"$work/stderr"
if [[ $? -eq 1 ]] && grep -q "^FAIL" "$work/stdout"; then ok; else bad "tight tolerance did not fail: $(cat "$work/stdout")"; fi
# Guarded acceptance with the uncertainty budget of the surface: the record carries
# the budget (4 components, U = 2 u_c) and each judged point's guard is U there (> 0).
"$bin" fit "$pt" --setpoint setpoint --aux temperature --aux-setpoint chamber --aux-degree 0..3 --tol-offset 0.01 \
  --decision guarded --ref-uncertainty 0.001 --ref-k 2 --resolution 1 -o "$work/pt-guard.json" --timestamp none \
  >"$work/stdout" 2>"$work/stderr"
if [[ $? -eq 0 ]] && grep -q "^PASS" "$work/stdout" && grep -q "^uncertainty: U = " "$work/stdout" &&
   python3 - "$work/pt-guard.json" <<'PY'
import json, math, sys
j = json.load(open(sys.argv[1]))
u = j["uncertainty"]
names = [c["name"] for c in u["components"]]
assert names == ["fit-residual", "fit-coefficients", "reference-standard", "reading-resolution",
                 "model-inadequacy"], names
uc = math.sqrt(sum(c["standard"] ** 2 for c in u["components"]))
assert abs(u["combined"] - uc) <= 1e-12 * uc and abs(u["expanded"] - 2 * uc) <= 1e-12 * uc
assert abs(u["components"][2]["standard"] - 0.0005) < 1e-15
assert j["decision"]["rule"] == "guarded"
guards = [p["guard"] for p in j["decision"]["points"]]
assert all(0 < g <= u["expanded"] * (1 + 1e-12) for g in guards), (min(guards), max(guards))
PY
then ok; else bad "pressure demo, guarded: $(cat "$work/stdout" "$work/stderr")"; fi

# verify: the record's aux column is read from the new data and the surface is applied.
"$bin" verify "$work/pt-tol.json" "$pt" -o "$work/asfound.json" --timestamp none >"$work/stdout" 2>"$work/stderr"
if [[ $? -eq 0 ]] && grep -q "^PASS" "$work/stdout" &&
   python3 -c "import json,sys; j=json.load(open(sys.argv[1])); m=j['as_found']['metrics']; sys.exit(0 if m['rmse'] < 0.002 else 1)" "$work/asfound.json"
then ok; else bad "verify of the pressure record: $(cat "$work/stdout" "$work/stderr")"; fi
# verify on data shifted by +0.05 bar fails the 0.01 bar tolerance.
awk -F, 'BEGIN{OFS=","} /^#/ || /^setpoint/ {print; next} {$5 = sprintf("%.4f", $5 + 0.05); print}' "$pt" >"$work/shifted.csv"
"$bin" verify "$work/pt-tol.json" "$work/shifted.csv" --timestamp none >"$work/stdout" 2>"$work/stderr"
if [[ $? -eq 1 ]] && grep -q "^FAIL" "$work/stdout"; then ok; else bad "verify of shifted data did not fail: $(cat "$work/stdout")"; fi

# export writes the header of an extended model (2-D nested Horner, float);
# the thermistor record (ln, reciprocal-kelvin) exports in double but not in
# fixed point (exit 2, nothing written).
rm -f "$work/pt.h" "$work/ntc.h" "$work/ntc-fixed.h"
"$bin" export "$work/pt.json" --prefix pt --numeric float --allow-unpassed -o "$work/pt.h" >"$work/stdout" 2>"$work/stderr"
if [[ $? -eq 0 ]] && grep -q "float pt_eval(float x, float aux)" "$work/pt.h" && ! grep -q "<math.h>" "$work/pt.h"; then ok
else bad "export of the pressure record: $(cat "$work/stdout" "$work/stderr")"; fi
"$bin" export "$work/ntc.json" --prefix ntc --numeric double --allow-unpassed -o "$work/ntc.h" >"$work/stdout" 2>"$work/stderr"
if [[ $? -eq 0 ]] && grep -q "#include <math.h>" "$work/ntc.h" && grep -q "NTC_LOG(u)" "$work/ntc.h"; then ok
else bad "export of the thermistor record: $(cat "$work/stdout" "$work/stderr")"; fi
"$bin" export "$work/ntc.json" --prefix ntc --numeric fixed --allow-unpassed -o "$work/ntc-fixed.h" >"$work/stdout" 2>"$work/stderr"
if [[ $? -eq 2 ]] && grep -q "use --numeric float or --numeric double" "$work/stderr" && [[ ! -e "$work/ntc-fixed.h" ]]; then ok
else bad "fixed export of the thermistor record: exit/stderr $(cat "$work/stderr")"; fi

# The report renders an extended record (residuals against the reading; the
# 2-D views are not there yet) instead of failing.
"$bin" fit "$pt" --setpoint setpoint --aux temperature --aux-setpoint chamber --timestamp none \
  --report "$work/pt.html" >"$work/stdout" 2>"$work/stderr"
if [[ $? -eq 0 && -s "$work/pt.html" ]] && grep -q "<svg" "$work/pt.html"; then ok
else bad "report of a surface fit: $(cat "$work/stderr")"; fi

# Batch with a second input: the pressure demo as two units of one batch file.
# Each unit's model must be the one `ridgecal fit` chooses on the same rows.
{
  grep -v '^#' "$pt" | head -n 1 | sed 's/^/unit,/'
  for u in PT-7A PT-7B; do grep -v '^#' "$pt" | tail -n +2 | sed "s/^/$u,/"; done
} >"$work/pt-batch.csv"
"$bin" batch "$work/pt-batch.csv" --unit unit --setpoint setpoint --aux temperature --aux-setpoint chamber \
  --aux-degree 0..3 -o "$work/ptb" --timestamp none --progress none -j 2 >"$work/stdout" 2>&1
rc=$?
coef() { /usr/bin/python3 -c 'import json,sys; r=json.load(open(sys.argv[1])); print(json.dumps(r["compensation"]["monomial_coefficients"]), r["model"]["lambda"])' "$1"; }
if [[ $rc -eq 0 ]] && grep -q "2 units: .* 0 not fitted" "$work/stdout" &&
   [[ "$(coef "$work/ptb/records/PT-7A.json")" == "$(coef "$work/pt.json")" ]] &&
   [[ "$(coef "$work/ptb/records/PT-7B.json")" == "$(coef "$work/pt.json")" ]] &&
   grep -q '"compensation"' "$work/ptb/summary.json"; then ok
else bad "batch with --aux: rc=$rc $(cat "$work/stdout") $(coef "$work/ptb/records/PT-7A.json" 2>&1 | head -c 300)"; fi
# A batch whose aux column is missing: exit 2, no summary.
"$bin" batch "$work/pt-batch.csv" --unit unit --setpoint setpoint --aux nosuch -o "$work/ptc" --progress none >/dev/null 2>"$work/stderr"
rc=$?
if [[ $rc -eq 1 || $rc -eq 2 ]] && ! grep -q ',ok,' "$work/ptc/summary.csv" 2>/dev/null; then ok
else bad "batch with a missing aux column gave $rc: $(cat "$work/stderr")"; fi

echo "cli_compensation: $passes passed, $fails failed"
[[ $fails -eq 0 ]]
