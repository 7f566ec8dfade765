#!/usr/bin/env bash
# Rewrites tests/golden/outputs/ with the given ridgecal binary. Run it on
# purpose only, when a change of an output is intended, and list and explain
# every difference (git diff tests/golden/outputs) in the commit message.
# usage: tests/golden/regenerate.sh path/to/ridgecal
set -eu
[ $# -eq 1 ] || { echo "usage: $0 path/to/ridgecal" >&2; exit 2; }
HERE=$(cd "$(dirname "$0")" && pwd)
TMP=$(mktemp -d)
trap 'rm -rf "$TMP"' EXIT
"$HERE/golden_cases.sh" "$1" "$TMP/out"
rm -rf "$HERE/outputs"
mv "$TMP/out" "$HERE/outputs"
echo "tests/golden/outputs: $(find "$HERE/outputs" -type f | wc -l) files; review with git diff"
