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
grep -q "4 units: 3 ok, 1 failed" "$TMP/out.txt" || fail "stdout: $(cat "$TMP/out.txt")"
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
echo "ok"
