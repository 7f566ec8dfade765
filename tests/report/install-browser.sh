#!/bin/sh
# Install what the report's browser test needs, from Debian packages:
#   chromium       headless browser that loads, screenshots and prints the report
#   poppler-utils  pdfinfo (page count) and pdftoppm (PDF pages to PNG)
#   nodejs         runs browser_check.mjs (skipped when node is already there)
# Needs root (or sudo). Safe to run again: apt-get skips what is installed.
set -eu
SUDO=""
if [ "$(id -u)" != 0 ]; then
  if command -v sudo >/dev/null 2>&1; then SUDO="sudo"; else
    echo "install-browser.sh: needs root to install packages" >&2
    exit 1
  fi
fi
pkgs="chromium poppler-utils"
command -v node >/dev/null 2>&1 || pkgs="$pkgs nodejs"
missing=""
for p in $pkgs; do
  dpkg -s "$p" >/dev/null 2>&1 || missing="$missing $p"
done
if [ -z "$missing" ]; then
  echo "install-browser.sh: already installed:$pkgs"
  exit 0
fi
export DEBIAN_FRONTEND=noninteractive
$SUDO apt-get update -q
# shellcheck disable=SC2086
$SUDO apt-get install -y -q --no-install-recommends $missing fonts-dejavu-core
echo "install-browser.sh: installed:$missing"
