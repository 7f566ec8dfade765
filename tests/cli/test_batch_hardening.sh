#!/usr/bin/env bash
# `ridgecal batch` and `ridgecal merge-summaries` as hardened as `fit`
# (issue 15): outputs that are inputs, collision-proof file names, the lock on
# the output directory, input limits, labels, formula injection in
# summary.csv, a quoted newline in a unit label, negative unsigned options and
# a clean stop on SIGINT / SIGTERM.
# usage: test_batch_hardening.sh RIDGECAL
set -u
RIDGECAL=$1
TMP=$(mktemp -d)
trap 'rm -rf "$TMP"' EXIT
fails=0
fail() { echo "FAIL: $*"; fails=$((fails + 1)); }

# unit_rows LABEL [SETPOINT_PREFIX]: 8 setpoints x 3 readings of a gentle curve.
unit_rows() {
  local label=$1 sp=${2:-S}
  awk -v u="$label" -v sp="$sp" 'BEGIN { for (s = 0; s < 8; s++) for (r = 0; r < 3; r++) {
    x = 100 + 50 * s + r * 0.01; printf "%s,%s%02d,%.4f,%.6f\n", u, sp, s, x, 0.5 * x + 1e-4 * x * x + 0.001 * r } }'
}
# many_units PREFIX N: units PREFIX1..PREFIXN as unit_rows writes them (one awk).
many_units() {
  awk -v p="$1" -v n="$2" 'BEGIN { for (u = 1; u <= n; u++) for (s = 0; s < 8; s++) for (r = 0; r < 3; r++) {
    x = 100 + 50 * s + r * 0.01; printf "%s%d,S%02d,%.4f,%.6f\n", p, u, s, x, 0.5 * x + 1e-4 * x * x + 0.001 * r } }'
}
HDR="unit,setpoint,reading,reference"
B=(--unit unit --setpoint setpoint --timestamp none --progress none -j 1)

# --- item 1: an output that is an input is refused before anything is written ---
mkdir -p "$TMP/d1"
{ echo "$HDR"; unit_rows A1; } >"$TMP/d1/summary.csv"
{ echo "$HDR"; unit_rows A2; } >"$TMP/d1/more.csv"
cp "$TMP/d1/summary.csv" "$TMP/d1-summary.orig"
"$RIDGECAL" batch "$TMP/d1" "${B[@]}" -o "$TMP/d1" >/dev/null 2>"$TMP/err"; rc=$?
[ $rc -eq 2 ] || fail "batch DIR -o DIR with an input summary.csv gave exit $rc"
grep -q "summary.csv: .*input" "$TMP/err" || fail "batch DIR -o DIR message: $(cat "$TMP/err")"
cmp -s "$TMP/d1/summary.csv" "$TMP/d1-summary.orig" || fail "batch overwrote its input summary.csv"
[ ! -e "$TMP/d1/records" ] || fail "batch DIR -o DIR created records/ before refusing"
[ ! -e "$TMP/d1/summary.json" ] || fail "batch DIR -o DIR wrote summary.json"
# merge-summaries m1 m2 -o m1
{ echo "$HDR"; unit_rows M1; } >"$TMP/m1.csv"
{ echo "$HDR"; unit_rows M2; } >"$TMP/m2.csv"
"$RIDGECAL" batch "$TMP/m1.csv" "${B[@]}" -o "$TMP/m1" >/dev/null 2>&1
"$RIDGECAL" batch "$TMP/m2.csv" "${B[@]}" -o "$TMP/m2" >/dev/null 2>&1
cp "$TMP/m1/summary.json" "$TMP/m1-summary.orig"
"$RIDGECAL" merge-summaries "$TMP/m1" "$TMP/m2" -o "$TMP/m1" >/dev/null 2>"$TMP/err"; rc=$?
[ $rc -eq 2 ] || fail "merge-summaries m1 m2 -o m1 gave exit $rc"
grep -q "summary.json: .*input" "$TMP/err" || fail "merge -o m1 message: $(cat "$TMP/err")"
cmp -s "$TMP/m1/summary.json" "$TMP/m1-summary.orig" || fail "merge-summaries overwrote shard m1"
"$RIDGECAL" merge-summaries "$TMP/m1" "$TMP/m2" -o "$TMP/merged" >/dev/null 2>&1 || fail "a plain merge failed"

