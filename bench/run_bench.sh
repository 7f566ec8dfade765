#!/usr/bin/env bash
# ridgecal batch benchmark: kernels (Google Benchmark), the whole `ridgecal
# batch` process, and the Python baselines (numpy SVD path, scikit-learn
# GridSearchCV), side by side in one run, with the ratios against the targets
# of issue 6. Workload: synthetic 48-row units (12 setpoints x 4 repeats),
# degrees 1..8, lambda 0 + 30 log-spaced values, grouped 5-fold CV.
#
# usage: bench/run_bench.sh [BUILD_DIR]       (default: build-bench)
# env:   UNITS (20000) units for the batch runs, REC_UNITS (2000) for the
#        runs that also write records, BIG_UNITS (100000) for the
#        memory run, SK_UNITS (3) scikit-learn units, NP_UNITS (500) numpy
#        units, PY (/usr/bin/python3, needs python3-numpy python3-sklearn).
set -euo pipefail
SRC=$(cd "$(dirname "$0")/.." && pwd)
BUILD=${1:-$SRC/build-bench}
UNITS=${UNITS:-20000}
REC_UNITS=${REC_UNITS:-2000}
BIG_UNITS=${BIG_UNITS:-100000}
SK_UNITS=${SK_UNITS:-3}
NP_UNITS=${NP_UNITS:-500}
PY=${PY:-/usr/bin/python3}
WORK=$(mktemp -d)
trap 'rm -rf "$WORK"' EXIT
export OPENBLAS_NUM_THREADS=1 OMP_NUM_THREADS=1 MKL_NUM_THREADS=1

cmake -S "$SRC" -B "$BUILD" -G Ninja -DCMAKE_BUILD_TYPE=Release -DRIDGECAL_BUILD_BENCH=ON -DRIDGECAL_BUILD_TESTS=OFF >/dev/null
cmake --build "$BUILD" -j2 >/dev/null
RC="$BUILD/cli/ridgecal"
GEN="$BUILD/bench/ridgecal_bench_gen"

echo "== machine: $(getconf _NPROCESSORS_ONLN) cores; load at start: $(cut -d' ' -f1-3 /proc/loadavg)"
"$GEN" "$UNITS" > "$WORK/units.csv"
"$GEN" "$REC_UNITS" > "$WORK/rec_units.csv"
"$GEN" 1 100 20 > "$WORK/big.csv"          # one unit of 2,000 rows
"$GEN" "$BIG_UNITS" > "$WORK/many.csv"

echo "== kernels (Google Benchmark)"
"$BUILD/bench/ridgecal_bench_kernels" --benchmark_min_time=2 --benchmark_repetitions=3 \
  --benchmark_report_aggregates_only=true --benchmark_out="$WORK/kernels.json" --benchmark_out_format=json \
  | grep -E "^(BM_|-|Benchmark)" || true

FIT="--unit unit --setpoint setpoint --degrees 1..8 --folds 5 --loso-below 0 --timestamp none --progress none"
run_batch() {  # file jobs extra-args -> "wall_s maxrss_kib user_s sys_s"
  local file=$1 jobs=$2; shift 2
  rm -rf "$WORK/out"
  /usr/bin/time -f "%e %M %U %S" -o "$WORK/time" "$RC" batch "$file" $FIT -o "$WORK/out" -j "$jobs" "$@" >/dev/null 2>&1
  cat "$WORK/time"
}
echo "== whole process: ridgecal batch on $UNITS units (summaries only), $REC_UNITS units (with records)"
B1=$(run_batch "$WORK/units.csv" 1 --no-records); B2=$(run_batch "$WORK/units.csv" 2 --no-records)
R1=$(run_batch "$WORK/rec_units.csv" 1 --no-sync); R2=$(run_batch "$WORK/rec_units.csv" 2 --no-sync)
rm -rf "$WORK/out"
/usr/bin/time -f "%e %M %U %S" -o "$WORK/time" "$RC" batch "$WORK/many.csv" $FIT -o "$WORK/out" -j 2 --no-records >/dev/null 2>&1
M=$(cat "$WORK/time")

echo "== Python baselines (numpy $NP_UNITS units, scikit-learn $SK_UNITS units)"
"$PY" "$SRC/bench/python_baseline.py" "$WORK/units.csv" "$WORK/big.csv" \
  --numpy-units "$NP_UNITS" --sklearn-units "$SK_UNITS" > "$WORK/py.json"

