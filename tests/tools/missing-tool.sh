#!/bin/sh
# missing-tool.sh TOOL [HINT]: stands in for a test that CMake could not build
# because TOOL was missing at configure time. Never passes: fails under
# CI=true, is skipped otherwise (see need-tool.sh).
. "$(dirname "$0")/need-tool.sh"
ridgecal_missing_tool "$@"