# --- item 3: collision-proof file names ---
# A unit whose label is literally the hashed file name of another unit.
{ echo "$HDR"; unit_rows "SN 001"; } >"$TMP/sn.csv"
"$RIDGECAL" batch "$TMP/sn.csv" "${B[@]}" -o "$TMP/sn" >/dev/null 2>&1
hashed=$(cd "$TMP/sn/records" && ls | sed 's/\.json$//')
[[ $hashed == SN_001-* ]] || fail "the file name of 'SN 001' is '$hashed'"
{
  echo "$HDR"
  unit_rows "SN 001"
  unit_rows "$hashed"
  unit_rows ab1; unit_rows AB1
  for r in CON nul.txt Com1 LPT1.x AUX prn.csv COM9 lpt9.a.b; do unit_rows "$r"; done
} >"$TMP/names.csv"
"$RIDGECAL" batch "$TMP/names.csv" "${B[@]}" -o "$TMP/names" >"$TMP/out" 2>"$TMP/err"; rc=$?
[ $rc -eq 0 ] || fail "names batch gave exit $rc: $(cat "$TMP/err")"
n_ok=$(grep -c ',ok,' "$TMP/names/summary.csv")
n_files=$(ls "$TMP/names/records" | wc -l)
n_ci=$(ls "$TMP/names/records" | tr 'A-Z' 'a-z' | sort -u | wc -l)
[ "$n_ok" -eq 12 ] && [ "$n_files" -eq 12 ] && [ "$n_ci" -eq 12 ] ||
  fail "12 units gave $n_ok ok rows, $n_files record files, $n_ci distinct ignoring case"
n_rec=$(awk -F, 'NR > 1 { print $NF }' "$TMP/names/summary.csv" | tr 'A-Z' 'a-z' | sort -u | wc -l)
[ "$n_rec" -eq 12 ] || fail "summary rows share record files: $(head -c 800 "$TMP/names/summary.csv")"
if ls "$TMP/names/records" | grep -Eiq '^(con|prn|aux|nul|com[0-9]|lpt[0-9])(\.|$)'; then
  fail "a record has a name reserved on other file systems: $(ls "$TMP/names/records")"
fi
# A failing unit never deletes another unit's record.
{ echo "$HDR"; unit_rows "SN 001"; echo "$hashed,S00,12x,1"; } >"$TMP/del.csv"
"$RIDGECAL" batch "$TMP/del.csv" "${B[@]}" -o "$TMP/del" >/dev/null 2>&1
rec=$(grep '^SN 001,ok,' "$TMP/del/summary.csv" | awk -F, '{ print $NF }')
[ -n "$rec" ] && [ -s "$TMP/del/$rec" ] || fail "the record of 'SN 001' is gone after '$hashed' failed"

# --- item 4: a second batch into the same directory refuses ---
{ echo "$HDR"; many_units L 400; } >"$TMP/long.csv"
"$RIDGECAL" batch "$TMP/long.csv" "${B[@]}" -o "$TMP/locked" >/dev/null 2>"$TMP/err1" &
pid=$!
for _ in $(seq 1 200); do [ -e "$TMP/locked/records" ] && break; sleep 0.02; done
"$RIDGECAL" batch "$TMP/m1.csv" "${B[@]}" -o "$TMP/locked" >/dev/null 2>"$TMP/err2"; rc2=$?
wait $pid; rc1=$?
[ $rc1 -eq 0 ] || fail "the first of two batches gave exit $rc1: $(cat "$TMP/err1")"
[ $rc2 -eq 2 ] || fail "a second batch into a locked directory gave exit $rc2"
grep -q "another ridgecal batch" "$TMP/err2" || fail "lock message: $(cat "$TMP/err2")"
[ "$(grep -c ',ok,' "$TMP/locked/summary.csv")" -eq 400 ] || fail "the locked run's summary is not its own"
grep -q '^M1,' "$TMP/locked/summary.csv" && fail "the refused batch wrote into the summary"
ls -a "$TMP/locked" | grep -q lock && fail "the lock file is left behind: $(ls -a "$TMP/locked")"

