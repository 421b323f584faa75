#!/usr/bin/env bash
# npm start: install what is missing, start our own PostgreSQL on 127.0.0.1, migrate, seed the
# demo scenario once, build, and serve app + /api from one process. Ctrl-C stops both cleanly.
set -euo pipefail
source "$(dirname "$0")/lib/common.sh"
source "$ROOT/tools/lib/pg.sh"
cd "$ROOT"

export PORT=${PORT:-8080}
export PGPORT=${PGPORT:-54329}
ensure_node_modules
ensure_postgres_installed
pg_up pg "$PGPORT" fluxwalk

server_pid=
cleanup() {
  trap - INT TERM EXIT
  [ -n "$server_pid" ] && kill -TERM "$server_pid" 2>/dev/null && wait "$server_pid" 2>/dev/null
  say "stopping PostgreSQL"
  pg_down pg
}
trap cleanup INT TERM EXIT

secret_file="$DATA_DIR/session-secret"
[ -s "$secret_file" ] || { head -c 32 /dev/urandom | base64 >"$secret_file"; chmod 600 "$secret_file"; }
export SESSION_SECRET=${SESSION_SECRET:-$(cat "$secret_file")}

ensure_build
node dist/server/server/core/migrate.js
node dist/server/server/seed/seed-main.js
say "open http://127.0.0.1:$PORT (demo accounts in README.md); Ctrl-C stops"
node dist/server/server/main.js &
server_pid=$!
wait "$server_pid"
