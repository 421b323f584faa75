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

server_pid= s3_pid=
cleanup() {
  trap - INT TERM EXIT
  [ -n "$server_pid" ] && kill -TERM "$server_pid" 2>/dev/null && wait "$server_pid" 2>/dev/null
  [ -n "$s3_pid" ] && kill -TERM "$s3_pid" 2>/dev/null && wait "$s3_pid" 2>/dev/null
  say "stopping PostgreSQL"
  pg_down pg
}
trap cleanup INT TERM EXIT

secret_file="$DATA_DIR/session-secret"
[ -s "$secret_file" ] || { head -c 32 /dev/urandom | base64 >"$secret_file"; chmod 600 "$secret_file"; }
export SESSION_SECRET=${SESSION_SECRET:-$(cat "$secret_file")}

ensure_build
source "$ROOT/tools/fake-smtp.sh" # mail to a local fake SMTP server (inbox on :8025) unless SMTP_HOST is set
node dist/server/server/core/migrate.js
node dist/server/server/seed/seed-main.js
# Files (logger exports, photos) go to S3-compatible storage: a local fake unless S3_ENDPOINT is set.
if [ -z "${S3_ENDPOINT:-}" ]; then
  export FAKE_S3_PORT=${FAKE_S3_PORT:-4569} S3_BUCKET=fluxwalk S3_ACCESS_KEY=S3RVER S3_SECRET_KEY=S3RVER
  export S3_ENDPOINT="http://127.0.0.1:$FAKE_S3_PORT"
  node dist/tools/tools/fake-s3/fake-s3-main.js &
  s3_pid=$!
fi
say "open http://127.0.0.1:$PORT (demo accounts in README.md); Ctrl-C stops"
node dist/server/server/main.js &
server_pid=$!
wait "$server_pid"
