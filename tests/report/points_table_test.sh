#!/usr/bin/env bash
# Browser test of the per-point results table (issue 14 item 1): a real fit of
# the NTC sample judged by guarded acceptance with a tolerance chosen so that
# all three outcomes occur (conforms, conformity not shown, does not conform);
# the report must list every point with its outcome, and headless Chromium
# must render the table (OUTDIR/element.png, a screenshot of #points-table).
# Then the same record, modified and opened with --allow-modified, must show
# no PASS/FAIL and mark the stored figures as not trustworthy (item 9).
# usage: points_table_test.sh RIDGECAL_BINARY SAMPLES_DIR OUTDIR
set -u
bin=$1 samples=$2 out=$3
here=$(cd "$(dirname "$0")" && pwd)
. "$here/../tools/need-tool.sh"
ridgecal_need_tools "run tests/report/install-browser.sh, as setup.sh test does" \
  "${RIDGECAL_CHROMIUM:-chromium}" node pdfinfo python3
rm -rf "$out" && mkdir -p "$out"
fails=0
bad() { echo "FAIL: $*"; fails=$((fails + 1)); }
sample=$samples/ntc-coldstore/ntc-coldstore.csv
common=(--setpoint setpoint --sensor "cold-store NTC ch2" --reading-unit counts --reference-unit degC
  --ref-uncertainty 0.005 --ref-k 2 --resolution 1 --timestamp 2026-12-02T09:00:00Z)
# Find a tolerance between the errors: the median |error| of the training and
# test points of a first fit, so that some points lie beyond it, some inside
# the guard band and some well inside.
"$bin" fit "$sample" "${common[@]}" --tol-offset 1 -o "$out/probe.json" >/dev/null 2>&1 ||
  bad "probe fit exit $?"
tol=$(python3 - "$out/probe.json" <<'PY'
import json, sys
# U at each point does not depend on the tolerance: try limits between the
# errors until guarded acceptance gives all three outcomes.
pts = [p for p in json.load(open(sys.argv[1]))["decision"]["points"] if p["set"] != "validation"]
for t in sorted(abs(p["error"]) + p["uncertainty"] for p in pts):
    e = [abs(p["error"]) for p in pts]
    ok = sum(x <= t - p["uncertainty"] for x, p in zip(e, pts))
    out = sum(x > t for x in e)
    if ok and out and ok + out < len(pts):
        print(f"{t:.6g}")
        break
PY
)
"$bin" fit "$sample" "${common[@]}" --tol-offset "$tol" --decision guarded -o "$out/rec.json" \
  --report "$out/points.html" >"$out/fit.stdout" 2>&1
[ $? = 1 ] || bad "guarded fit at $tol should exit 1: $(cat "$out/fit.stdout")"
for cls in conf-ok conf-not-shown conf-fail; do
  n=$(grep -c "<tr class=\"$cls\">" "$out/points.html")
  [ "$n" -gt 0 ] || bad "no row of class $cls at tolerance $tol"
done
rows=$(grep -c '<tr class="conf-' "$out/points.html")
[ "$rows" = 60 ] || bad "the table lists $rows points, not the 60 of the sample"
grep -q '<td class="conf">not shown: guard band</td>' "$out/points.html" ||
  bad "the guard-band outcome is not stated"
python3 "$here/check_report.py" "$out/points.html" || bad "the report fails the structural check"
# The table makes the report longer: up to 5 printed pages with 60 points.
"$here/browser_test.sh" --max-pages 5 --element '#points-table' --html "$out/points.html" "$out/browser" ||
  bad "browser check of the per-point table"

# Item 9: a modified record opened with --allow-modified.
sed 's/"tool_version": "/"tool_version": "x/' "$out/rec.json" >"$out/mod.json"
"$bin" report "$out/mod.json" -o "$out/mod.html" --allow-modified >/dev/null 2>&1 || bad "report --allow-modified exit $?"
grep -q 'class="verdict modified"' "$out/mod.html" || bad "modified: the verdict box does not say so"
grep -q 'does not match its integrity digest' "$out/mod.html" || bad "modified: no mismatch statement"
grep -Eq '<div class="word">(PASS|FAIL|UNDECIDED)' "$out/mod.html" && bad "modified: a verdict from stored data is shown"
[ "$(grep -c 'Not trustworthy' "$out/mod.html")" -ge 2 ] || bad "modified: stored metrics are not marked"
"$here/browser_test.sh" --max-pages 5 --element '#verdict' --html "$out/mod.html" "$out/browser_mod" ||
  bad "browser check of the modified record's verdict box"

echo "points table: $fails problem(s)"
[ $fails = 0 ]
