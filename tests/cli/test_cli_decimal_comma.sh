#!/usr/bin/env bash
# Decimal commas wherever a CSV is read (issue 14 item 8): `fit`, `verify` and
# `batch` accept --decimal-comma with --delimiter ';', the record stores both,
# and `verify` reuses them from the record unless told otherwise. The same
# data written with a decimal comma must give the same curve as with a point.
# usage: test_cli_decimal_comma.sh RIDGECAL_BINARY SAMPLES_DIR
set -u
bin=$1 samples=$2
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
fails=0 passes=0
check() { # check DESCRIPTION CONDITION...
  local what=$1; shift
  if "$@"; then passes=$((passes + 1)); else echo "FAIL: $what"; fails=$((fails + 1)); fi
}
coefs() { jq -c '.model.chebyshev_coefficients' "$1"; }

src=$samples/ntc-coldstore/ntc-coldstore.csv
# The sample with ';' between fields and ',' as the decimal point.
grep -v '^#' "$src" | tr ',.' ';,' > "$work/comma.csv"
grep -v '^#' "$src" > "$work/point.csv"

"$bin" fit "$work/point.csv" --setpoint setpoint --timestamp none -o "$work/point.json" >/dev/null 2>&1
check "fit of the plain file exits 0" test $? -eq 0
"$bin" fit "$work/comma.csv" --setpoint setpoint --delimiter ';' --decimal-comma --timestamp none \
  -o "$work/comma.json" >/dev/null 2>"$work/err"
check "fit with --decimal-comma exits 0 ($(cat "$work/err"))" test $? -eq 0
check "same curve from decimal commas" test "$(coefs "$work/comma.json")" = "$(coefs "$work/point.json")"
check "record stores the delimiter" test "$(jq -r '.input.columns.delimiter' "$work/comma.json")" = ";"
check "record stores the decimal comma" test "$(jq -r '.input.columns.decimal_comma' "$work/comma.json")" = true
check "a plain record has no decimal_comma member" \
  test "$(jq -r '.input.columns | has("decimal_comma")' "$work/point.json")" = false

# verify reuses delimiter and decimal comma from the record
"$bin" verify "$work/comma.json" "$work/comma.csv" --tol-offset 1 --timestamp none -o "$work/af.json" \
  >"$work/out" 2>"$work/err"
check "verify reads decimal commas from the record's settings ($(cat "$work/err"))" test $? -eq 0
check "verify PASS on its own data" grep -q 'PASS' "$work/out"
# --decimal-point overrides the record: the comma data is then refused with a hint
"$bin" verify "$work/comma.json" "$work/comma.csv" --decimal-point --timestamp none >"$work/out" 2>"$work/err"
check "verify --decimal-point on comma data exits 2" test $? -eq 2
check "the refusal points at --decimal-comma" grep -q -- "--decimal-comma" "$work/err"
# the hint is honest: verify does accept --decimal-comma
"$bin" verify "$work/point.json" "$work/comma.csv" --delimiter ';' --decimal-comma --timestamp none \
  >"$work/out" 2>"$work/err"
check "verify --decimal-comma overrides a plain record ($(cat "$work/err"))" test $? -eq 0
"$bin" verify "$work/comma.json" "$work/point.csv" --decimal-comma --decimal-point >"$work/out" 2>"$work/err"
check "--decimal-comma with --decimal-point exits 2" test $? -eq 2
check "the contradiction is named" grep -q -- "--decimal-comma and --decimal-point contradict" "$work/err"
"$bin" verify "$work/point.json" "$work/point.csv" --decimal-comma >"$work/out" 2>"$work/err"
check "verify --decimal-comma with delimiter ',' exits 2" test $? -eq 2
check "verify names the delimiter rule" grep -q "needs delimiter ';' or a tab" "$work/err"

# batch: two units, decimal commas
{
  echo "unit;setpoint;reading;reference"
  for u in N1 N2; do tail -n +2 "$work/comma.csv" | sed "s/^/$u;/"; done
} >"$work/batch.csv"
"$bin" batch "$work/batch.csv" --unit unit --setpoint setpoint --delimiter ';' --decimal-comma \
  -o "$work/b" --timestamp none --progress none >/dev/null 2>"$work/err"
check "batch with --decimal-comma exits 0 ($(cat "$work/err"))" test $? -eq 0
check "batch record has the plain fit's curve" test "$(coefs "$work/b/records/N1.json")" = "$(coefs "$work/point.json")"
check "batch record stores the decimal comma" \
  test "$(jq -r '.input.columns.decimal_comma' "$work/b/records/N2.json")" = true
"$bin" verify "$work/b/records/N2.json" "$work/comma.csv" --tol-offset 1 --timestamp none >/dev/null 2>"$work/err"
check "verify reads a batch record's decimal comma ($(cat "$work/err"))" test $? -eq 0
"$bin" batch "$work/batch.csv" --unit unit --setpoint setpoint --delimiter ';' -o "$work/b2" \
  --timestamp none --progress none >/dev/null 2>&1
check "batch without --decimal-comma fails the units (exit 1)" test $? -eq 1

# a record whose decimal_comma is not a boolean is refused by name
jq '.input.columns.decimal_comma = "yes"' "$work/comma.json" >"$work/badtype.json"
"$bin" verify "$work/badtype.json" "$work/comma.csv" --allow-modified >"$work/out" 2>"$work/err"
check "a non-boolean decimal_comma exits 2" test $? -eq 2
check "the member is named" grep -q "'input.columns.decimal_comma' is not true or false" "$work/err"

echo "decimal comma: $passes passed, $fails failed"
test $fails -eq 0
