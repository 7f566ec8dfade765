#!/usr/bin/env bash
# Hostile strings and integrity in what consumers of a record write:
#  * `ridgecal export`: the C header stays valid C whatever the sensor, unit,
#    column, setpoint and file names hold (comments escaped: nothing breaks
#    out of a comment, checked on the preprocessed header); hostile --prefix
#    identifiers are rejected; an existing header is never replaced by a
#    failing export; an edited record is refused (exit 2, how to re-create it)
#    unless --allow-modified, which the header and the summary then state;
#    no non-finite coefficient ever reaches a header.
# Every check must run: a missing export subcommand or option, or a failing
# fit, is a failure (never a skip). Refusals must be the expected exit code
# with the expected message; a crash never counts as a refusal.
# usage: test_hostile_outputs.sh RIDGECAL_BINARY
set -u
bin=$1
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
fails=0 passes=0
ok() { passes=$((passes + 1)); }
bad() { echo "FAIL: $*"; fails=$((fails + 1)); }
cc=${CC:-cc}

# A run with hostile names everywhere that ends up in a record.
mkdir -p "$work/d */x"
data="$work/d */x/run \"q\" <script>alert(1)<\\script> $(printf 'nl\n#error INJECTED_FILE\n') é.csv"
{
  echo 'sp,reading,"ref */ injected_col /* ""q"""'
  for i in 0 1 2 3 4 5 6 7 8 9; do
    echo "\"*/ injected_label_$i /* <b>é\",$((100 * i + 7)),$(awk -v i="$i" 'BEGIN{printf "%.4f", 0.5 + 0.25 * i + 0.001 * i * i}')"
    echo "\"*/ injected_label_$i /* <b>é\",$((100 * i + 9)),$(awk -v i="$i" 'BEGIN{printf "%.4f", 0.5 + 0.25 * i + 0.001 * i * i + 0.0005}')"
  done
} >"$data"
sensor='probe */ int injected_sensor = 1; /* "7" ??/ \ <script> Fühler 温度'
if ! "$bin" fit "$data" --setpoint sp --reference 'ref */ injected_col /* "q"' --degrees 1..2 \
     --sensor "$sensor" --reading-unit '*/ injected_unit /*' --reference-unit '°C ??= \' \
     --timestamp none -o "$work/rec.json" >"$work/fit.out" 2>&1; then
  echo "FAIL: the hostile run does not fit: $(cat "$work/fit.out")"
  exit 1
fi

if ! "$bin" export --help >"$work/help" 2>&1; then
  echo "FAIL: 'ridgecal export --help' failed: $(head -5 "$work/help")"
  exit 1
