#!/bin/sh
# Browser test of a report (CTest). Usage:
#   browser_test.sh RENDERER RECORD.json OUTDIR   render the record, then check it
#   browser_test.sh --html REPORT.html OUTDIR          check a report made elsewhere
#   browser_test.sh --expect-fail TEXT REPORT.html OUTDIR
#                      the check must reject it (browser_check exit 1) with a
#                      problem that contains TEXT
# Loads the report in headless Chromium with the network off; fails on console
# errors, resource requests or failed loads (browser_check.mjs); prints it to
# PDF on A4 and Letter and requires 1 to 3 pages each (pdfinfo); a first
# argument --max-pages N raises the limit (extended records: more plots), then
# --element SELECTOR screenshots one element to OUTDIR/element.png.
# Needs chromium (or $RIDGECAL_CHROMIUM), node and pdfinfo, which setup.sh test
# installs (install-browser.sh); this test installs nothing. A missing tool is
# named and fails the test under CI=true (skipped otherwise; need-tool.sh).
set -u
here=$(cd "$(dirname "$0")" && pwd)
. "$here/../tools/need-tool.sh"
ridgecal_need_tools "run tests/report/install-browser.sh, as setup.sh test does" \
  "${RIDGECAL_CHROMIUM:-chromium}" node pdfinfo
expect_fail=0
max_pages=3
if [ "${1:-}" = "--max-pages" ]; then
  max_pages=$2
  shift 2
fi
# --element SELECTOR: also screenshot that element (OUTDIR/element.png); fails when none matches.
element=""
if [ "${1:-}" = "--element" ]; then
  element=$2
  shift 2
fi
expect_text=""
if [ "${1:-}" = "--expect-fail" ] || [ "${1:-}" = "--html" ]; then
  if [ "$1" = "--expect-fail" ]; then
    expect_fail=1
    expect_text=$2
    shift
  fi
  shift
  report=$1
  out=$2
  [ -f "$report" ] || { echo "FAIL: no report at $report"; exit 1; }
else
  renderer=$1
  record=$2
  out=$3
  mkdir -p "$out"
  report=$out/report.html
  "$renderer" "$record" "$report" --date "2026-12-02 09:00 UTC" || { echo "FAIL: rendering $record"; exit 1; }
fi
mkdir -p "$out"

node "$here/browser_check.mjs" "$report" "$out" ${element:+"$element"} >"$out/check.log" 2>&1
rc=$?
cat "$out/check.log"
if [ $expect_fail = 1 ]; then
  if [ $rc = 1 ] && grep -qF -- "$expect_text" "$out/check.log"; then
    echo "OK: the broken report was rejected, as it must be, for: $expect_text"
    exit 0
  fi
  echo "FAIL: browser_check should have rejected $report with exit 1 and \"$expect_text\" (exit $rc)"
  exit 1
fi
[ $rc = 0 ] || { echo "FAIL: browser_check exit $rc"; exit 1; }

status=0
if [ -n "$element" ] && [ ! -s "$out/element.png" ]; then
  echo "FAIL: no screenshot of $element"
  status=1
fi
for paper in a4 letter; do
  pages=$(pdfinfo "$out/report-$paper.pdf" 2>/dev/null | sed -n 's/^Pages:[[:space:]]*//p')
  if [ -z "$pages" ]; then
    echo "FAIL: no readable PDF for $paper"
    status=1
  elif [ "$pages" -lt 1 ] || [ "$pages" -gt "$max_pages" ]; then
    echo "FAIL: $paper PDF has $pages pages (expected 1 to $max_pages)"
    status=1
  else
    echo "ok: $paper PDF has $pages page(s)"
  fi
done
exit $status
