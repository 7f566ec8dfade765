#!/usr/bin/env bash
# End-to-end tests of `ridgecal fit`: every bad input exits 2 with a
# FILE:LINE: message and writes nothing (an existing record stays untouched);
# the bundled samples fit and print a choice with validation and test errors.
# usage: test_cli_fit.sh RIDGECAL_BINARY TESTS_CLI_DIR SAMPLES_DIR
set -u
bin=$1 dir=$2 samples=$3
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
fails=0 passes=0
ok() { passes=$((passes + 1)); }
bad() { echo "FAIL: $*"; fails=$((fails + 1)); }

# expect_bad FILE PATTERN [extra args]: exit 2, stderr matches PATTERN, no output file.
expect_bad() {
  local file=$1 pattern=$2; shift 2
  rm -f "$work/out.json"
  "$bin" fit "$file" -o "$work/out.json" "$@" >"$work/stdout" 2>"$work/stderr"
  local rc=$?
  if [[ $rc -ne 2 ]]; then bad "$file: exit $rc, expected 2"; return; fi
  if ! grep -Eq -- "$pattern" "$work/stderr"; then bad "$file: stderr '$(cat "$work/stderr")' does not match '$pattern'"; return; fi
  if [[ -e "$work/out.json" ]]; then bad "$file: wrote an output file"; return; fi
  if ls "$work" | grep -q tmp-; then bad "$file: left a temporary file"; return; fi
  ok
}

b=$dir/bad
expect_bad "$b/empty.csv" "empty.csv:1: the file is empty"
expect_bad "$b/header-only.csv" "header-only.csv:1: the file has a header but no data rows"
expect_bad "$b/missing-column.csv" "missing-column.csv:1: the header has no reference column 'reference'"
expect_bad "$b/non-numeric.csv" "non-numeric.csv:3: column 'reference' holds 'x3', which is not a number\. write"
expect_bad "$b/nan.csv" "nan.csv:3: .*not a finite number"
expect_bad "$b/inf.csv" "inf.csv:3: .*not a finite number"
expect_bad "$b/ragged.csv" "ragged.csv:3: the row has 1 fields but the header \(line 1\) has 2"
expect_bad "$b/too-few-setpoints.csv" "too-few-setpoints.csv: .*setpoint" --degrees 2..3
expect_bad "$b/readings-equal.csv" "readings-equal.csv:2: the readings do not vary: all 5 lie within 5 \.\. 5 .* while the references span 1 \.\. 5\. check the reading column"
expect_bad "$b/does-not-exist.csv" "does-not-exist.csv: cannot open the file"
expect_bad "$b/missing-column.csv" "unknown|unrecognised" --no-such-option
expect_bad "$b/missing-column.csv" "--degree and --lambda" --degree 2

# An existing record is never replaced by a failing run.
echo '{"keep": true}' >"$work/keep.json"
"$bin" fit "$b/nan.csv" -o "$work/keep.json" >/dev/null 2>&1
if [[ $? -eq 2 && "$(cat "$work/keep.json")" == '{"keep": true}' ]]; then ok; else bad "existing record was touched"; fi

# Samples: exit 0, a record is written, the summary names degree, validation and test.
for csv in "$samples"/*/*.csv; do
  "$bin" fit "$csv" --setpoint setpoint -o "$work/rec.json" --timestamp 2026-01-01T00:00:00Z >"$work/stdout" 2>"$work/stderr"
  rc=$?
  if [[ $rc -ne 0 ]]; then bad "$csv: exit $rc: $(cat "$work/stderr")"; continue; fi
  if grep -q "^model: degree [0-9]" "$work/stdout" && grep -q "^validation: *n=" "$work/stdout" &&
     grep -q "^test: *n=" "$work/stdout" && grep -q '"format": "ridgecal-record"' "$work/rec.json"; then ok
  else bad "$csv: unexpected summary: $(cat "$work/stdout")"; fi
done

# Determinism: the same run twice gives byte-identical records.
csv=$(ls "$samples"/*/*.csv | head -1)
"$bin" fit "$csv" --setpoint setpoint -o "$work/a.json" --timestamp none >/dev/null
"$bin" fit "$csv" --setpoint setpoint -o "$work/b.json" --timestamp none >/dev/null
if cmp -s "$work/a.json" "$work/b.json"; then ok; else bad "records differ between identical runs"; fi

echo "cli_fit: $passes passed, $fails failed"
[[ $fails -eq 0 ]]
