#!/usr/bin/env bash
# infra.format: every C++ source and header of the project follows the
# committed .clang-format (checked with `clang-format --dry-run --Werror`).
# usage: check_format.sh SOURCE_DIR
# Fix a failure with: clang-format -i FILE (or the command printed below).
set -u
src=$1
. "$(dirname "$0")/need-tool.sh"
fmt=""
for c in clang-format clang-format-14; do
  if command -v "$c" >/dev/null 2>&1; then fmt=$c; break; fi
done
[[ -n $fmt ]] || ridgecal_missing_tool clang-format "apt-get install clang-format"
cd "$src" || exit 1
if git rev-parse --is-inside-work-tree >/dev/null 2>&1; then
  mapfile -t files < <(git ls-files '*.cpp' '*.hpp' | grep -v '^tests/golden/')
else
  mapfile -t files < <(find fitter firmware-export report cli tests bench -name '*.cpp' -o -name '*.hpp' | grep -v '^tests/golden/')
fi
if ((${#files[@]} < 100)); then
  echo "FAIL: only ${#files[@]} C++ files found under $src"
  exit 1
fi
bad=$("$fmt" --dry-run --Werror "${files[@]}" 2>&1 | sed -n 's/^\([^:]*\):[0-9]*:[0-9]*: error:.*/\1/p' | sort -u)
if [[ -n $bad ]]; then
  echo "FAIL: not formatted with .clang-format:"
  echo "$bad"
  echo "fix: $fmt -i $(echo $bad)"
  exit 1
fi
echo "OK: ${#files[@]} C++ files follow .clang-format"
