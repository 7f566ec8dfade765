#!/usr/bin/env bash
# End to end: `ridgecal fit --report` and `ridgecal report` on a bundled sample;
# both reports pass the structural check; bad input exits 2 and writes nothing.
# usage: test_cli_report.sh RIDGECAL_BINARY SAMPLES_DIR OUTDIR
set -u
bin=$1 samples=$2 out=$3
here=$(cd "$(dirname "$0")" && pwd)
. "$here/../tools/need-tool.sh"
ridgecal_need_tools "apt-get install python3" python3
rm -rf "$out" && mkdir -p "$out"
fails=0
bad() { echo "FAIL: $*"; fails=$((fails + 1)); }

sample=$samples/ntc-coldstore/ntc-coldstore.csv
"$bin" fit "$sample" --setpoint setpoint --sensor "cold-store NTC ch2 <test>" --reading-unit counts \
  --reference-unit degC --tol-offset 0.1 --decision guarded --timestamp 2026-12-02T09:00:00Z \
  -o "$out/ntc.record.json" --report "$out/ntc.fit.html" \
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
grep -q 'class="verdict pass"' "$out/ntc.fit.html" || bad "fit report: PASS verdict not shown"
grep -q 'guarded acceptance' "$out/ntc.fit.html" || bad "fit report: decision rule not shown"
grep -q '>acceptance limit (tolerance' "$out/ntc.fit.html" || bad "fit report: acceptance limits not drawn"
grep -q '<dd>2026-12-02T09:00:00Z</dd>' "$out/ntc.fit.html" || bad "fit report: record date not shown"

# An extended record: the pressure demo (second input), with the uncertainty
# budget and guarded acceptance; the report shows the residual views.
pt=$samples/pressure-tempco/pressure-tempco.csv
"$bin" fit "$pt" --setpoint setpoint --aux temperature --aux-setpoint chamber --aux-degree 0..3 \
  --sensor "PT-7 <rig>" --reading-unit counts --reference-unit bar --tol-offset 0.01 --decision guarded \
  --ref-uncertainty 0.0005 --timestamp 2026-12-02T09:00:00Z -o "$out/pt.record.json" --report "$out/pt.fit.html" \
  >"$out/pt.stdout" 2>&1 || bad "pressure fit --report exit $?: $(cat "$out/pt.stdout")"
python3 "$here/check_report.py" "$out/pt.fit.html" || bad "pt.fit.html failed the structural check"
for id in fig-fit fig-resid-reading fig-resid-aux fig-resid-map fig-validation-cv; do
  grep -q "id=\"$id\"" "$out/pt.fit.html" || bad "pressure report: no $id"
done
grep -q 'PT-7 &lt;rig&gt;' "$out/pt.fit.html" || bad "pressure report: sensor name not shown escaped"
grep -q 'guarded acceptance' "$out/pt.fit.html" || bad "pressure report: decision rule not shown"
grep -q '<th>uncertainty component</th>' "$out/pt.fit.html" || bad "pressure report: no uncertainty budget"
grep -q '<b>both</b> inputs' "$out/pt.fit.html" || bad "pressure report: no caution about both inputs"

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
