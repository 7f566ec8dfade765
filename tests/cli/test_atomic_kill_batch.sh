#!/usr/bin/env bash
# Atomic outputs of `ridgecal batch` under SIGKILL. Two complete reference runs
# (data a, then data b, same unit names) give the old and the new version of
# every output: records/UNIT.json, reports/UNIT.html, headers/UNIT.h,
# summary.csv and summary.json. Then batches alternating between a and b are
# killed with SIGKILL at random moments, and every third one dies inside a
# write (SIGXFSZ from a file size limit). After every kill each output file
# must be byte-identical to its complete a-version or its complete b-version:
# never truncated, never mixed, never missing. Left-over temporary files
# (*.tmp-*) show that a kill hit a write; there must be some, else the timing
# proves nothing. Then batches are stopped with SIGINT and SIGTERM, which must
# stop them cleanly with a partial summary (see the section below).
# usage: test_atomic_kill_batch.sh RIDGECAL_BINARY [ROUNDS]
set -u
bin=$1 rounds=${2:-${RIDGECAL_KILL_ROUNDS:-12}}
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
fails=0 passes=0
ok() { passes=$((passes + 1)); }
bad() { echo "FAIL: $*"; fails=$((fails + 1)); }

units=60
for v in a b; do
  awk -v seed=$([[ $v == a ]] && echo 1 || echo 2) -v n=$units 'BEGIN { srand(seed); print "unit,setpoint,reading,reference";
    for (u = 0; u < n; u++) for (s = 0; s < 12; s++) for (r = 0; r < 4; r++) {
      x = 1000 + 400 * s + rand(); printf "U%03d,S%02d,%.4f,%.6f\n", u, s, x, 0.02 * x + 1e-6 * x * x + 0.01 * rand() } }' \
    >"$work/$v.csv"
done
# `exec` so that the background job's pid is ridgecal itself, not a shell.
# The output directory is always the same path, so that the reference runs'
# files are what a run writes there (nothing in them names another path).
run() {
  exec "$bin" batch "$work/$1.csv" --unit unit --setpoint setpoint -o "$work/out" --timestamp none --progress none \
    --reports --headers unitcal --tol-offset 0.5 -j 2 >/dev/null 2>&1
}

# Reference runs: the complete a-version and b-version of every output.
t0=$(date +%s%N)
(run a) || { echo "FAIL: reference run a failed"; exit 1; }
ms=$(( ($(date +%s%N) - t0) / 1000000 ))
cp -a "$work/out" "$work/ref-a"
(run b) || { echo "FAIL: reference run b failed"; exit 1; }
cp -a "$work/out" "$work/ref-b"
nfiles=$(cd "$work/ref-a" && find . -type f | wc -l)
[[ $nfiles -eq $((3 * units + 2)) ]] || { echo "FAIL: reference run wrote $nfiles files"; exit 1; }
(cd "$work/ref-a" && find . -type f | LC_ALL=C sort) >"$work/files"
differ=0
while read -r f; do cmp -s "$work/ref-a/$f" "$work/ref-b/$f" || differ=$((differ + 1)); done <"$work/files"
# Every output must differ between a and b, else "old or new" could not be told apart.
[[ $differ -eq $nfiles ]] || { echo "FAIL: only $differ of $nfiles outputs differ between the reference runs"; exit 1; }
echo "atomic_kill_batch: one run of $units units takes ${ms} ms and writes $nfiles files; $rounds kills"

