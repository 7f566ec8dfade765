#!/usr/bin/env bash
# End to end: `ridgecal fit --report` and `ridgecal report` on a bundled sample;
# both reports pass the structural check; bad input exits 2 and writes nothing.
# usage: test_cli_report.sh RIDGECAL_BINARY SAMPLES_DIR OUTDIR
set -u
bin=$1 samples=$2 out=$3
here=$(cd "$(dirname "$0")" && pwd)
rm -rf "$out" && mkdir -p "$out"
fails=0
bad() { echo "FAIL: $*"; fails=$((fails + 1)); }

sample=$samples/ntc-coldstore/ntc-coldstore.csv
"$bin" fit "$sample" --setpoint setpoint --sensor "cold-store NTC ch2 <test>" --reading-unit counts \
  --reference-unit degC --timestamp 2026-12-02T09:00:00Z -o "$out/ntc.record.json" --report "$out/ntc.fit.html" \
  >"$out/fit.stdout" 2>&1 || bad "fit --report exit $?: $(cat "$out/fit.stdout")"
grep -q "report: $out/ntc.fit.html" "$out/fit.stdout" || bad "fit did not announce the report"
"$bin" report "$out/ntc.record.json" -o "$out/ntc.report.html" --date "2026-12-02 10:00 UTC" >/dev/null ||
  bad "report exit $?"
for f in ntc.fit.html ntc.report.html; do
  python3 "$here/check_report.py" "$out/$f" || bad "$f failed the structural check"
  grep -q 'cold-store NTC ch2 &lt;test&gt;' "$out/$f" || bad "$f: sensor name not shown escaped"
  grep -q '<b>(verified)</b>' "$out/$f" || bad "$f: integrity not confirmed"
done
grep -q '<dd>2026-12-02 10:00 UTC</dd>' "$out/ntc.report.html" || bad "--date not shown"
grep -q '<dd>2026-12-02T09:00:00Z</dd>' "$out/ntc.fit.html" || bad "fit report: record date not shown"

# Bad input: exit 2, nothing written, an existing report untouched.
echo old >"$out/keep.html"
for args in "$out/missing.json -o $out/keep.html" "$sample -o $out/keep.html" "$out/ntc.record.json" \
            "$out/ntc.record.json -o $out/keep.html --no-such-option"; do
  # shellcheck disable=SC2086
  "$bin" report $args >/dev/null 2>"$out/err"
  rc=$?
  [[ $rc -eq 2 ]] || bad "report $args: exit $rc, expected 2"
  [[ $(cat "$out/keep.html") == old ]] || bad "report $args: overwrote the existing report"
done
ls "$out" | grep -q 'tmp-' && bad "a temporary file was left behind"

# A fit that fails writes neither record nor report.
"$bin" fit "$out/missing.csv" -o "$out/none.json" --report "$out/none.html" >/dev/null 2>&1
[[ $? -eq 2 ]] || bad "fit on a missing file did not exit 2"
[[ -e $out/none.json || -e $out/none.html ]] && bad "failed fit wrote a file"

if ((fails)); then echo "$fails check(s) failed"; exit 1; fi
echo "ok: fit --report and report write well-formed reports; bad input exits 2 and writes nothing"
