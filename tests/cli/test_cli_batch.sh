#!/usr/bin/env bash
# End-to-end checks of `ridgecal batch` and `ridgecal merge-summaries`:
# exit codes, partial failure, progress lines, shards merged into the whole.
# usage: test_cli_batch.sh RIDGECAL SAMPLES_DIR
set -u
RIDGECAL=$1
SAMPLES=$2
TMP=$(mktemp -d)
trap 'rm -rf "$TMP"' EXIT
fail() { echo "FAIL: $*"; exit 1; }

# A batch file: the NTC sample as units N1..N3, plus a unit with a bad cell.
src="$SAMPLES/ntc-coldstore/ntc-coldstore.csv"
{
  echo "unit,setpoint,reading,reference"
  for u in N1 N2 N3; do grep -v '^#' "$src" | tail -n +2 | sed "s/^/$u,/"; done
  echo "BAD,S01,12x,1.0"
} > "$TMP/batch.csv"

# Usage errors: exit 2, nothing written.
"$RIDGECAL" batch "$TMP/batch.csv" --unit unit 2>/dev/null; rc=$?
[ $rc -eq 2 ] || fail "missing --out-dir gave $rc"
"$RIDGECAL" batch "$TMP/batch.csv" --unit nosuch --setpoint setpoint -o "$TMP/x" 2>"$TMP/err"; rc=$?
[ $rc -eq 2 ] || fail "missing unit column gave $rc"
grep -q "no unit column 'nosuch'" "$TMP/err" || fail "missing column message: $(cat "$TMP/err")"
[ ! -e "$TMP/x/summary.csv" ] || fail "summary written after a fatal input error"

# Partial failure: exit 1, the good units are complete; progress lines on a non-terminal.
"$RIDGECAL" batch "$TMP/batch.csv" --unit unit --setpoint setpoint -o "$TMP/out" -j 2 --timestamp none \
  --progress-interval 0.001 >"$TMP/out.txt" 2>"$TMP/err"; rc=$?
[ $rc -eq 1 ] || fail "partial failure gave exit $rc"
grep -q "4 units: 0 passed, 0 out of tolerance, 0 undecided, 3 not judged, 1 not fitted" "$TMP/out.txt" || fail "stdout: $(cat "$TMP/out.txt")"
grep -q "^ridgecal batch: units 4 (1 failed)" "$TMP/err" || fail "no final progress line: $(cat "$TMP/err")"
grep -q $'\r' "$TMP/err" && fail "progress bar on a non-terminal"
grep -q '^BAD,failed,1,.*12x' "$TMP/out/summary.csv" || fail "BAD row: $(cat "$TMP/out/summary.csv")"
[ "$(grep -c ',ok,' "$TMP/out/summary.csv")" -eq 3 ] || fail "expected 3 ok rows"
for u in N1 N2 N3; do [ -s "$TMP/out/records/$u.json" ] || fail "no record for $u"; done
ls "$TMP/out" | grep -q tmp- && fail "temporary files left behind"

# The bar when asked for.
"$RIDGECAL" batch "$TMP/batch.csv" --unit unit --setpoint setpoint -o "$TMP/bar" --progress bar --no-records \
  2>"$TMP/err" >/dev/null
grep -q $'\r\\[' "$TMP/err" || fail "no progress bar with --progress bar"

# Only good units: exit 0.
grep -v '^BAD' "$TMP/batch.csv" > "$TMP/good.csv"
"$RIDGECAL" batch "$TMP/good.csv" --unit unit --setpoint setpoint -o "$TMP/good" --timestamp none \
  --progress none >/dev/null 2>&1; rc=$?
[ $rc -eq 0 ] || fail "all-good batch gave $rc"

# Shards: N1 alone, then N2+N3+BAD; merged equals the whole run's summary CSV.
head -n 1 "$TMP/batch.csv" > "$TMP/s1.csv"; grep '^N1,' "$TMP/batch.csv" >> "$TMP/s1.csv"
head -n 1 "$TMP/batch.csv" > "$TMP/s2.csv"; grep -E '^(N2|N3|BAD),' "$TMP/batch.csv" >> "$TMP/s2.csv"
"$RIDGECAL" batch "$TMP/s1.csv" --unit unit --setpoint setpoint -o "$TMP/sh1" --timestamp none --progress none >/dev/null 2>&1
"$RIDGECAL" batch "$TMP/s2.csv" --unit unit --setpoint setpoint -o "$TMP/sh2" --timestamp none --progress none >/dev/null 2>&1
"$RIDGECAL" merge-summaries "$TMP/sh2" "$TMP/sh1/summary.json" -o "$TMP/merged" >"$TMP/out.txt" 2>&1; rc=$?
[ $rc -eq 1 ] || fail "merge with a failed unit gave $rc: $(cat "$TMP/out.txt")"
# (the error column names the file the shard read, so compare the columns before it)
sort_body() { tail -n +2 "$1" | cut -d, -f1-9 | LC_ALL=C sort; }
[ "$(sort_body "$TMP/merged/summary.csv")" = "$(sort_body "$TMP/out/summary.csv")" ] || fail "merged summary differs from the whole run"
# The same shard twice: exit 2, nothing written.
"$RIDGECAL" merge-summaries "$TMP/sh1" "$TMP/sh1" -o "$TMP/dup" >/dev/null 2>"$TMP/err"; rc=$?
[ $rc -eq 2 ] || fail "duplicate shard gave $rc"
grep -q "also in" "$TMP/err" || fail "duplicate message: $(cat "$TMP/err")"
[ ! -e "$TMP/dup/summary.json" ] || fail "merge wrote output after an error"
# Per-unit reports and headers (--reports, --headers): the same files as
# `ridgecal report` / `ridgecal export` make from the unit's record.
# (A header is written for a PASS unit only: --tol-offset 0.5 passes N1..N3.)
"$RIDGECAL" batch "$TMP/batch.csv" --unit unit --setpoint setpoint -o "$TMP/rh" -j 2 --timestamp none \
  --progress none --reports --headers coldstore --header-numeric float --tol-offset 0.5 >"$TMP/out.txt" 2>"$TMP/err"; rc=$?
