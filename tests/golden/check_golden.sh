#!/usr/bin/env bash
# CTest test golden.outputs: regenerates every golden output with the built
# binary into a fresh temporary directory and compares it byte for byte with
# tests/golden/outputs/, printing a unified diff of each file that differs.
# It never rewrites the golden files (regenerate.sh does, on purpose).
# usage: check_golden.sh RIDGECAL
set -u
HERE=$(cd "$(dirname "$0")" && pwd)
TMP=$(mktemp -d)
trap 'rm -rf "$TMP"' EXIT
"$HERE/golden_cases.sh" "$1" "$TMP/out" || { echo "FAIL: golden_cases.sh exited $?"; exit 1; }
if diff -r -u "$HERE/outputs" "$TMP/out" >"$TMP/diff.txt"; then
  echo "golden outputs: $(find "$HERE/outputs" -type f | wc -l) files identical"
  exit 0
fi
echo "FAIL: outputs differ from tests/golden/outputs (regenerate on purpose with tests/golden/regenerate.sh"
echo "and explain each difference in the commit):"
head -c 200000 "$TMP/diff.txt"
exit 1
