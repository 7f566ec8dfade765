#!/usr/bin/env bash
# Atomic outputs under SIGKILL: `ridgecal fit` runs writing the same record
# are killed with SIGKILL at random moments and just after a write starts,
# and every third run dies inside the write (SIGXFSZ from a file size limit). After every kill the record must be the old complete
# file or the new complete file: it parses, its integrity digest matches, and
# its input SHA-256 is one of the two inputs. Left-over temporary files
# (RECORD.tmp-*) show that a kill hit the write itself; they are counted.
# A run that dies inside the write (SIGXFSZ) must have died of that signal,
# left its temporary file and the OLD record. The SIGKILL rounds must cut a
# write at least once (not guaranteed by the set-up: it shows the timing
# reaches the write), else the test proves less than it claims and fails.
# usage: test_atomic_kill.sh RIDGECAL_BINARY RECORD_CHECK_BINARY [ROUNDS]
set -u
bin=$1 check=$2 rounds=${3:-${RIDGECAL_KILL_ROUNDS:-15}}
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
fails=0 passes=0
ok() { passes=$((passes + 1)); }
bad() { echo "FAIL: $*"; fails=$((fails + 1)); }

# Two runs of 20000 rows (records of about 5 MB), different data.
for v in a b; do
  awk -v seed=$([[ $v == a ]] && echo 1 || echo 2) 'BEGIN { srand(seed); print "setpoint,reading,reference";
    for (i = 0; i < 20000; i++) { s = i % 40; x = 1000 + 50 * s + rand(); printf "S%02d,%.4f,%.6f\n", s, x, 0.02 * x + 0.001 * rand() } }' \
    >"$work/$v.csv"
done
sha_a=$(sha256sum "$work/a.csv" | cut -d' ' -f1)
sha_b=$(sha256sum "$work/b.csv" | cut -d' ' -f1)
# `exec` so that the background job's pid is ridgecal itself, not a shell.
run() { exec "$bin" fit "$work/$1.csv" --setpoint setpoint --degrees 1..3 --timestamp none -o "$work/rec.json" >/dev/null 2>&1; }

# The old file, and the duration of one run in milliseconds.
t0=$(date +%s%N)
(run a) || { echo "FAIL: the first run failed"; exit 1; }
ms=$(( ($(date +%s%N) - t0) / 1000000 ))
echo "atomic_kill: one run takes ${ms} ms; $rounds kills"

killed_in_write=0 sigkill_in_write=0 old=0 new=0
prev=$sha_a
# When the planned rounds end with no SIGKILL inside a write (timing differs
# between builds: a sanitizer build writes more slowly), up to 30 further
# write-triggered rounds run until one does; each is checked like the others.
extra_max=30
for ((i = 1; i <= rounds || (sigkill_in_write == 0 && i <= rounds + extra_max); i++)); do
  # mode 0: file size limit; 1: kill when a write starts; 2: kill at a random moment
  if ((i > rounds)); then mode=1; else mode=$((i % 3)); fi
  v=$([[ $((i % 2)) -eq 0 ]] && echo a || echo b)
  want=$([[ $v == a ]] && echo "$sha_a" || echo "$sha_b")
  if ((mode == 0)); then
    # Every third round dies inside the write for certain: a file size limit
    # below the record's size (~5 MB) kills the process with SIGXFSZ when the
    # write crosses it.
    (ulimit -f $((64 + RANDOM % 4000)); run "$v") &
  else
    (run "$v") &
  fi
  pid=$!
  if ((mode == 0)); then
    :
  elif ((mode == 1)); then
    # Odd rounds: wait until a write starts (a temporary file appears, or the
    # record itself changes, as it would under a writer that is not atomic),
    # then kill within ~10 ms.
    sig=$(stat -c '%i %s %.9Y' "$work/rec.json")
    for ((w = 0; w < 4000; w++)); do
      compgen -G "$work/rec.json.tmp-*" >/dev/null && break
      [[ $(stat -c '%i %s %.9Y' "$work/rec.json" 2>/dev/null) != "$sig" ]] && break
      kill -0 "$pid" 2>/dev/null || break
      sleep 0.001
    done
    ((i > rounds)) || sleep "0.00$((RANDOM % 10))"
  else
    # Other rounds: a random moment between 20% and 120% of a run.
    delay=$(( ms / 5 + RANDOM % (ms + 1) ))
    sleep "$(printf '%d.%03d' $((delay / 1000)) $((delay % 1000)))"
  fi
  ((mode == 0)) || kill -KILL "$pid" 2>/dev/null
  wait "$pid" 2>/dev/null
  status=$?
  out=$("$check" "$work/rec.json")
  sha=${out##* }
  if [[ $out != *" ok "* ]]; then
    bad "round $i: not a complete record: $out"
  elif [[ $sha == "$prev" ]]; then
    ok; old=$((old + 1))
  elif [[ $sha == "$want" ]]; then
    ok; new=$((new + 1))
  else
    bad "round $i: neither the old nor the new record: $out"
  fi
  left=0
  for tmp in "$work"/rec.json.tmp-*; do
    [[ -e $tmp ]] || continue
    left=$((left + 1))
    rm -f "$tmp"
  done
  killed_in_write=$((killed_in_write + left))
  if ((mode == 0)); then
    # Died inside the write: signal SIGXFSZ (exit status 128 + 25), the
    # temporary file left behind, the record still the old one.
    if [[ $status -eq 153 && $left -gt 0 && $sha == "$prev" ]]; then ok
    else bad "round $i (file size limit): status $status (want 153), $left temporary files (want > 0), record $([[ $sha == "$prev" ]] && echo old || echo "not the old one")"; fi
  else
    sigkill_in_write=$((sigkill_in_write + left))
  fi
  prev=$sha
done
echo "atomic_kill: $((i - 1)) rounds ($((i - 1 > rounds ? i - 1 - rounds : 0)) extra); $old left the old record, $new the new one; $killed_in_write kills hit the write" \
  "(temporary file left), $sigkill_in_write of them by SIGKILL"
# The SIGKILL rounds must have cut writes too, else they prove nothing (the
# file-size rounds cut one by construction, and are checked above).
if (( sigkill_in_write > 0 )); then ok; else bad "no SIGKILL hit a write; the timing is off"; fi
echo "atomic_kill: $passes passed, $fails failed"
[[ $fails -eq 0 ]]
