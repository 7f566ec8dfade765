#!/usr/bin/env bash
# run-target.sh TARGET FIXTURE_DIR FW_COMPARE WORK_DIR
# Builds the test driver against every generated header in FIXTURE_DIR (made
# by fw_fixture), runs it on TARGET and compares its output bit for bit with
# the host emulation (fw_compare). Exit 0 pass, 1 fail, 77 = a tool is missing
# (CTest SKIP_RETURN_CODE; the message names the tool; under CI=true a missing
# tool is a failure, exit 1: tests/tools/need-tool.sh). Targets:
#   host-gcc host-clang host-gcc-c89 host-cxx   build machine
#   host-fma       gcc and clang -march=haswell -ffp-contract=off (FMA available)
#   m0 m3 m4f m7   arm-none-eabi-gcc + qemu-system-arm (semihosting)
#   avr            avr-gcc (ATmega328P) + simavr
# A header that includes <math.h> (extended models with ln) is linked with the
# C library's libm: -lm on the host and AVR (avr-libc), newlib's libm.a (plus
# libc.a for errno) on Cortex-M. Without newlib only those headers are left
# out (reported as a missing tool at the end); all others still run.
set -u
target=$1; fixtures=$2; compare=$3; work=$4
here=$(cd "$(dirname "$0")" && pwd)
. "$here/../tools/need-tool.sh"
drv=$here/target
WARN="-Wall -Wextra -Werror -pedantic -Wconversion -Wdouble-promotion"
FP="-ffp-contract=off"

need() { ridgecal_need_tools "run tests/firmware/install-target-tools.sh, as setup.sh test does" "$@"; }

# Cortex-M: a header with <math.h> needs newlib's libm (libnewlib-arm-none-eabi).
have_newlib() { [ "$(arm-none-eabi-gcc -print-file-name=libm.a 2>/dev/null)" != "libm.a" ]; }
missing_newlib=0

rm -rf "$work"; mkdir -p "$work"
fail=0

# run_one NAME FIXTURE -- builds with $build_cmd, runs with $run_cmd
libm_for() {  # libm_for FIXTURE LIBS: prints LIBS when the header needs log()
  if grep -q '^#include <math.h>' "$fixtures/$1/fwt_calib.h"; then echo "$2"; fi
}

check() {  # check LABEL FIXTURE OUTPUT
  if "$compare" "$fixtures/$2/expected.txt" "$3" > "$3.cmp" 2>&1; then
    echo "PASS $1 $2: $(head -1 "$3.cmp")"
  else
    echo "FAIL $1 $2:"; sed 's/^/    /' "$3.cmp"; fail=1
  fi
}

host_run() {  # host_run LABEL COMPILER FLAGS...
  local label=$1 cc=$2; shift 2
  for f in $(cat "$fixtures/fixtures.txt"); do
    local exe=$work/$label-$f
    if ! $cc "$@" -I"$fixtures/$f" -I"$drv" "$drv/driver.c" "$drv/plat_host.c" -o "$exe" $(libm_for "$f" -lm) 2> "$exe.log"; then
      echo "FAIL $label $f: compile"; sed 's/^/    /' "$exe.log" | head -30; fail=1; continue
    fi
    "$exe" > "$exe.out" 2>&1
    check "$label" "$f" "$exe.out"
  done
}

cm_run() {  # cm_run LABEL BOARD CPUFLAGS...
  local label=$1 board=$2; shift 2
  for f in $(cat "$fixtures/fixtures.txt"); do
    local o=$work/$label-$f
    if [ -n "$(libm_for "$f" yes)" ] && ! have_newlib; then
      echo "NOT RUN $label $f: its header needs libm and newlib is missing"; missing_newlib=1; continue
    fi
    if ! { arm-none-eabi-gcc "$@" -O2 -std=c99 $WARN $FP -ffunction-sections -fdata-sections \
             -I"$fixtures/$f" -I"$drv" -c "$drv/driver.c" -o "$o-drv.o" &&
           arm-none-eabi-gcc "$@" -O2 -std=gnu99 -Wall -Wextra -Werror -fno-tree-loop-distribute-patterns \
             -ffunction-sections -I"$drv" -c "$drv/plat_cortexm.c" -o "$o-plat.o" &&
           arm-none-eabi-gcc "$@" -nostdlib -T "$drv/cortexm.ld" -Wl,--gc-sections \
             -o "$o.elf" "$o-drv.o" "$o-plat.o" $(libm_for "$f" "-lm -lc") -lgcc; } 2> "$o.log"; then
      echo "FAIL $label $f: build"; sed 's/^/    /' "$o.log" | head -30; fail=1; continue
    fi
    timeout 60 qemu-system-arm -M "$board" -display none -monitor none -serial none \
      -chardev stdio,id=fwsh -semihosting-config enable=on,target=native,chardev=fwsh \
      -kernel "$o.elf" < /dev/null > "$o.out" 2> "$o.err"
    local rc=$?
    if [ $rc -ne 0 ]; then echo "FAIL $label $f: qemu exit $rc"; cat "$o.err" | head -5; fail=1; continue; fi
    check "$label" "$f" "$o.out"
  done
}

