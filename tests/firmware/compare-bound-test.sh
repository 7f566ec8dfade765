#!/usr/bin/env bash
# compare-bound-test.sh MODE FIXTURE_DIR FW_COMPARE WORK_DIR
# fw_compare must be able to fail, and fail the right way:
#   one_bit            a copy of a float fixture's expected output with one bit
#                      flipped in line 3 is rejected: exit 1, "1 differing",
#                      the line named ("line 3:"); the unchanged copy passes.
#   beyond_log_bound   bound mode (extended models with ln, "# tol" line): a
#                      result moved by half the stated bound is accepted (exit 0,
#                      "0 differing"); one moved by 1.5 x the bound is rejected
#                      (exit 1, "1 differing").
# Any other exit (a crash is 134/139, a usage error 2) fails this test.
# Exit 0 pass, 1 fail.
set -u
mode=$1 fixtures=$2 compare=$3 work=$4
here=$(cd "$(dirname "$0")" && pwd)
. "$here/../tools/need-tool.sh"
ridgecal_need_tools "apt-get install python3" python3
rm -rf "$work" && mkdir -p "$work"
fail=0

# expect WANT_RC WANT_TEXT EXPECTED ACTUAL WHAT: runs fw_compare and checks both.
expect() {
  local want_rc=$1 want_text=$2 exp=$3 act=$4 what=$5
  "$compare" "$exp" "$act" >"$work/out" 2>&1
  local rc=$?
  if [[ $rc -eq $want_rc ]] && grep -qF -- "$want_text" "$work/out"; then
    echo "ok: $what (exit $rc, \"$want_text\")"
  else
    echo "FAIL: $what: exit $rc (expected $want_rc with \"$want_text\"):"
    sed 's/^/    /' "$work/out"
    fail=1
  fi
}

case $mode in
  one_bit)
    exp=$fixtures/ntc_float/expected.txt
    sed '3{s/0$/#/;s/[1-9a-f]$/0/;s/#$/1/}' "$exp" >"$work/flipped.txt" || exit 1
    if cmp -s "$exp" "$work/flipped.txt"; then echo "FAIL: the bit flip changed nothing"; exit 1; fi
    expect 0 "0 differing" "$exp" "$exp" "the unchanged output is accepted"
    expect 1 "1 differing" "$exp" "$work/flipped.txt" "one flipped bit is rejected"
    expect 1 "line 3:" "$exp" "$work/flipped.txt" "the rejection names the line"
    ;;
  beyond_log_bound)
    exp=$fixtures/shntc_float/expected.txt
    move() {  # move FACTOR OUT: shifts the result of the first V line by FACTOR x bound
      python3 - "$exp" "$1" "$2" <<'PY'
import struct, sys
lines = open(sys.argv[1]).read().splitlines()
tol = float(lines[0].split()[2])
out = []
done = False
for l in lines[1:]:
    f = l.split()
    if not done and f[0] == "V":
        y = struct.unpack("<f", struct.pack("<I", int(f[-1], 16)))[0] + float(sys.argv[2]) * tol
        f[-1] = "%08x" % struct.unpack("<I", struct.pack("<f", y))[0]
        l = " ".join(f)
        done = True
    out.append(l)
open(sys.argv[3], "w").write("\n".join(out) + "\n")
PY
    }
    move 0.5 "$work/half.txt" && move 1.5 "$work/over.txt" || exit 1
    expect 0 "0 differing" "$exp" "$work/half.txt" "0.5 x bound accepted"
    expect 1 "1 differing" "$exp" "$work/over.txt" "1.5 x bound rejected"
    ;;
  *) echo "usage: compare-bound-test.sh one_bit|beyond_log_bound FIXTURE_DIR FW_COMPARE WORK_DIR"; exit 2 ;;
esac
exit $fail
