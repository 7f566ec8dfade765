#!/usr/bin/env bash
# constant-flip.sh TARGET FIXTURE_DIR WORK_DIR [FIXTURE...]
# The self-check of a generated header covers every constant its evaluation
# uses (issue 14). For every fixture header made by fw_fixture:
#   1. the covered list stated above PREFIX_TABLE_CRC32 names every numeric
#      macro and table of the evaluation (flip_constant.py uncovered);
#   2. the intact header's fwt_check_table() says OK on TARGET;
#   3. each covered constant in turn (every table entry too) is changed in a
#      copy of the header, and fwt_check_table() must say CORRUPT for it.
# Without FIXTURE names every fixture of FIXTURE_DIR/fixtures.txt is checked.
# TARGET: host (gcc) or m3 (arm-none-eabi-gcc + qemu-system-arm, Cortex-M3).
# Double headers on a target whose double is not 64-bit would say
# UNCHECKABLE; m3 has a 64-bit double, so every fixture is checked on both.
# Exit 0 pass, 1 fail, 77 a tool is missing (tests/tools/need-tool.sh).
set -u
target=$1; fixtures=$2; work=$3
shift 3
names=("$@")
[[ ${#names[@]} -gt 0 ]] || mapfile -t names <"$fixtures/fixtures.txt"
here=$(cd "$(dirname "$0")" && pwd)
. "$here/../tools/need-tool.sh"
drv=$here/target
need() { ridgecal_need_tools "run tests/firmware/install-target-tools.sh, as setup.sh test does" "$@"; }
case $target in
  host) need gcc python3 ;;
  m3) need arm-none-eabi-gcc qemu-system-arm python3 ;;
  *) echo "unknown target $target"; exit 2 ;;
esac
have_newlib() { [ "$(arm-none-eabi-gcc -print-file-name=libm.a 2>/dev/null)" != "libm.a" ]; }
rm -rf "$work"; mkdir -p "$work"
fail=0 flips=0 caught=0
# The platform object is the same for every header: built once.
case $target in
  host) gcc -O1 -std=c99 -I"$drv" -c "$drv/plat_host.c" -o "$work/plat.o" ;;
  m3) arm-none-eabi-gcc -mcpu=cortex-m3 -mthumb -O2 -std=gnu99 -fno-tree-loop-distribute-patterns \
        -ffunction-sections -I"$drv" -c "$drv/plat_cortexm.c" -o "$work/plat.o" ;;
esac || { echo "FAIL: the platform object does not build"; exit 1; }

# check_one DIR: builds flip_main.c against DIR/fwt_calib.h, runs it, prints its S line
check_one() {
  local dir=$1 libm=""
  grep -q '^#include <math.h>' "$dir/fwt_calib.h" && libm=yes
  case $target in
    host)
      gcc -O1 -std=c99 -ffp-contract=off -I"$dir" -I"$drv" "$drv/flip_main.c" "$work/plat.o" \
        -o "$dir/a.out" ${libm:+-lm} 2>"$dir/build.log" || { echo "BUILD"; return; }
      "$dir/a.out" ;;
    m3)
      local cpu="-mcpu=cortex-m3 -mthumb"
      { arm-none-eabi-gcc $cpu -O1 -std=c99 -ffp-contract=off -ffunction-sections -I"$dir" -I"$drv" \
          -c "$drv/flip_main.c" -o "$dir/m.o" &&
        arm-none-eabi-gcc $cpu -nostdlib -T "$drv/cortexm.ld" -Wl,--gc-sections -o "$dir/a.elf" \
          "$dir/m.o" "$work/plat.o" ${libm:+-lm -lc} -lgcc; } 2>"$dir/build.log" || { echo "BUILD"; return; }
      timeout 60 qemu-system-arm -M mps2-an385 -display none -monitor none -serial none \
        -chardev stdio,id=fwsh -semihosting-config enable=on,target=native,chardev=fwsh \
        -kernel "$dir/a.elf" </dev/null 2>/dev/null ;;
  esac
}

for f in "${names[@]}"; do
  hdr=$fixtures/$f/fwt_calib.h
  if [[ $target == m3 ]] && grep -q '^#include <math.h>' "$hdr" && ! have_newlib; then
    echo "NOT RUN m3 $f: its header needs libm and newlib is missing"; continue
  fi
  missing=$(python3 "$here/flip_constant.py" uncovered "$hdr")
  if [[ -n $missing ]]; then echo "FAIL $f: constants outside the self-check: $missing"; fail=1; fi
  mkdir -p "$work/$f/intact"; cp "$hdr" "$work/$f/intact/"
  got=$(check_one "$work/$f/intact")
  if [[ $got != "S 0" ]]; then
    echo "FAIL $f: the intact header's self-check says '$got', not OK (S 0)"
    sed 's/^/    /' "$work/$f/intact/build.log" 2>/dev/null | head -20; fail=1; continue
  fi
  n=0 bad=0
  while read -r item; do
    d=$work/$f/flip$n; mkdir -p "$d"; n=$((n + 1)); flips=$((flips + 1))
    if ! python3 "$here/flip_constant.py" flip "$hdr" "$item" >"$d/fwt_calib.h"; then
      echo "FAIL $f $item: could not flip"; fail=1; bad=1; continue
    fi
    got=$(check_one "$d")
    if [[ $got == "S 1" ]]; then
      caught=$((caught + 1))
    else
      echo "FAIL $f: $item changed, the self-check says '$got', not CORRUPT (S 1)"
      sed 's/^/    /' "$d/build.log" 2>/dev/null | head -10; fail=1; bad=1
    fi
  done < <(python3 "$here/flip_constant.py" list "$hdr")
  [[ $bad -eq 0 ]] && echo "PASS $target $f: intact OK, $n of $n changed constants caught"
done
echo "constant-flip $target: $caught of $flips changed constants caught"
[[ $flips -gt 0 ]] || { echo "FAIL: no constant flipped"; fail=1; }
exit $fail
