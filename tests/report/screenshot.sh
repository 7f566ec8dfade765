#!/bin/sh
# Screenshot a report as a browser shows it, and optionally its printed pages.
#   tests/report/screenshot.sh REPORT.html OUT.png          full-page screenshot
#   tests/report/screenshot.sh --pages REPORT.html PREFIX   also PREFIX-a4-N.png per printed A4 page
# Needs chromium, node and (for --pages) pdftoppm: tests/report/install-browser.sh.
set -eu
here=$(cd "$(dirname "$0")" && pwd)
pages=0
if [ "${1:-}" = "--pages" ]; then pages=1; shift; fi
[ $# = 2 ] || { sed -n '2,5p' "$0"; exit 2; }
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
node "$here/browser_check.mjs" "$1" "$tmp" || echo "screenshot.sh: the browser check reported problems (see above)" >&2
if [ $pages = 1 ]; then
  cp "$tmp/report.png" "$2-screen.png"
  pdftoppm -png -r 80 "$tmp/report-a4.pdf" "$2-a4"
  cp "$tmp/report-a4.pdf" "$2-a4.pdf"
  echo "wrote $2-screen.png, $2-a4.pdf and $(ls "$2"-a4-*.png | wc -l) page image(s) $2-a4-N.png"
else
  cp "$tmp/report.png" "$2"
  echo "wrote $2"
fi
