#!/usr/bin/env bash
# The golden cases: runs every command below with the given ridgecal binary
# and writes its outputs (records, C headers, reports, batch outputs) and a
# transcript (command, exit code, stdout, stderr of each) into OUTDIR.
#
# usage: golden_cases.sh RIDGECAL OUTDIR
#
# Runs from the repository root, so the input paths stored in the records are
# the relative ones written below; OUTDIR (absolute or relative) is replaced by
# "OUT" in the transcript. Every output is deterministic: the creation time is
# fixed with --timestamp (and SOURCE_DATE_EPOCH for anything that reads it).
# Used by check_golden.sh (the CTest test) and by regenerate.sh.
set -u
RIDGECAL=$(cd "$(dirname "$1")" && pwd)/$(basename "$1")
mkdir -p "$2"
OUT=$(cd "$2" && pwd)
cd "$(dirname "$0")/../.." || exit 2
export SOURCE_DATE_EPOCH=1767225600 # 2026-01-01T00:00:00Z
export LC_ALL=C
TS=(--timestamp 2026-01-01T00:00:00Z)
TRANSCRIPT="$OUT/transcript.txt"
: >"$TRANSCRIPT"
SAMPLES=calibration-samples
NIST=tests/data/nist-strd

# run ARGS...: one ridgecal command, logged in the transcript.
run() {
  local rc
  "$RIDGECAL" "$@" >"$OUT/.stdout" 2>"$OUT/.stderr"
  rc=$?
  {
    echo "\$ ridgecal $(printf '%q ' "$@")"
    echo "exit $rc"
    echo "--- stdout"
    cat "$OUT/.stdout"
    echo "--- stderr"
    cat "$OUT/.stderr"
    echo
  } | sed -e "s|$OUT|OUT|g" -e 's|[0-9.]* units/s, [0-9.]* s$|(rate and time removed)|' >>"$TRANSCRIPT"
  rm -f "$OUT/.stdout" "$OUT/.stderr"
}

# headers NAME PREFIX MODES...: export the record NAME.record.json in each mode.
# --allow-unpassed: most records here have no tolerance (not judged) or FAIL;
# the golden files pin the header text, PREFIX_VERDICT included.
headers() {
  local name=$1 prefix=$2
  shift 2
  for mode in "$@"; do
    run export "$OUT/$name.record.json" --prefix "$prefix" --numeric "$mode" --allow-unpassed \
      -o "$OUT/$name.$mode.h"
  done
}

# fixed NAME PREFIX ARGS...: the fixed-point header with export options ARGS
# (a finer --output-scale where the default milli-units round too coarsely).
fixed() {
  local name=$1 prefix=$2
  shift 2
  run export "$OUT/$name.record.json" --prefix "$prefix" --numeric fixed --allow-unpassed "$@" \
    -o "$OUT/$name.fixed.h"
}

# --- 1-D samples (command lines of each sample's README) ---
run fit $SAMPLES/ntc-coldstore/ntc-coldstore.csv --setpoint setpoint --sensor "cold-store NTC ch2" \
  --reading-unit counts --reference-unit degC "${TS[@]}" -o "$OUT/ntc.record.json" --report "$OUT/ntc.report.html"
headers ntc ntc float double fixed

run fit $SAMPLES/loadcell-hopper/loadcell-hopper.csv --setpoint setpoint --sensor "hopper scale LC-3" \
  --reading-unit counts --reference-unit kg "${TS[@]}" -o "$OUT/loadcell.record.json"
headers loadcell lc float double
fixed loadcell lc --output-scale 1000000

# The load cell judged: tolerance (FAIL, issue 12's repro), guarded budget,
# direction column (hysteresis check).
run fit $SAMPLES/loadcell-hopper/loadcell-hopper.csv --setpoint setpoint --direction direction \
  --sensor "hopper scale LC-3" --reading-unit counts --reference-unit kg --tol-offset 0.002 \
  --ref-uncertainty 0.0005 --resolution 1 "${TS[@]}" -o "$OUT/loadcell-tol.record.json"
