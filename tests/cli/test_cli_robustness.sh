#!/usr/bin/env bash
# End-to-end robustness of `ridgecal fit`: delimiters, decimal comma, NaN and
# infinities anywhere, extreme magnitudes, hostile names, input limits (a real
# 10-million-row file), and no NaN/Infinity in any output.
# usage: test_cli_robustness.sh RIDGECAL_BINARY RECORD_CHECK_BINARY
set -u
bin=$1 check=$2
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
fails=0 passes=0
ok() { passes=$((passes + 1)); }
bad() { echo "FAIL: $*"; fails=$((fails + 1)); }

# expect_exit CODE PATTERN -- ARGS...: exit code, stderr (or stdout) matches PATTERN.
expect_exit() {
  local code=$1 pattern=$2; shift 3
  rm -f "$work/out.json"
  "$bin" fit "$@" >"$work/stdout" 2>"$work/stderr"
  local rc=$?
  if [[ $rc -ne $code ]]; then bad "fit $*: exit $rc, expected $code: $(head -c 400 "$work/stderr")"; return 1; fi
  if [[ -n $pattern ]] && ! grep -Eq -- "$pattern" "$work/stderr" "$work/stdout"; then
    bad "fit $*: output does not match '$pattern': $(head -c 400 "$work/stderr")"; return 1
  fi
  if [[ $code -ne 0 && -e "$work/out.json" ]]; then bad "fit $*: wrote a record although it failed"; return 1; fi
  ok
}

# no_nan FILE...: no NaN or infinity spelled in any output.
no_nan() {
  if grep -Eiq '(^|[^a-z])(nan|-?inf|infinity)([^a-z]|$)' "$@"; then
    bad "non-finite value in $*: $(grep -Eio '.{0,30}(nan|inf|infinity).{0,10}' "$@" | head -3)"
  else ok; fi
}

# record_ok FILE: an intact record (integrity digest matches).
record_ok() { if "$check" "$1" >/dev/null; then ok; else bad "record $1: $("$check" "$1")"; fi; }

# json_field FILE PYTHON-EXPR: prints a value of the record via python3.
json_field() { python3 -c "import json,sys; j=json.load(open(sys.argv[1], encoding='utf-8')); print($2)" "$1"; }

base="reading,reference
1,2.01
2,4.02
3,5.98
4,8.03
5,9.99
6,12.01
7,13.98"

# ---- delimiters end to end ----
printf '%s\n' "$base" | tr ',' ';' >"$work/semi.csv"
expect_exit 0 "" -- "$work/semi.csv" --delimiter ';' --degrees 1..2 -o "$work/out.json" --timestamp none &&
  [[ $(json_field "$work/out.json" 'j["input"]["columns"]["delimiter"]') == ";" ]] && ok
cp "$work/out.json" "$work/semi.json"
printf '%s\n' "$base" | tr ',' '\t' >"$work/tab.csv"
expect_exit 0 "" -- "$work/tab.csv" --delimiter tab --degrees 1..2 -o "$work/out.json" --timestamp none
# Same data, same curve whatever the delimiter.
if [[ "$(json_field "$work/out.json" 'j["model"]["chebyshev_coefficients"]')" == \
      "$(json_field "$work/semi.json" 'j["model"]["chebyshev_coefficients"]')" ]]; then ok; else bad "delimiters give different curves"; fi
expect_exit 2 "another delimiter.*--delimiter" -- "$work/semi.csv" -o "$work/out.json"

# ---- decimal comma ----
printf '%s\n' "$base" | tr ',' ';' | sed 's/\./,/g' >"$work/dc.csv"
expect_exit 2 "not a number.*--decimal-comma" -- "$work/dc.csv" --delimiter ';' -o "$work/out.json"
expect_exit 0 "" -- "$work/dc.csv" --delimiter ';' --decimal-comma --degrees 1..2 -o "$work/out.json" --timestamp none
if [[ "$(json_field "$work/out.json" 'j["model"]["chebyshev_coefficients"]')" == \
      "$(json_field "$work/semi.json" 'j["model"]["chebyshev_coefficients"]')" ]]; then ok; else bad "decimal comma gives another curve"; fi
expect_exit 2 "decimal.comma" -- "$work/dc.csv" --decimal-comma -o "$work/out.json"  # needs ';' or tab
printf '%s\n' "$base" | sed 's/\./,/g' >"$work/dc-comma.csv"
expect_exit 2 "has 3 fields.*--decimal-comma" -- "$work/dc-comma.csv" -o "$work/out.json"

# ---- NaN and infinities anywhere ----
for v in nan NaN -nan inf -inf Infinity INF 1e999 -1e999; do
  printf 'reading,reference\n1,2\n%s,3\n3,4\n' "$v" >"$work/v.csv"
  expect_exit 2 ":3: column 'reading' holds" -- "$work/v.csv" -o "$work/out.json"
  printf 'reading,reference\n1,2\n2,3\n3,%s\n' "$v" >"$work/v.csv"
  expect_exit 2 ":4: column 'reference' holds" -- "$work/v.csv" -o "$work/out.json"
done
# In a column that is not read, or as a setpoint label, NaN is just text.
printf 'setpoint,reading,reference,note\nnan,1,2,inf\nnan,1.1,2.2,nan\ninf,2,4,x\nx,3,6,y\ny,4,8,z\n' >"$work/v.csv"
expect_exit 0 "" -- "$work/v.csv" --setpoint setpoint --degree 1 --lambda 0 -o "$work/out.json" --timestamp none

