#!/usr/bin/env bash
# Installs the Debian 12 packages the firmware target tests need:
#   cross compilers + emulators for Cortex-M (qemu-system-arm, semihosting)
#   and ATmega328P (simavr), plus clang for the host compile matrix.
# libnewlib-arm-none-eabi provides <math.h> and libm for the headers of
# extended models with ln (log/logf); everything else on Cortex-M links with
# -nostdlib -lgcc (libgcc ships with gcc-arm-none-eabi).
# Idempotent; needs root (or sudo). Called by the project's setup script.
set -euo pipefail

PKGS=(gcc clang gcc-arm-none-eabi libnewlib-arm-none-eabi qemu-system-arm gcc-avr avr-libc simavr libboost-dev)

SUDO=""
if [ "$(id -u)" -ne 0 ]; then SUDO="sudo"; fi

missing=()
for p in "${PKGS[@]}"; do
  if ! dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed"; then
    missing+=("$p")
  fi
done
if [ ${#missing[@]} -eq 0 ]; then
  echo "install-target-tools: all present (${PKGS[*]})"
  exit 0
fi
echo "install-target-tools: installing ${missing[*]}"
start=$(date +%s)
$SUDO apt-get -o DPkg::Lock::Timeout=600 update -qq
log=$(mktemp)
if ! DEBIAN_FRONTEND=noninteractive $SUDO apt-get -o DPkg::Lock::Timeout=600 install -y -qq \
    --no-install-recommends "${missing[@]}" > "$log" 2>&1; then
  cat "$log"; rm -f "$log"; exit 1
fi
rm -f "$log"
echo "install-target-tools: done in $(( $(date +%s) - start )) s"