echo "== load at end: $(cut -d' ' -f1-3 /proc/loadavg)"
"$PY" - "$WORK/kernels.json" "$WORK/py.json" "$UNITS" "$BIG_UNITS" "$B1" "$B2" "$R1" "$R2" "$M" "$REC_UNITS" <<'PYEOF'
import json, sys
k = json.load(open(sys.argv[1])); py = json.load(open(sys.argv[2]))
units, big_units = int(sys.argv[3]), int(sys.argv[4])
b1, b2, r1, r2, m = (tuple(float(v) for v in a.split()) for a in sys.argv[5:10])
rec_units = int(sys.argv[10])
def median(name):
    for b in k["benchmarks"]:
        if b["name"] == name + "_median":
            return b
    raise KeyError(name)
u1 = median("BM_FitUnit48/real_time")
u2 = median("BM_FitUnit48/real_time/threads:2")
big = median("BM_Fit2000/real_time")
k1 = u1["items_per_second"]; k2 = u2["items_per_second"]
big_ms = big["real_time"] * {"ms": 1, "us": 1e-3, "ns": 1e-6}[big["time_unit"]]
np_rate = 1.0 / py["numpy_s_per_unit"]; np_big_ms = py["numpy_big_s"] * 1e3
sk = py.get("sklearn_s_per_unit")
cpu1 = 1e6 / u1["cpu_time"] * {"us": 1, "ms": 1e-3, "ns": 1e3}[u1["time_unit"]]  # units per CPU-second
per_cpu = lambda t: units / (t[2] + t[3])
rows = [
    # name, wall-clock value, per-CPU-second value, target, met (wall), ratio vs numpy (wall)
    ("fit kernel, 1 thread (units/s)", k1, cpu1, ">= 7000", k1 >= 7000, k1 / np_rate),
    ("fit kernel, 2 threads (units/s)", k2, None, ">= 12000", k2 >= 12000, k2 / np_rate),
    ("ridgecal batch -j1, summaries only (units/s)", units / b1[0], per_cpu(b1), ">= 7000", units / b1[0] >= 7000, units / b1[0] / np_rate),
    ("ridgecal batch -j2, summaries only (units/s)", units / b2[0], None, ">= 12000", units / b2[0] >= 12000, units / b2[0] / np_rate),
    ("ridgecal batch -j1, + records, no fsync (units/s)", rec_units / r1[0], rec_units / (r1[2] + r1[3]), "", None, rec_units / r1[0] / np_rate),
    ("ridgecal batch -j2, + records, no fsync (units/s)", rec_units / r2[0], None, "", None, rec_units / r2[0] / np_rate),
    ("2,000-row fit (ms)", big_ms, big["cpu_time"] * {"ms": 1, "us": 1e-3, "ns": 1e-6}[big["time_unit"]], "<= 4", big_ms <= 4, np_big_ms / big_ms),
    (f"peak RSS, {big_units} units, -j2 (MiB)", m[1] / 1024, None, "< 64", m[1] / 1024 < 64, None),
]
print()
print("wall: elapsed-time figure (what the targets mean); cpu: the same per CPU-second of the process")
print("(load-independent when other jobs share the cores). Ratios are wall against wall.")
print(f"{'measure':52s} {'wall':>10s} {'cpu':>10s} {'target':>9s} {'met':>4s} {'vs numpy':>9s}")
for name, v, c, tgt, ok, ratio in rows:
    print(f"{name:52s} {v:10.1f} {'' if c is None else f'{c:10.1f}':>10s} {tgt:>9s} "
          f"{('' if ok is None else ('yes' if ok else 'NO')):>4s} {'' if ratio is None else f'{ratio:8.1f}x':>9s}")
print()
np_cpu = py["numpy_cpu_s_per_unit"]
print(f"numpy SVD path: {np_rate:8.0f} units/s wall ({py['numpy_s_per_unit']*1e3:.3f} ms/unit; "
      f"{np_cpu*1e3:.3f} ms CPU/unit), 2,000-row fit {np_big_ms:.1f} ms wall, {py['numpy_big_cpu_s']*1e3:.1f} ms CPU")
print(f"  per CPU-second: ridgecal kernel {cpu1 * np_cpu:.1f}x numpy, ridgecal batch -j1 {per_cpu(b1) * np_cpu:.1f}x numpy")
if sk:
    print(f"scikit-learn GridSearchCV: {sk:.3f} s/unit wall, {py['sklearn_cpu_s_per_unit']:.3f} s CPU/unit; "
          f"ridgecal kernel {sk * k1:,.0f}x faster (wall), {py['sklearn_cpu_s_per_unit'] * cpu1:,.0f}x (CPU)")
print(f"arithmetic estimate of the issue (0.09 ms/unit): kernel at {1e6 / k1 / 90:.2f}x of it (wall), "
      f"{1e6 / cpu1 / 90:.2f}x (CPU)")
PYEOF