killed_in_write=0 mixed=0
for ((i = 1; i <= rounds; i++)); do
  v=$([[ $((i % 2)) -eq 0 ]] && echo b || echo a)
  if ((i % 3 == 0)); then
    # Dies for certain inside a write: a file size limit (in KiB) below the
    # size of the summary at the end of the run, and often below a report's.
    (ulimit -f $((8 + RANDOM % 120)); run "$v") &
  else
    (run "$v") &
  fi
  pid=$!
  if ((i % 3 != 0)); then
    delay=$(( ms / 10 + RANDOM % (ms + 1) ))
    sleep "$(printf '%d.%03d' $((delay / 1000)) $((delay % 1000)))"
    kill -KILL "$pid" 2>/dev/null
  fi
  wait "$pid" 2>/dev/null
  na=0 nb=0 round_bad=0
  while read -r f; do
    if [[ ! -e $work/out/$f ]]; then
      bad "round $i: $f is missing"; round_bad=1
    elif cmp -s "$work/out/$f" "$work/ref-a/$f"; then
      na=$((na + 1))
    elif cmp -s "$work/out/$f" "$work/ref-b/$f"; then
      nb=$((nb + 1))
    else
      bad "round $i: $f is neither the complete old nor the complete new file ($(wc -c <"$work/out/$f") bytes)"; round_bad=1
    fi
  done <"$work/files"
  ((round_bad)) || ok
  ((na > 0 && nb > 0)) && mixed=$((mixed + 1))
  # (the summaries are streamed into temporary files until the batch ends, so
  # only temporary records, reports and headers count as a kill inside a write)
  while read -r tmp; do
    [[ $tmp == */records/* || $tmp == */reports/* || $tmp == */headers/* ]] && killed_in_write=$((killed_in_write + 1))
    rm -f "$tmp"
  done < <(find "$work/out" -name '*.tmp-*')
  # (a SIGKILL leaves the lock file .ridgecal.lock: harmless, the lock dies with the process)
  extra=$(cd "$work/out" && find . -type f ! -name .ridgecal.lock | LC_ALL=C sort | comm -13 "$work/files" -)
  [[ -z $extra ]] || bad "round $i: unexpected files: $extra"
done
echo "atomic_kill_batch: $mixed rounds were cut with outputs of both runs; $killed_in_write temporary records, reports or headers were left by kills inside their write"
if ((killed_in_write > 0)); then ok; else bad "no kill hit a write; the timing is off"; fi
if ((mixed > 0)); then ok; else bad "no kill cut a batch in the middle; the timing is off"; fi

# SIGINT and SIGTERM (issue 15 item 7): a clean stop. Exit 130 / 143 (or 0
# when the batch ended first; a signal before ridgecal installs its handler,
# or after it restored it, kills it, and then the summaries are a complete
# version), no temporary file left, summaries marked
# partial that list exactly the units completed: each listed unit's record,
# report and header is the complete version of this run; every other file is
# the complete version of one of the runs.
stopped=0 outside=0
for ((i = 1; i <= rounds; i++)); do
  v=$([[ $((i % 2)) -eq 0 ]] && echo b || echo a)
  sig=$([[ $((i % 2)) -eq 0 ]] && echo TERM || echo INT)
  want=$([[ $sig == INT ]] && echo 130 || echo 143)
  (run "$v") &
  pid=$!
  delay=$(( ms / 10 + RANDOM % (ms + 1) ))
  sleep "$(printf '%d.%03d' $((delay / 1000)) $((delay % 1000)))"
  kill -$sig "$pid" 2>/dev/null
  wait "$pid"; rc=$?
  round_bad=0
  if [[ $rc -ne $want && $rc -ne 0 ]]; then bad "SIG$sig round $i: exit $rc, not $want"; round_bad=1; fi
  tmps=$(find "$work/out" -name '*.tmp-*' | wc -l)
  if [[ $tmps -ne 0 ]]; then bad "SIG$sig round $i: $tmps temporary files left"; round_bad=1; fi
  find "$work/out" -name '*.tmp-*' -delete
  partial=0
  grep -q '"partial": {"signal"' "$work/out/summary.json" && partial=1
  if [[ $rc -eq $want && $partial -eq 0 ]]; then
    # The signal landed outside the handler's lifetime: before ridgecal
    # installed it (process start-up, slow under ASan) or after the batch had
    # finished. The default action killed the process; the summaries must then
    # be one complete version, like every other file.
    outside=$((outside + 1))
    for f in summary.json summary.csv; do
      cmp -s "$work/out/$f" "$work/ref-a/$f" || cmp -s "$work/out/$f" "$work/ref-b/$f" ||
        { bad "SIG$sig round $i: exit $rc without a partial summary, and $f is neither complete version"; round_bad=1; }
    done
  elif [[ $rc -eq $want ]]; then
    stopped=$((stopped + 1))
    grep -q "\"partial\": {\"signal\": \"SIG$sig\"" "$work/out/summary.json" ||
      { bad "SIG$sig round $i: summary.json is not marked partial"; round_bad=1; }
    listed=$(grep -v '^#' "$work/out/summary.csv" | tail -n +2 | cut -d, -f1)
    n=$(echo "$listed" | grep -c .)
    grep -q "^# partial: interrupted by SIG$sig after $n units" "$work/out/summary.csv" ||
      { bad "SIG$sig round $i: summary.csv does not say it is partial after $n units"; round_bad=1; }
    for u in $listed; do
      for f in records/$u.json reports/$u.html headers/$u.h; do
        cmp -s "$work/out/$f" "$work/ref-$v/$f" || { bad "SIG$sig round $i: listed $f is not this run's"; round_bad=1; }
      done
    done
  fi
  while read -r f; do
    [[ $f == ./summary.* && $rc -eq $want ]] && continue
    if [[ ! -e $work/out/$f ]]; then
      bad "SIG$sig round $i: $f is missing"; round_bad=1
    elif ! cmp -s "$work/out/$f" "$work/ref-a/$f" && ! cmp -s "$work/out/$f" "$work/ref-b/$f"; then
      bad "SIG$sig round $i: $f is neither complete version"; round_bad=1
    fi
  done <"$work/files"
  ((round_bad)) || ok
done
echo "atomic_kill_batch: $stopped of $rounds SIGINT/SIGTERM rounds stopped a batch in the middle; $outside landed before or after the handler's lifetime"
if ((stopped > 0)); then ok; else bad "no SIGINT/SIGTERM hit a running batch; the timing is off"; fi
echo "atomic_kill_batch: $passes passed, $fails failed"
[[ $fails -eq 0 ]]