# --- item 6: fit's input limits ---
t0=$(date +%s%N)
# The memory cap shows the reader does not grow; a sanitizer build reserves
# terabytes of shadow address space, so there the cap is left to the normal build.
cap=1500000
if ldd "$RIDGECAL" 2>/dev/null | grep -q 'libasan'; then cap=unlimited; fi
(ulimit -v "$cap"; "$RIDGECAL" batch /dev/zero "${B[@]}" -o "$TMP/zero" >/dev/null 2>"$TMP/err"); rc=$?
ms=$((($(date +%s%N) - t0) / 1000000))
[ $rc -eq 2 ] || fail "batch /dev/zero gave exit $rc: $(head -c 300 "$TMP/err")"
[ $ms -lt 5000 ] || fail "batch /dev/zero took $ms ms"
grep -q "/dev/zero:1: .*longer than" "$TMP/err" || fail "/dev/zero message: $(head -c 300 "$TMP/err")"
# 100,000 columns: refused (more than --max-fields) in well under a second.
awk 'BEGIN { printf "unit,setpoint,reading,reference"; for (i = 0; i < 100000; i++) printf ",c%d", i; print "" }' >"$TMP/wide.csv"
unit_rows W1 | awk '{ printf "%s", $0; for (i = 0; i < 100000; i++) printf ",0"; print "" }' >>"$TMP/wide.csv"
t0=$(date +%s%N)
"$RIDGECAL" batch "$TMP/wide.csv" "${B[@]}" -o "$TMP/wide" >/dev/null 2>"$TMP/err"; rc=$?
ms=$((($(date +%s%N) - t0) / 1000000))
[ $rc -eq 2 ] || fail "a 100,000-column header gave exit $rc"
grep -q "wide.csv:1: .*more than 1024 fields" "$TMP/err" || fail "wide header message: $(head -c 300 "$TMP/err")"
[ $ms -lt 2000 ] || fail "a 100,000-column header took $ms ms"
echo "batch_hardening: 100,000-column header refused in $ms ms"
# The same header with --max-fields raised is parsed in linear time.
t0=$(date +%s%N)
"$RIDGECAL" batch "$TMP/wide.csv" "${B[@]}" --max-fields 200000 -o "$TMP/wide2" >/dev/null 2>"$TMP/err"; rc=$?
ms=$((($(date +%s%N) - t0) / 1000000))
[ $rc -le 1 ] || fail "a 100,000-column header with --max-fields 200000 gave exit $rc: $(head -c 300 "$TMP/err")"
[ $ms -lt 3000 ] || fail "a 100,000-column header with --max-fields 200000 took $ms ms"
echo "batch_hardening: 100,000-column header parsed in $ms ms"
# Rows per unit, field bytes and the line length.
{ echo "$HDR"; unit_rows R1; unit_rows R2; unit_rows R2 T; } >"$TMP/rows.csv"
"$RIDGECAL" batch "$TMP/rows.csv" "${B[@]}" --max-rows 30 -o "$TMP/rows" >/dev/null 2>"$TMP/err"; rc=$?
[ $rc -eq 1 ] || fail "a unit over --max-rows gave exit $rc: $(cat "$TMP/err")"
grep -q '^R1,ok,' "$TMP/rows/summary.csv" || fail "R1 should fit under --max-rows 30"
grep -q '^R2,failed,.*rows.csv:[0-9]*: .*more than 30 data rows' "$TMP/rows/summary.csv" ||
  fail "R2 over --max-rows: $(head -c 800 "$TMP/rows/summary.csv")"
{ echo "$HDR"; unit_rows F1; printf 'F2,S00,%s,1\n' "$(head -c 300 /dev/zero | tr '\0' 1)"; unit_rows F3; } >"$TMP/field.csv"
"$RIDGECAL" batch "$TMP/field.csv" "${B[@]}" --max-field-bytes 100 -o "$TMP/field" >/dev/null 2>&1
grep -q '^F2,failed,.*field.csv:26: .*longer than 100 bytes' "$TMP/field/summary.csv" ||
  fail "a field over --max-field-bytes: $(head -c 800 "$TMP/field/summary.csv")"