headers loadcell-tol lc float double
fixed loadcell-tol lc --output-scale 1000000
run report "$OUT/loadcell-tol.record.json" -o "$OUT/loadcell-tol.report.html"
# Issue 12's repro: a FAIL record exported with --tolerance (the header's QA
# block must carry the record's verdict, FAIL).
# Without --allow-unpassed the FAIL record is refused (exit 1, nothing written:
# the .stdout/.stderr golden pins the message); with it, LC_VERDICT says FAIL.
run export "$OUT/loadcell-tol.record.json" --prefix lc --numeric float --tolerance 0.002 \
  -o "$OUT/loadcell-tol.refused.float.h"
run export "$OUT/loadcell-tol.record.json" --prefix lc --numeric float --tolerance 0.002 \
  --allow-unpassed -o "$OUT/loadcell-tol.tolerance.float.h"

# --- two inputs and transforms ---
run fit $SAMPLES/pressure-tempco/pressure-tempco.csv --setpoint setpoint --aux temperature --aux-setpoint chamber \
  --aux-degree 0..3 --sensor "test rig PT-7" --reading-unit counts --reference-unit bar "${TS[@]}" \
  -o "$OUT/pressure.record.json"
headers pressure pt7 float double
fixed pressure pt7 --aux-scale 100 --output-scale 100000

# The same with a tolerance and a direction-free guarded decision.
run fit $SAMPLES/pressure-tempco/pressure-tempco.csv --setpoint setpoint --aux temperature --aux-setpoint chamber \
  --aux-degree 0..3 --sensor "test rig PT-7" --reading-unit counts --reference-unit bar \
  --tol-offset 0.01 --decision guarded --ref-uncertainty 0.0005 --resolution 1 "${TS[@]}" \
  -o "$OUT/pressure-tol.record.json"
headers pressure-tol pt7 float

# Steinhart-Hart style thermistor: divider, ln, reciprocal kelvin, powers 0,1,3
# (docs/compensation-and-transforms.md). Fixed is refused (exit 2): in the transcript.
run fit $SAMPLES/ntc-coldstore/ntc-coldstore.csv --setpoint setpoint --divider-resistor 47000 \
  --divider-full-scale 4095 --divider-position sensor-low --reading-transform ln \
  --reference-transform reciprocal-kelvin --powers 0,1,3 --degree 3 --lambda 0 --sensor "cold-store NTC ch2" \
  --reading-unit counts --reference-unit degC "${TS[@]}" -o "$OUT/ntc-sh.record.json"
headers ntc-sh ntc float double fixed

# --- NIST StRD sets that are a 1-D calibration: fixed degree, lambda 0, no
# test hold-out (docs/fitting.md, "External checks"); Longley has six inputs.
nist() {
  local name=$1 degree=$2
  shift 2
  run fit $NIST/$name.csv --reading x --reference y --degree "$degree" --lambda 0 --test-fraction 0 "$@" \
    "${TS[@]}" -o "$OUT/nist-$name.record.json"
}
nist norris 1
headers nist-norris norris float double fixed
nist pontius 2
headers nist-pontius pontius float double
fixed nist-pontius pontius --output-scale 1000000
nist noint1 1 --through-origin
headers nist-noint1 noint1 float double fixed
# NoInt2 has three points and no validation set: export needs a tolerance.
nist noint2 1 --through-origin
for mode in float double fixed; do
  run export "$OUT/nist-noint2.record.json" --prefix noint2 --numeric $mode --tolerance 0.5 --allow-unpassed \
    -o "$OUT/nist-noint2.$mode.h"
done
nist filip 10
headers nist-filip filip float double
fixed nist-filip filip --output-scale 1000000

# --- batch: two load-cell units with a tolerance, one pressure unit with aux ---
run batch tests/golden/inputs/loadcell-batch.csv --unit unit --setpoint setpoint --tol-offset 0.002 \
  -o "$OUT/batch-loadcell" -j 1 --progress none --no-sync "${TS[@]}" --headers lc --header-numeric float
run batch tests/golden/inputs/pressure-batch.csv --unit unit --setpoint setpoint --aux temperature \
  --aux-setpoint chamber --aux-degree 0..3 -o "$OUT/batch-pressure" -j 1 --progress none --no-sync "${TS[@]}"
# git keeps no empty directory (batch-loadcell/headers: both units FAIL, so
# their headers are withheld): drop them, so that a fresh clone compares equal.
find "$OUT" -mindepth 1 -type d -empty -delete
exit 0
