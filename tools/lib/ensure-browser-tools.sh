#!/usr/bin/env bash
# Browser tests drive Debian's chromium through playwright-core (no browser download).
set -euo pipefail
source "$(dirname "$0")/common.sh"
[ -x "${CHROMIUM_PATH:-/usr/bin/chromium}" ] && exit 0
if is_root; then
  say "installing Debian's chromium for the browser tests…"
  apt_install chromium chromium-driver || die "apt-get install chromium failed"
else
  die "Chromium is needed for the browser tests. Install it once with:
    sudo apt-get update && sudo apt-get install -y chromium chromium-driver"
fi
