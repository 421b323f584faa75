# Shared shell helpers for tools/start.sh and tools/test.sh. Sourced, not run.
# Everything here is idempotent: a second call is cheap and changes nothing.

ROOT=$(cd "$(dirname "${BASH_SOURCE[0]}")/../.." && pwd)
DATA_DIR="$ROOT/.data"
mkdir -p "$DATA_DIR"

say() { printf '[fluxwalk] %s\n' "$*" >&2; }
die() { say "$*"; exit 1; }
is_root() { [ "$(id -u)" = 0 ]; }

# Installs node modules when missing or when package-lock.json changed since the last install.
ensure_node_modules() {
  local stamp="$ROOT/node_modules/.fluxwalk-lock-sum" sum
  sum=$(sha256sum "$ROOT/package-lock.json" | cut -d' ' -f1)
  if [ ! -d "$ROOT/node_modules" ] || [ "$(cat "$stamp" 2>/dev/null)" != "$sum" ]; then
    say "installing node modules (npm ci)…"
    (cd "$ROOT" && npm ci --no-audit --no-fund --loglevel=error) || die "npm ci failed"
    echo "$sum" >"$stamp"
  fi
}

# apt-get may be held by another apt run for a while: wait and retry instead of failing.
apt_install() {
  local i
  for i in $(seq 1 30); do
    if DEBIAN_FRONTEND=noninteractive apt-get install -y -qq "$@" >/dev/null 2>&1; then return 0; fi
    [ "$i" = 1 ] && apt-get update -qq >/dev/null 2>&1
    sleep 5
  done
  return 1
}

# Builds the app and the server when any source is newer than the last build.
ensure_build() {
  local stamp="$ROOT/dist/.build-stamp"
  if [ -f "$stamp" ] && [ -z "$(find "$ROOT/src" "$ROOT/server" "$ROOT/shared" "$ROOT/tools" "$ROOT/angular.json" \
        "$ROOT/ngsw-config.json" "$ROOT/package-lock.json" -newer "$stamp" -type f -print -quit 2>/dev/null)" ]; then
    return 0
  fi
  say "building app and server…"
  (cd "$ROOT" && npm run --silent build) || die "build failed"
  touch "$stamp"
}
