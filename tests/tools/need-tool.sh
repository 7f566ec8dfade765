# Sourced by the test scripts (POSIX sh and bash): how a test reports a tool
# it cannot run without. The message always names the tool. Under CI (CI=true)
# the test fails (exit 1); elsewhere it is skipped (exit 77, CTest's
# SKIP_RETURN_CODE), which the test command (tests/run-suite.sh) still treats
# as a failure unless tests/allowed-skips.txt lists the test with a reason.

ridgecal_in_ci() {
  case "${CI:-}" in
    true | TRUE | True | 1 | yes) return 0 ;;
    *) return 1 ;;
  esac
}

# ridgecal_missing_tool TOOL [HINT]: reports TOOL as missing and exits.
ridgecal_missing_tool() {
  echo "MISSING TOOL: $1${2:+ ($2)}"
  if ridgecal_in_ci; then
    echo "FAIL: $1 is missing and CI=true: a test that cannot run fails"
    exit 1
  fi
  echo "SKIP: $1 is missing (a failure under CI=true)"
  exit 77
}

# ridgecal_need_tools HINT TOOL...: every TOOL must be on PATH.
ridgecal_need_tools() {
  _ridgecal_hint=$1
  shift
  for _ridgecal_tool in "$@"; do
    command -v "$_ridgecal_tool" >/dev/null 2>&1 || ridgecal_missing_tool "$_ridgecal_tool" "$_ridgecal_hint"
  done
}