grep -q '^F3,ok,' "$TMP/field/summary.csv" || fail "the unit after a long line is lost"
# A data line over max-fields x (max-field-bytes + 3) bytes (here 4 x 33): its
# unit fails at that line, the rest of the line is read past, not kept.
{ echo "$HDR"; unit_rows H1; printf 'H2,S00,1,%s\n' "$(head -c 5000000 /dev/zero | tr '\0' 1)"; unit_rows H3; } >"$TMP/line.csv"
"$RIDGECAL" batch "$TMP/line.csv" "${B[@]}" --max-fields 4 --max-field-bytes 30 -o "$TMP/line" >/dev/null 2>&1
grep -q '^H2,failed,.*line.csv:26: the line is longer than 132 bytes' "$TMP/line/summary.csv" ||
  fail "a line over the limit: $(head -c 800 "$TMP/line/summary.csv")"
grep -q '^H3,ok,' "$TMP/line/summary.csv" || fail "the unit after an over-long line is lost"
"$RIDGECAL" batch "$TMP/field.csv" "${B[@]}" --max-bytes -1 -o "$TMP/x" >/dev/null 2>"$TMP/err"; rc=$?
# --- item 8: negative values of unsigned options ---
[ $rc -eq 2 ] || fail "--max-bytes -1 gave exit $rc"
grep -q -- "--max-bytes.*negative" "$TMP/err" || fail "--max-bytes -1 message: $(cat "$TMP/err")"
"$RIDGECAL" batch "$TMP/field.csv" "${B[@]}" --seed -1 -o "$TMP/x" >/dev/null 2>"$TMP/err"; rc=$?
[ $rc -eq 2 ] || fail "--seed -1 gave exit $rc"
grep -q -- "--seed.*negative" "$TMP/err" || fail "--seed -1 message: $(cat "$TMP/err")"
[ ! -e "$TMP/x" ] || fail "a refused option wrote an output"

# --- item 9: labels fit refuses ---
{
  echo "$HDR"
  unit_rows G1
  unit_rows $'E\x1b[31m1'
  unit_rows G2 $'B\x07'
  unit_rows $'U\xe9'
  unit_rows $'U\xe8'
} >"$TMP/labels.csv"
"$RIDGECAL" batch "$TMP/labels.csv" "${B[@]}" -o "$TMP/labels" >/dev/null 2>&1; rc=$?
[ $rc -eq 1 ] || fail "bad labels gave exit $rc"
s="$TMP/labels/summary.csv"
grep -q '^G1,ok,' "$s" || fail "G1 should be ok: $(head -c 800 "$s")"
grep -q 'labels.csv:26: the unit label .*control character' "$s" || fail "ESC unit label: $(head -c 800 "$s")"
grep -q '^G2,failed,.*labels.csv:50: the setpoint label .*control character' "$s" || fail "BEL setpoint: $(head -c 800 "$s")"
grep -q 'labels.csv:74: the unit label .*not valid UTF-8' "$s" || fail "invalid UTF-8 label: $(head -c 800 "$s")"
[ "$(grep -c ',failed,' "$s")" -eq 4 ] || fail "4 units should fail: $(head -c 800 "$s")"
"$RIDGECAL" merge-summaries "$TMP/labels" -o "$TMP/labels-merged" >/dev/null 2>"$TMP/err"; rc=$?
[ $rc -eq 1 ] || fail "merge-summaries refused the batch's own output ($rc): $(cat "$TMP/err")"

# --- item 10: formula injection in summary.csv ---
{
  echo "$HDR"
  for l in '=1+2' '+SUM(1)' '@cmd' '-2+3' '-0.25' 'ok1'; do unit_rows "$l"; done
  printf '"\tTAB",S00,1,1\n'
} >"$TMP/formula.csv"
"$RIDGECAL" batch "$TMP/formula.csv" "${B[@]}" -o "$TMP/formula" >/dev/null 2>&1
s="$TMP/formula/summary.csv"
for l in '=1+2' '+SUM(1)' '@cmd' '-2+3'; do
  grep -qF "'$l,ok," "$s" || fail "'$l' is not neutralised: $(head -c 800 "$s")"
