#!/bin/sh
# Browser test of a report (CTest). Usage:
#   browser_test.sh RENDERER RECORD.json OUTDIR   render the record, then check it
#   browser_test.sh --html REPORT.html OUTDIR          check a report made elsewhere
#   browser_test.sh --expect-fail REPORT.html OUTDIR   the check must reject it
# Loads the report in headless Chromium with the network off; fails on console
# errors, resource requests or failed loads (browser_check.mjs); prints it to
# PDF on A4 and Letter and requires 1 to 3 pages each (pdfinfo); a first
# argument --max-pages N raises the limit (extended records: more plots).
# Exit 77 (skip) only when chromium is missing and cannot be installed.
set -u
here=$(cd "$(dirname "$0")" && pwd)
expect_fail=0
max_pages=3
if [ "${1:-}" = "--max-pages" ]; then
  max_pages=$2
  shift 2
fi
if [ "${1:-}" = "--expect-fail" ] || [ "${1:-}" = "--html" ]; then
  [ "$1" = "--expect-fail" ] && expect_fail=1
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

need_install=0
command -v "${RIDGECAL_CHROMIUM:-chromium}" >/dev/null 2>&1 || need_install=1
command -v pdfinfo >/dev/null 2>&1 || need_install=1
command -v node >/dev/null 2>&1 || need_install=1
if [ $need_install = 1 ]; then
  echo "browser_test: chromium, pdfinfo or node missing; trying tests/report/install-browser.sh"
  "$here/install-browser.sh" >"$out/install.log" 2>&1 || true
  if ! command -v "${RIDGECAL_CHROMIUM:-chromium}" >/dev/null 2>&1 || ! command -v pdfinfo >/dev/null 2>&1 ||
     ! command -v node >/dev/null 2>&1; then
    echo "SKIP: chromium/pdfinfo/node could not be installed (see $out/install.log)"
    exit 77
  fi
fi

node "$here/browser_check.mjs" "$report" "$out"
rc=$?
if [ $expect_fail = 1 ]; then
  if [ $rc = 1 ]; then
    echo "OK: the broken report was rejected, as it must be"
    exit 0
  fi
  echo "FAIL: browser_check should have rejected $report (exit $rc)"
  exit 1
fi
[ $rc = 0 ] || { echo "FAIL: browser_check exit $rc"; exit 1; }

status=0
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
