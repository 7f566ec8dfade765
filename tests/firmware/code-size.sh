#!/usr/bin/env bash
# code-size.sh FIXTURE_DIR WORK_DIR
# Prints the code size in bytes (.text of an object holding one out-of-line
# wrapper, see target/size_probe.c) of the generated evaluation, the
# range-checked evaluation and the table check, per fixture and target
# (Cortex-M4F hard float, Cortex-M0 soft float, ATmega328P), at -O2 and -Os.
# Sizes exclude the coefficient table (shown separately; on AVR it sits in
# .data, i.e. RAM) and library routines (soft-float and 64-bit helpers from
# libgcc/avr-libc). Needs arm-none-eabi-gcc and avr-gcc: a missing one is
# named and fails under CI=true (skipped otherwise; tests/tools/need-tool.sh).
set -u
fixtures=$1; work=$2
here=$(cd "$(dirname "$0")" && pwd)
. "$here/../tools/need-tool.sh"
ridgecal_need_tools "run tests/firmware/install-target-tools.sh, as setup.sh test does" \
  arm-none-eabi-gcc arm-none-eabi-size avr-gcc avr-size
rm -rf "$work"; mkdir -p "$work"
FLAGS="-std=c99 -ffp-contract=off -Wall -Wextra -Werror -pedantic -Wconversion -Wdouble-promotion"
declare -A CC=( [m4f]="arm-none-eabi-gcc -mcpu=cortex-m4 -mthumb -mfpu=fpv4-sp-d16 -mfloat-abi=hard"
                [m0]="arm-none-eabi-gcc -mcpu=cortex-m0 -mthumb"
                [avr]="avr-gcc -mmcu=atmega328p" )
declare -A SIZE=( [m4f]=arm-none-eabi-size [m0]=arm-none-eabi-size [avr]=avr-size )
any=0
printf "%-14s %-4s %-3s %6s %8s %6s %6s\n" fixture tgt opt eval checked check table
for f in $(cat "$fixtures/fixtures.txt"); do
  n=$(grep -c '^    .*, */\* \(t\|x\)^\|^    .* /\* \(t\|x\)^' "$fixtures/$f/fwt_calib.h")
  for t in m4f m0 avr; do
    set -- ${CC[$t]}
    command -v "$1" >/dev/null || continue
    any=1
    for opt in -O2 -Os; do
      sizes=()
      for p in 1 2 3; do
        o=$work/$f-$t$opt-$p.o
        ${CC[$t]} $opt $FLAGS -DPROBE=$p -I"$fixtures/$f" -c "$here/target/size_probe.c" -o "$o" || exit 1
        sizes+=("$(${SIZE[$t]} -A "$o" | awk '$1==".text" {print $2}')")
      done
      entry=4; grep -q FWT_NUMERIC_DOUBLE "$fixtures/$f/fwt_calib.h" && { [ $t = avr ] && entry=4 || entry=8; }
      printf "%-14s %-4s %-3s %6s %8s %6s %6s\n" "$f" "$t" "$opt" "${sizes[0]}" "${sizes[1]}" "${sizes[2]}" \
        "$((n * entry))"
    done
  done
done
[ $any = 1 ] || { echo "FAIL: no size was measured"; exit 1; }
