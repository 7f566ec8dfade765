#!/usr/bin/env bash
# consumer-test.sh BUILD_DIR SOURCE_DIR [CMAKE_ARG...]
# Installs ridgecal from BUILD_DIR into a fresh temporary prefix, checks that
# no internal header was installed, then configures, builds and runs the
# consumer project (tests/install/consumer) against that prefix only: it finds
# the package with find_package(ridgecal), links ridgecal::fitter and
# ridgecal::firmware_export, includes only the umbrella headers, fits an
# invented run and generates a C header. Extra arguments go to the consumer's
# configure step (compiler, sanitizer flags).
set -eu
build=$1; src=$2; shift 2
work=$(mktemp -d "${TMPDIR:-/tmp}/ridgecal-install.XXXXXX")
trap 'rm -rf "$work"' EXIT
prefix=$work/prefix
cmake --install "$build" --prefix "$prefix" > "$work/install.log"

for f in include/ridgecal/ridgecal.hpp include/ridgecal/firmware.hpp bin/ridgecal; do
  [ -e "$prefix/$f" ] || { echo "not installed: $f"; find "$prefix"; exit 1; }
done
config=$(find "$prefix" -name ridgecalConfig.cmake)
[ -n "$config" ] || { echo "no ridgecalConfig.cmake under the prefix"; exit 1; }
# Internal headers stay in the source tree.
for dir in fitter/src/include firmware-export/src/include; do
  for h in "$src/$dir"/ridgecal/*.hpp "$src/$dir"/ridgecal/*/*.hpp; do
    [ -e "$h" ] || continue
    rel=${h#"$src/$dir/"}
    if [ -e "$prefix/include/$rel" ]; then echo "internal header installed: $rel"; exit 1; fi
  done
done

# Only the prefix: no package registries, no other install of ridgecal.
cmake -S "$src/tests/install/consumer" -B "$work/consumer" -DCMAKE_PREFIX_PATH="$prefix" \
  -DEXPECTED_PREFIX="$prefix" -DCMAKE_FIND_USE_PACKAGE_REGISTRY=OFF \
  -DCMAKE_FIND_USE_SYSTEM_PACKAGE_REGISTRY=OFF "$@" > "$work/configure.log" 2>&1 ||
  { cat "$work/configure.log"; exit 1; }
cmake --build "$work/consumer" -j2 > "$work/build.log" 2>&1 || { cat "$work/build.log"; exit 1; }

"$work/consumer/fit_consumer" | tee "$work/fit.out"
grep -q "^fit_consumer: ok$" "$work/fit.out"
grep -q ", degree 2, " "$work/fit.out"
"$work/consumer/export_consumer" | tee "$work/export.out"
grep -q "^export_consumer: ok$" "$work/export.out"
grep -q "pt7_eval present" "$work/export.out"
echo "install consumer: PASS"