fi
{
  # ---- the header is valid C, and nothing escapes its comments ----
  if "$bin" export "$work/rec.json" --prefix hostile --allow-unpassed -o "$work/hostile.h" >"$work/out" 2>&1; then ok
  else bad "export of the hostile record: $(cat "$work/out")"; fi
  printf '#include "hostile.h"\nint main(void) { return 0; }\n' >"$work/main.c"
  for std in c99 c11; do
    if "$cc" -std=$std -Wall -Wextra -Werror -fsyntax-only -I"$work" "$work/main.c" 2>"$work/cc.err"; then ok
    else bad "the header is not valid $std: $(head -5 "$work/cc.err")"; fi
  done
  # Preprocessing removes comments: any hostile text left is outside one.
  "$cc" -std=c99 -E -P -I"$work" "$work/main.c" >"$work/pp.c" 2>/dev/null
  if grep -q "injected\|INJECTED\|script" "$work/pp.c"; then bad "hostile text outside a comment: $(grep -m3 "injected\|INJECTED\|script" "$work/pp.c")"
  else ok; fi
  grep -q "injected_sensor" "$work/hostile.h" && ok || bad "the sensor name is not in the header's comments at all"

  # ---- identifiers: hostile prefixes are rejected, nothing is written ----
  for prefix in 'a b' '*/x' 'x;y' '1abc' 'é' '' 'a__b' 'int' "$(head -c 300 /dev/zero | tr '\0' a)"; do
    rm -f "$work/p.h"
    "$bin" export "$work/rec.json" --prefix "$prefix" --allow-unpassed -o "$work/p.h" >/dev/null 2>"$work/err"
    rc=$?
    if [[ $rc -eq 2 && ! -e "$work/p.h" ]] && grep -q -- "prefix" "$work/err"; then ok
    else bad "--prefix '$prefix': exit $rc, header written: $([[ -e $work/p.h ]] && echo yes || echo no): $(head -3 "$work/err")"; fi
  done

  # ---- an existing header is never replaced by a failing export ----
  echo "/* KEEP */" >"$work/keep.h"
  python3 - "$work/rec.json" "$work/edited.json" <<'PY'
import json, sys
j = json.load(open(sys.argv[1], encoding="utf-8"))
j["model"]["chebyshev_coefficients"][0] += 1e-9   # a hand edit
json.dump(j, open(sys.argv[2], "w", encoding="utf-8"), ensure_ascii=False, indent=2)
PY
  # NAME|EXIT|MESSAGE (extended regex)|RECORD|ARGS...
  keep_cases=(
    "bad prefix|2|prefix|$work/rec.json|--prefix|a b"
    "missing record|2|none\.json|$work/none.json|--prefix|k"
    "edited record|2|modified|$work/edited.json|--prefix|k"
    "refused arithmetic|1|refused: max deviation|$work/rec.json|--prefix|k|--numeric|fixed|--output-scale|1|--tolerance|1e-12"
  )
  for c in "${keep_cases[@]}"; do
    IFS='|' read -r -a f <<<"$c"
    "$bin" export "${f[3]}" "${f[@]:4}" --allow-unpassed -o "$work/keep.h" >/dev/null 2>"$work/err"
    rc=$?
    if [[ $rc -eq ${f[1]} && "$(cat "$work/keep.h")" == "/* KEEP */" ]] && grep -Eq -- "${f[2]}" "$work/err" &&
       ! compgen -G "$work/keep.h.tmp-*" >/dev/null; then ok
    else bad "${f[0]}: exit $rc (expected ${f[1]} with /${f[2]}/: $(head -3 "$work/err")); or the existing header was touched or a temporary file was left"; fi
  done

  # ---- record integrity: refused unless --allow-modified, which is stated ----
  "$bin" export "$work/edited.json" --prefix k -o "$work/k.h" >/dev/null 2>"$work/err"
  rc=$?
  if [[ $rc -eq 2 ]] && grep -q "modified" "$work/err" && grep -q "ridgecal fit" "$work/err" &&
     grep -q -- "--allow-modified" "$work/err"; then ok
  else bad "edited record: exit $rc: $(cat "$work/err")"; fi
  "$bin" export "$work/edited.json" --prefix k --allow-modified --allow-unpassed -o "$work/k.h" >"$work/out" 2>&1
  rc=$?
  if [[ $rc -eq 0 ]] && grep -q "RECORD MODIFIED" "$work/k.h" && grep -q "was modified" "$work/out"; then ok
  else bad "--allow-modified: exit $rc, header or summary does not say the record was modified: $(cat "$work/out")"; fi

  # ---- extreme magnitudes: a finite header or a clear refusal, never NaN/inf ----
  printf 'reading,reference\n1e-300,1e299\n2e-300,3e299\n3e-300,5e299\n4e-300,7e299\n5e-300,9e299\n6e-300,1e300\n' >"$work/ext.csv"
  if "$bin" fit "$work/ext.csv" --degree 1 --lambda 0 --timestamp none -o "$work/ext.json" >"$work/out" 2>&1 &&
     [[ -s $work/ext.json ]]; then ok
  else bad "the extreme-magnitude fit failed (exit $?): $(head -5 "$work/out")"; fi
  for mode in float double fixed; do
    rm -f "$work/ext.h"
    "$bin" export "$work/ext.json" --prefix ext --numeric $mode --allow-unpassed -o "$work/ext.h" >"$work/out" 2>&1
    rc=$?
    if [[ $rc -eq 0 ]]; then
      # Code only: comments legitimately mention NaN inputs.
      if gcc -fpreprocessed -dD -E -P "$work/ext.h" 2>/dev/null |
         grep -Eiq '(^|[^a-z_])(nan|inf|infinity)([^a-z_]|$)|HUGE_VAL'; then bad "$mode: non-finite literal in the header"
      elif "$cc" -std=c99 -fsyntax-only -I"$work" -include "$work/ext.h" -x c /dev/null 2>/dev/null; then ok
      else bad "$mode: extreme header is not valid C"; fi
    elif [[ $rc -eq 2 && ! -e "$work/ext.h" ]] && grep -Eq "does not fit|cannot represent" "$work/out"; then ok
    else bad "$mode: exit $rc (expected 0, or 2 with a refusal naming what does not fit): $(cat "$work/out")"; fi
  done
}

echo "hostile_outputs: $passes passed, $fails failed"
[[ $fails -eq 0 ]]