done
grep -q '^-0.25,ok,' "$s" || fail "the number -0.25 was changed: $(head -c 800 "$s")"
grep -q '^ok1,ok,' "$s" || fail "a plain label was changed"
# (a tab in a label is a control character: refused, shown escaped)
grep -q '^\\x09TAB,failed,' "$s" || fail "a label starting with a tab: $(head -c 800 "$s")"
grep -q '"unit":"=1+2"' "$TMP/formula/summary.json" || fail "summary.json must keep the label as given"
"$RIDGECAL" merge-summaries "$TMP/formula" -o "$TMP/formula-m" >/dev/null 2>&1
"$RIDGECAL" merge-summaries "$TMP/formula-m" -o "$TMP/formula-m2" >/dev/null 2>"$TMP/err"; rc=$?
[ $rc -eq 1 ] || fail "merge-summaries of its own output gave $rc: $(cat "$TMP/err")"
cmp -s "$TMP/formula-m/summary.csv" "$TMP/formula-m2/summary.csv" || fail "merging a merge changed summary.csv"
grep -qF "''" "$TMP/formula-m2/summary.csv" && fail "a cell was neutralised twice"

# --- item 11: a quoted newline in a unit label ---
{ echo "$HDR"; unit_rows Q1; printf '"SN\n002",S00,1,1\n'; unit_rows Q3; } >"$TMP/qnl.csv"
"$RIDGECAL" batch "$TMP/qnl.csv" "${B[@]}" -o "$TMP/qnl" >/dev/null 2>&1
s="$TMP/qnl/summary.csv"
grep -q '^Q1,ok,' "$s" || fail "the unit before a quoted newline is blamed: $(head -c 800 "$s")"
grep -q 'qnl.csv:26: the unit label .*control character' "$s" || fail "quoted newline not reported at its line: $(head -c 800 "$s")"
grep -q '^Q3,ok,' "$s" || fail "the unit after a quoted newline: $(head -c 800 "$s")"

# --- item 7: SIGINT and SIGTERM stop cleanly with a partial summary ---
{ echo "$HDR"; many_units K 3000; } >"$TMP/sig.csv"
for sig in INT TERM; do
  want=$([ $sig = INT ] && echo 130 || echo 143)
  "$RIDGECAL" batch "$TMP/sig.csv" --unit unit --setpoint setpoint --timestamp none --progress none -j 2 \
    --reports -o "$TMP/sig-$sig" >/dev/null 2>"$TMP/err" &
  pid=$!
  for _ in $(seq 1 500); do [ "$(ls "$TMP/sig-$sig/records" 2>/dev/null | wc -l)" -ge 20 ] && break; sleep 0.01; done
  kill -$sig $pid
  wait $pid; rc=$?
  [ $rc -eq "$want" ] || fail "SIG$sig gave exit $rc, not $want"
  grep -q "interrupted by SIG$sig" "$TMP/err" || fail "SIG$sig message: $(cat "$TMP/err")"
  leftovers=$(find "$TMP/sig-$sig" -name '*.tmp-*' | wc -l)
  [ "$leftovers" -eq 0 ] || fail "SIG$sig left $leftovers temporary files"
  js="$TMP/sig-$sig/summary.json"
  grep -q '"partial": {"signal": "SIG'$sig'"' "$js" || fail "SIG$sig summary.json is not marked partial: $(head -c 600 "$js")"
  rows=$(($(grep -c ',ok,' "$TMP/sig-$sig/summary.csv")))
  recs=$(ls "$TMP/sig-$sig/records" | wc -l)
  [ "$rows" -ge 20 ] && [ "$rows" -lt 3000 ] || fail "SIG$sig: $rows summary rows"
  [ "$rows" -eq "$recs" ] || fail "SIG$sig: $rows summary rows but $recs records"
  grep -q "^# partial: interrupted by SIG$sig after $rows units" "$TMP/sig-$sig/summary.csv" ||
    fail "SIG$sig summary.csv does not say it is partial: $(tail -2 "$TMP/sig-$sig/summary.csv")"
  "$RIDGECAL" merge-summaries "$TMP/sig-$sig" -o "$TMP/sig-m" >/dev/null 2>"$TMP/err"; rc=$?
  [ $rc -eq 2 ] && grep -q "partial" "$TMP/err" || fail "merge-summaries of a partial summary gave $rc: $(cat "$TMP/err")"
done

[ $fails -eq 0 ] && echo "batch_hardening: all checks passed"
[ $fails -eq 0 ]