[ $rc -eq 1 ] || fail "reports/headers run gave $rc (BAD unit fails)"
grep -q "4 units: 3 passed, 0 out of tolerance, 0 undecided, 0 not judged, 1 not fitted, 0 with a report or header not written$" "$TMP/out.txt" || fail "stdout: $(cat "$TMP/out.txt")"
for u in N1 N2 N3; do
  grep -q '<html' "$TMP/rh/reports/$u.html" || fail "no report for $u"
  grep -q 'coldstore_eval' "$TMP/rh/headers/$u.h" || fail "no header for $u"
  "$RIDGECAL" report "$TMP/rh/records/$u.json" -o "$TMP/one.html" >/dev/null || fail "report $u"
  cmp -s "$TMP/one.html" "$TMP/rh/reports/$u.html" || fail "batch report of $u differs from 'ridgecal report'"
  "$RIDGECAL" export "$TMP/rh/records/$u.json" --prefix coldstore --numeric float -o "$TMP/one.h" >/dev/null || fail "export $u"
  cmp -s "$TMP/one.h" "$TMP/rh/headers/$u.h" || fail "batch header of $u differs from 'ridgecal export'"
done
[ ! -e "$TMP/rh/reports/BAD.html" ] && [ ! -e "$TMP/rh/headers/BAD.h" ] || fail "outputs for the failed unit"
# Units that do not pass get no header (issue 14): with a tolerance they all
# miss, the headers of the run above are removed, and the summary says why.
"$RIDGECAL" batch "$TMP/batch.csv" --unit unit --setpoint setpoint -o "$TMP/rh" -j 2 --timestamp none \
  --progress none --headers coldstore --tol-offset 0.00001 >"$TMP/out.txt" 2>"$TMP/err"; rc=$?
[ $rc -eq 1 ] || fail "headers of FAIL units: exit $rc"
grep -q ", 3 without a header (verdict not PASS" "$TMP/out.txt" || fail "withheld count: $(cat "$TMP/out.txt")"
for u in N1 N2 N3; do
  [ ! -e "$TMP/rh/headers/$u.h" ] || fail "a header was written (or left) for the FAIL unit $u"
  grep -q "^$u,ok,.*header withheld: verdict FAIL" "$TMP/rh/summary.csv" || fail "no withheld note for $u: $(cat "$TMP/rh/summary.csv")"
done
# A header the export proof refuses (fixed point rounded to whole degrees,
# against a 0.05 degC tolerance): a warning in the summary, exit 1, and the
# header of the earlier run is removed rather than left to pass for this one.
grep -v '^BAD,' "$TMP/batch.csv" > "$TMP/good.csv"
"$RIDGECAL" batch "$TMP/good.csv" --unit unit --setpoint setpoint -o "$TMP/rh" --timestamp none --progress none \
  --headers coldstore --header-numeric fixed --header-output-scale 1 --tol-offset 0.05 >"$TMP/out.txt" 2>"$TMP/err"; rc=$?
[ $rc -eq 1 ] || fail "refused headers gave exit $rc"
grep -q "3 with a report or header not written" "$TMP/out.txt" || fail "stdout: $(cat "$TMP/out.txt")"
[ ! -e "$TMP/rh/headers/N1.h" ] || fail "a stale header was left beside a refused export"
grep -q '^N1,ok,.*header not written: ' "$TMP/rh/summary.csv" || fail "no warning in the summary: $(cat "$TMP/rh/summary.csv")"
# Usage: reports need records; header options need --headers; a bad prefix is refused.
"$RIDGECAL" batch "$TMP/good.csv" --unit unit -o "$TMP/u1" --no-records --reports 2>"$TMP/err"; rc=$?
[ $rc -eq 2 ] && grep -q "drop --no-records" "$TMP/err" || fail "--reports with --no-records gave $rc: $(cat "$TMP/err")"
"$RIDGECAL" batch "$TMP/good.csv" --unit unit -o "$TMP/u1" --header-numeric double 2>/dev/null; rc=$?
[ $rc -eq 2 ] || fail "--header-numeric without --headers gave $rc"
"$RIDGECAL" batch "$TMP/good.csv" --unit unit -o "$TMP/u1" --headers 'int' 2>/dev/null; rc=$?
[ $rc -eq 2 ] || fail "C keyword as --headers prefix gave $rc"
[ ! -e "$TMP/u1" ] || fail "output written after a usage error"
echo "ok"
