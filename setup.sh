#!/usr/bin/env bash
# ridgecal set-up on Debian 12, as root (or with sudo available).
#
#   bash setup.sh demo   install what is missing, build, fit a bundled sample
#   bash setup.sh test   install what is missing (every tool the tests need),
#                        build, run the whole test suite, then the sanitizer
#                        suite (ASan+UBSan build in build-asan) and the fuzzers
#                        (clang build in build-fuzz); see docs/robustness.md.
#                        Fails when any test fails or is skipped, unless the
#                        skipped test is listed in tests/allowed-skips.txt
#                        (tests/run-suite.sh; the list is empty in the repo).
#
# Environment: BUILD_DIR (default: build), JOBS (default: number of cores),
# RIDGECAL_FUZZ_SECONDS (default 60, per fuzzer), RIDGECAL_SKIP_ASAN=1 and
# RIDGECAL_SKIP_FUZZ=1 to skip those stages locally (CI runs them).
set -euo pipefail
cd "$(dirname "$0")"
mode=${1:-demo}
build=${BUILD_DIR:-build}
jobs=${JOBS:-$(nproc)}

# Packages for building and running ridgecal.
base_pkgs=(g++ cmake ninja-build pkg-config libeigen3-dev libboost-dev libboost-program-options-dev
           libboost-test-dev nlohmann-json3-dev libfmt-dev libssl-dev)
# Extra packages for the test suite: python3 with numpy (Debian's
# /usr/bin/python3; the numpy cross-checks), clang + the libFuzzer runtime
# (tests/fuzz), GSL (the Longley cross-check), Python headers, pybind11 and
# pytest (the Python module, python/; -DRIDGECAL_PYTHON=ON). The firmware target and browser
# tools are installed by the scripts listed in test_installers; no test
# installs anything itself.
test_pkgs=(python3 python3-numpy python3-dev pybind11-dev python3-pybind11 python3-pytest clang-14 libclang-rt-14-dev libgsl-dev clang-format)
test_installers=()
for f in tests/*/install-*.sh; do [[ -e $f ]] && test_installers+=("$f"); done

as_root() { if [[ $(id -u) -eq 0 ]]; then "$@"; else sudo "$@"; fi; }

install_missing() {
  local missing=()
  for p in "$@"; do
    dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed" || missing+=("$p")
  done
  if ((${#missing[@]})); then
    echo "setup: installing ${missing[*]}"
    as_root apt-get update -qq
    as_root env DEBIAN_FRONTEND=noninteractive apt-get install -y -qq --no-install-recommends "${missing[@]}" >/dev/null
  fi
}

case $mode in
  demo)
    install_missing "${base_pkgs[@]}"
    cmake -S . -B "$build" -G Ninja -DCMAKE_BUILD_TYPE=RelWithDebInfo -DRIDGECAL_BUILD_TESTS=OFF >/dev/null
    cmake --build "$build" -j "$jobs" --target ridgecal
    sample=calibration-samples/loadcell-hopper/loadcell-hopper.csv
    mkdir -p out
    echo "setup: ridgecal fit $sample"
    "$build"/cli/ridgecal fit "$sample" --setpoint setpoint --sensor "feed hopper scale LC-3" \
      --reading-unit counts --reference-unit kg -o out/loadcell-hopper.record.json
    ;;
  test)
    install_missing "${base_pkgs[@]}" "${test_pkgs[@]}"
    for s in "${test_installers[@]}"; do
      echo "setup: $s"
      bash "$s"
    done
    # The module is built for Debian's interpreter, which has the Debian
    # pybind11 and pytest packages (a python3 earlier on PATH may not).
    py=()
    [[ -x /usr/bin/python3 ]] && py=(-DPython3_EXECUTABLE=/usr/bin/python3)
    cmake -S . -B "$build" -G Ninja -DCMAKE_BUILD_TYPE=RelWithDebInfo -DRIDGECAL_BUILD_TESTS=ON \
      -DRIDGECAL_PYTHON=ON "${py[@]}" >/dev/null
    cmake --build "$build" -j "$jobs"
    bash tests/run-suite.sh "$build" --output-on-failure -j "$jobs"
    # Sanitizer suite: the whole test suite again, built with ASan + UBSan
    # (assertions on). Tests labelled `firmware` or `browser` only drive outside
    # toolchains, emulators or a browser and are left out here
    # (docs/robustness.md).
    if [[ ${RIDGECAL_SKIP_ASAN:-0} != 1 ]]; then
      cmake -S . -B build-asan -G Ninja -DRIDGECAL_SANITIZE=ON -DCMAKE_BUILD_TYPE=Debug \
        -DCMAKE_CXX_FLAGS_DEBUG="-O1 -g" -DCMAKE_C_FLAGS_DEBUG="-O1 -g" -DRIDGECAL_BUILD_TESTS=ON >/dev/null
      cmake --build build-asan -j "$jobs"
      ASAN_OPTIONS=detect_leaks=1:strict_string_checks=1:detect_stack_use_after_return=1 \
        UBSAN_OPTIONS=print_stacktrace=1:halt_on_error=1 \
        bash tests/run-suite.sh build-asan --output-on-failure -j "$jobs" -LE "firmware|browser"
    fi
    # Fuzzers: each for RIDGECAL_FUZZ_SECONDS (default 60) under libFuzzer.
    if [[ ${RIDGECAL_SKIP_FUZZ:-0} != 1 ]]; then
      CXX_FUZZ=clang++-14 CC_FUZZ=clang-14 JOBS=$jobs bash tests/fuzz/run-fuzz-build.sh
    fi
    ;;
  *)
    echo "usage: bash setup.sh demo|test" >&2
    exit 2
    ;;
esac