case $target in
  host-gcc)     need gcc;   host_run host-gcc gcc -O2 -std=c99 $WARN $FP ;;
  host-clang)   need clang; host_run host-clang clang -O2 -std=c99 $WARN $FP ;;
  host-gcc-c89) need gcc;   host_run host-gcc-c89 gcc -O2 -std=c89 $WARN $FP ;;
  host-cxx)     need g++;   host_run host-cxx g++ -O2 -x c++ -std=c++17 -Wall -Wextra -Werror $FP ;;
  host-fma)
    need gcc clang
    grep -qw fma /proc/cpuinfo || ridgecal_missing_tool "a CPU with FMA" "host-fma needs an x86-64 CPU with FMA"
    host_run host-fma-gcc gcc -O2 -std=gnu99 -march=haswell $WARN $FP
    host_run host-fma-clang clang -O2 -std=c99 -march=haswell $WARN $FP
    # Control: the same build with contraction allowed must differ somewhere in
    # float mode, otherwise this machine/compiler does not exercise the FMA
    # case and the two lines above prove less than they claim. A control that
    # does not build or run, or gives no complete output, fails the test;
    # identical bits in every fixture fail it too.
    differed=0
    for f in $(cat "$fixtures/fixtures.txt"); do
      grep -q "mode=float" "$fixtures/$f/expected.txt" || continue
      exe=$work/control-$f
      if ! gcc -O2 -std=gnu99 -march=haswell -ffp-contract=fast -I"$fixtures/$f" -I"$drv" \
             "$drv/driver.c" "$drv/plat_host.c" -o "$exe" $(libm_for "$f" -lm) 2> "$exe.log"; then
        echo "FAIL control $f: the -ffp-contract=fast build failed:"; sed 's/^/    /' "$exe.log" | head -10
        fail=1; continue
      fi
      if ! "$exe" > "$exe.out" 2>&1 || ! grep -q '^END' "$exe.out"; then
        echo "FAIL control $f: the -ffp-contract=fast build did not run to its END line"; fail=1; continue
      fi
      "$compare" "$fixtures/$f/expected.txt" "$exe.out" > "$exe.cmp" 2>&1
      case $? in
        0) echo "note control $f: -ffp-contract=fast gave identical bits" ;;
        1) echo "OK control $f: with -ffp-contract=fast the bits differ, as expected: $(tail -1 "$exe.cmp")"
           differed=$((differed + 1)) ;;
        *) echo "FAIL control $f: fw_compare could not compare:"; sed 's/^/    /' "$exe.cmp"; fail=1 ;;
      esac
    done
    if [ $differed -eq 0 ]; then
      echo "FAIL control: -ffp-contract=fast changed no float fixture: FMA is not exercised here"; fail=1
    fi ;;
  m0)  need arm-none-eabi-gcc qemu-system-arm; cm_run m0 microbit -mcpu=cortex-m0 -mthumb ;;
  m3)  need arm-none-eabi-gcc qemu-system-arm; cm_run m3 mps2-an385 -mcpu=cortex-m3 -mthumb ;;
  m4f) need arm-none-eabi-gcc qemu-system-arm
       cm_run m4f mps2-an386 -mcpu=cortex-m4 -mthumb -mfpu=fpv4-sp-d16 -mfloat-abi=hard ;;
  m7)  need arm-none-eabi-gcc qemu-system-arm   # double-precision FPU: hardware double
       cm_run m7 mps2-an500 -mcpu=cortex-m7 -mthumb -mfpu=fpv5-d16 -mfloat-abi=hard ;;
  avr)
    need avr-gcc simavr
    AVR="-mmcu=atmega328p -DF_CPU=16000000UL"
    for f in $(cat "$fixtures/fixtures.txt"); do
      o=$work/avr-$f
      if ! { avr-gcc $AVR -O2 -std=c99 $WARN $FP -I"$fixtures/$f" -I"$drv" -c "$drv/driver.c" -o "$o-drv.o" &&
             avr-gcc $AVR -O2 -std=gnu99 -Wall -Wextra -Werror -I"$drv" -c "$drv/plat_avr.c" -o "$o-plat.o" &&
             avr-gcc $AVR -o "$o.elf" "$o-drv.o" "$o-plat.o" $(libm_for "$f" -lm); } 2> "$o.log"; then
        echo "FAIL avr $f: build"; sed 's/^/    /' "$o.log" | head -30; fail=1; continue
      fi
      timeout 60 simavr -m atmega328p -f 16000000 "$o.elf" 2> "$o.sim" > /dev/null
      sed -e 's/\x1b\[[0-9;]*m//g' -e 's/\.$//' "$o.sim" | grep -E '^(P|I|C|V|K|END) ' > "$o.out"
      check avr "$f" "$o.out"
    done ;;
  *) echo "unknown target $target"; exit 2 ;;
esac
if [ $fail -eq 0 ] && [ $missing_newlib -eq 1 ]; then
  ridgecal_missing_tool newlib "libnewlib-arm-none-eabi; run tests/firmware/install-target-tools.sh"
fi
exit $fail
