#!/usr/bin/env bash
# compare-bound-test.sh FIXTURE_DIR FW_COMPARE WORK_DIR
# fw_compare's bound mode (extended models with ln, "# tol" line) must accept
# a result moved by half the stated bound and reject one moved by 1.5 x the
# bound. Exit 0 pass, 1 fail, 77 without python3.
set -u
fixtures=$1; compare=$2; work=$3
command -v python3 >/dev/null || { echo "SKIP: python3 not found"; exit 77; }
mkdir -p "$work"
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
fail=0
if "$compare" "$exp" "$work/half.txt"; then echo "ok: 0.5 x bound accepted"; else echo "FAIL: 0.5 x bound rejected"; fail=1; fi
if "$compare" "$exp" "$work/over.txt"; then echo "FAIL: 1.5 x bound accepted"; fail=1; else echo "ok: 1.5 x bound rejected"; fi
exit $fail
