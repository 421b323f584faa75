#!/usr/bin/env bash
# Browser tests drive Debian's chromium through playwright-core (no browser download); the tag-sheet
# tests rasterise PDFs with poppler's pdftoppm to read the QR codes back; the data-package test validates
# the EML with libxml2's xmllint against the official XML Schema.
set -euo pipefail
source "$(dirname "$0")/common.sh"
missing=()
[ -x "${CHROMIUM_PATH:-/usr/bin/chromium}" ] || missing+=(chromium chromium-driver)
command -v pdftoppm >/dev/null 2>&1 || missing+=(poppler-utils)
command -v xmllint >/dev/null 2>&1 || missing+=(libxml2-utils)
[ ${#missing[@]} = 0 ] && exit 0
if is_root; then
  say "installing Debian's ${missing[*]} for the browser tests…"
  apt_install "${missing[@]}" || die "apt-get install ${missing[*]} failed"
else
  die "The browser tests need ${missing[*]}. Install them once with:
    sudo apt-get update && sudo apt-get install -y ${missing[*]}"
fi
