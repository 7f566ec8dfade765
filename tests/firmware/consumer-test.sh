#!/usr/bin/env bash
# consumer-test.sh BUILD_DIR SOURCE_DIR WORK_DIR [GENERATOR]
# Installs ridgecal from BUILD_DIR into a temporary prefix, makes a record
# with `ridgecal fit` from a demo sample, then configures, builds and runs the
# consumer project (tests/firmware/consumer), which finds the package with
# find_package(ridgecal) and generates its header with
# ridgecal_generate_header(). Then it changes the record and checks that the
# build regenerates the header, and that a refused export fails the build
# without replacing the header.
set -eu
build=$1; src=$2; work=$3; gen=${4:-}
G=(); [ -n "$gen" ] && G=(-G "$gen")
rm -rf "$work"; mkdir -p "$work"
prefix=$work/prefix
cmake --install "$build" --prefix "$prefix" > "$work/install.log"
rc=$prefix/bin/ridgecal
sample=$src/calibration-samples/ntc-coldstore/ntc-coldstore.csv
"$rc" fit "$sample" -o "$work/record.json" --sensor "cold store v1" --reading-unit counts \
  --reference-unit degC --tol-offset 0.5 --timestamp none > /dev/null

for numeric in float double fixed; do
  b=$work/consumer-$numeric
  cmake "${G[@]}" -S "$src/tests/firmware/consumer" -B "$b" -DCMAKE_PREFIX_PATH="$prefix" \
    -DCALIBRATION_RECORD="$work/record.json" -DCALIBRATION_NUMERIC=$numeric > "$b.configure.log"
  cmake --build "$b" > "$b.build.log"
  "$b/consumer"
  grep -q "cold store v1" "$b/generated/coldstore_calibration.h"
  grep -rq -- "-ffp-contract=off" "$b/CMakeFiles" "$b"/*.ninja 2>/dev/null ||
    { echo "-ffp-contract=off not applied"; exit 1; }
done

# A new record regenerates the header on the next build.
"$rc" fit "$sample" -o "$work/record.json" --sensor "cold store v2" --reading-unit counts \
  --reference-unit degC --tol-offset 0.5 --timestamp none > /dev/null
b=$work/consumer-float
cmake --build "$b" > "$b.rebuild.log"
grep -q "cold store v2" "$b/generated/coldstore_calibration.h" || { echo "header not regenerated"; exit 1; }
"$b/consumer"

# A refused export fails the build and leaves the previous header in place.
cp "$b/generated/coldstore_calibration.h" "$work/before.h"
cmake -S "$src/tests/firmware/consumer" -B "$b" -DCALIBRATION_TOLERANCE=1e-7 > /dev/null
touch "$work/record.json"
if cmake --build "$b" > "$b.refused.log" 2>&1; then
  echo "build with an impossible tolerance succeeded"; exit 1
fi
grep -q "refused" "$b.refused.log" || { echo "no refusal message:"; cat "$b.refused.log"; exit 1; }
# ridgecal never writes on refusal; with CMake's Makefile generator make's
# .DELETE_ON_ERROR then removes the stale output (Ninja keeps it), so the build
# stays red until the export passes. Never may a different header appear.
h=$b/generated/coldstore_calibration.h
if [ -e "$h" ] && ! cmp -s "$work/before.h" "$h"; then echo "header replaced"; exit 1; fi
echo "consumer-test: PASS (float, double, fixed; regeneration; refusal keeps the header)"