# ---- extreme magnitudes: accepted in [1e-300, 1e300], refused outside ----
printf 'reading,reference\n1e-300,1e299\n2e-300,3e299\n3e-300,5e299\n4e-300,7e299\n5e-300,9e299\n6e-300,1e300\n' >"$work/ext.csv"
expect_exit 0 "" -- "$work/ext.csv" --degrees 1..2 -o "$work/out.json" --timestamp none --full
no_nan "$work/out.json" "$work/stdout"
record_ok "$work/out.json"
printf 'reading,reference\n1,2\n2,1e301\n3,4\n' >"$work/ext.csv"
expect_exit 2 ":3: .*outside the supported range" -- "$work/ext.csv" -o "$work/out.json"
printf 'reading,reference\n1e-310,2\n2,3\n3,4\n' >"$work/ext.csv"
expect_exit 2 ":2: .*outside the supported range" -- "$work/ext.csv" -o "$work/out.json"

# ---- constant reference, a single setpoint, more coefficients than setpoints ----
printf 'reading,reference\n1,5\n2,5\n3,5\n4,5\n5,5\n6,5\n' >"$work/const.csv"
# (issue 13: a constant reference is bad input, no longer a fit with R2 = n/a)
expect_exit 2 "const.csv:2: the references do not vary: all 6 lie within 5 \.\. 5" -- "$work/const.csv" --setpoint reading --degrees 1..2 -o "$work/out.json" --timestamp none
printf 'setpoint,reading,reference\nA,1,2\nA,2,3\nA,3,4\n' >"$work/one.csv"
expect_exit 2 "only 1 distinct setpoint" -- "$work/one.csv" --setpoint setpoint --degree 1 --lambda 0 -o "$work/out.json"
printf 'reading,reference\n1,1\n2,4\n3,9\n' >"$work/three.csv"
expect_exit 2 "setpoint" -- "$work/three.csv" --degree 5 --lambda 0 -o "$work/out.json"
expect_exit 2 "setpoint" -- "$work/three.csv" --degrees 4..7 -o "$work/out.json"

# ---- hostile names ----
printf '%s\n' "$base" >"$work/ok.csv"
name='probe "7" */ /* <script>alert(1)</script> & Fühler °C 温度'
expect_exit 0 "" -- "$work/ok.csv" --degrees 1..2 --sensor "$name" --reading-unit '"counts"' --reference-unit '°C</td>' \
  -o "$work/out.json" --timestamp none
[[ $(json_field "$work/out.json" 'j["sensor"]["name"]') == "$name" ]] && ok || bad "sensor name did not round-trip"
record_ok "$work/out.json"
expect_exit 2 "--sensor: .*control character" -- "$work/ok.csv" --sensor $'two\nlines' -o "$work/out.json"
expect_exit 2 "--sensor: .*not valid UTF-8" -- "$work/ok.csv" --sensor $'Temp\xe9rature' -o "$work/out.json"
expect_exit 2 "--reading-unit: .*bytes long" -- "$work/ok.csv" --reading-unit "$(head -c 2000 /dev/zero | tr '\0' u)" -o "$work/out.json"
# A '/' cannot be in a file name, so "*/" comes from a directory named "x *".
mkdir -p "$work/x *"
hostile_file="$work/x */we\"ird <b>&amp; \$(id) $(printf 'new\nline') é.csv"
cp "$work/ok.csv" "$hostile_file"
expect_exit 0 "" -- "$hostile_file" --degrees 1..2 -o "$work/out.json" --timestamp none
[[ $(json_field "$work/out.json" 'j["input"]["file"]') == "$hostile_file" ]] && ok || bad "file name did not round-trip"
cp "$work/ok.csv" "$work/bad-$(printf '\xff').csv"
expect_exit 2 "not valid UTF-8" -- "$work/bad-$(printf '\xff').csv" -o "$work/out.json"
printf 'reading,"we""ird */ <col>"\n1,2\n2,4\n3,6\n' >"$work/col.csv"
expect_exit 0 "" -- "$work/col.csv" --reference 'we"ird */ <col>' --degree 1 --lambda 0 -o "$work/out.json" --timestamp none
[[ $(json_field "$work/out.json" 'j["input"]["columns"]["reference"]') == 'we"ird */ <col>' ]] && ok || bad "column name did not round-trip"

# ---- limits: a real 10-million-row file is refused quickly, with the option to name ----
yes '1,2' | head -n 10000000 | sed '1i reading,reference' >"$work/big.csv"
start=$(date +%s)
expect_exit 2 "big.csv:1000002: the file has more than 1000000 data rows.*--max-rows" -- "$work/big.csv" -o "$work/out.json"
expect_exit 2 "the limit is 1000000 bytes.*--max-bytes" -- "$work/big.csv" --max-bytes 1000000 -o "$work/out.json"
echo "limits: 10M-row file refused in $(( $(date +%s) - start )) s"
rm -f "$work/big.csv"
printf 'reading,reference\n1,2\n2,3\n3,4\n4,5\n' >"$work/small.csv"
expect_exit 2 "more than 3 data rows" -- "$work/small.csv" --max-rows 3 -o "$work/out.json"
expect_exit 2 "max_rows" -- "$work/small.csv" --max-rows 0 -o "$work/out.json"
expect_exit 2 "longer than 4 bytes.*--max-field-bytes" -- "$work/small.csv" --reading r --reference ref --max-field-bytes 4 -o "$work/out.json" ||
  true  # column option names longer than the limit are caught first; both are exit 2

echo "cli_robustness: $passes passed, $fails failed"
[[ $fails -eq 0 ]]
