#!/usr/bin/env bash
# compile-matrix.sh FIXTURE_DIR WORK_DIR
# Compiles every generated header (FIXTURE_DIR/*/fwt_calib.h) in a translation
# unit that includes it and calls nothing (target/include_only.c), with the
# strict warning set, as C89/C99/C11 with gcc and clang, as C++17 with g++ and
# clang++, and for Cortex-M0, Cortex-M4F and AVR as C89/C99.
# Any warning is an error. Every compiler of the matrix is required: the
# compiles of the others still run, then a missing one is named and fails the
# test under CI=true (skipped otherwise; tests/tools/need-tool.sh), so that a
# partial matrix never reports "all clean". Exit 0 pass, 1 fail, 77 skip.
set -u
fixtures=$1; work=$2
here=$(cd "$(dirname "$0")" && pwd)
. "$here/../tools/need-tool.sh"
src=$here/target/include_only.c
WARN="-Wall -Wextra -Werror -pedantic -Wconversion -Wdouble-promotion"
STRICT="-Wundef -Wshadow -Wcast-qual -Wcast-align -Wstrict-prototypes -Wmissing-prototypes -Wfloat-equal
        -Wredundant-decls -Wsign-conversion -Wswitch-default -Wbad-function-cast"
rm -rf "$work"; mkdir -p "$work"
fail=0; n=0; missing=""; not_run=0
try() {  # try LABEL FIXTURE COMPILER ARGS...
  local label=$1 f=$2; shift 2
  if ! command -v "$1" >/dev/null; then
    case " $missing " in *" $1 "*) ;; *) missing="$missing $1"; echo "NOT RUN $label (no $1)" ;; esac
    not_run=$((not_run + 1)); return
  fi
  n=$((n+1))
  if "$@" -I"$fixtures/$f" -c "$src" -o "$work/$label-$f.o" 2> "$work/$label-$f.log"; then
    :
  else
    echo "FAIL $label $f"; sed 's/^/    /' "$work/$label-$f.log" | head -20; fail=1
  fi
}
for f in $(cat "$fixtures/fixtures.txt"); do
  for std in c89 c99 c11; do
    try gcc-$std "$f" gcc -std=$std $WARN -ffp-contract=off
    try clang-$std "$f" clang -std=$std $WARN -ffp-contract=off
  done
  # stricter sets that firmware projects often use
  try gcc-strict "$f" gcc -std=c99 $WARN -ffp-contract=off $STRICT
  try clang-everything-c89 "$f" clang -std=c89 -Weverything -Werror -Wno-unused-macros -ffp-contract=off
  try clang-everything-c99 "$f" clang -std=c99 -Weverything -Werror -Wno-unused-macros -ffp-contract=off
  try gxx-17 "$f" g++ -x c++ -std=c++17 -Wall -Wextra -Werror -pedantic -Wconversion -Wdouble-promotion
  try clangxx-17 "$f" clang++ -x c++ -std=c++17 -Wall -Wextra -Werror -pedantic -Wconversion -Wdouble-promotion
  try m0-c89 "$f" arm-none-eabi-gcc -mcpu=cortex-m0 -mthumb -O2 -std=c89 $WARN -ffp-contract=off
  try m4f-c99 "$f" arm-none-eabi-gcc -mcpu=cortex-m4 -mthumb -mfpu=fpv4-sp-d16 -mfloat-abi=hard -O2 -std=c99 $WARN -ffp-contract=off
  # avr-libc's own <math.h> uses 'static inline', which strict C89 rejects:
  # headers that need log() are checked as GNU C89 there (documented in
  # docs/firmware-export.md); all others as strict C89.
  if grep -q '^#include <math.h>' "$fixtures/$f/fwt_calib.h"; then
    try avr-gnu89 "$f" avr-gcc -mmcu=atmega328p -O2 -std=gnu89 $WARN -ffp-contract=off
  else
    try avr-c89 "$f" avr-gcc -mmcu=atmega328p -O2 -std=c89 $WARN -ffp-contract=off
  fi
done
echo "compile-matrix: $n compiles, $([ $fail = 0 ] && echo all clean || echo FAILURES), $not_run not run"
[ $fail = 0 ] || exit 1
[ -z "$missing" ] || ridgecal_missing_tool "${missing# }" "$not_run compiles of the matrix not run; run tests/firmware/install-target-tools.sh"
[ $n -gt 0 ] || { echo "FAIL: no compile ran"; exit 1; }
exit 0
