#!/usr/bin/env bash
# npm run dev: our PostgreSQL, the server recompiled and restarted on change, and the Angular
# dev server (live reload) proxying /api to it (proxy.conf.json).
set -euo pipefail
source "$(dirname "$0")/lib/common.sh"
source "$ROOT/tools/lib/pg.sh"
cd "$ROOT"
export PGPORT=${PGPORT:-54329} PORT=${API_PORT:-8080}
ensure_node_modules
ensure_postgres_installed
pg_up pg "$PGPORT" fluxwalk
trap 'kill 0; pg_down pg' INT TERM EXIT
npx tsc -p server/tsconfig.json
node dist/server/server/core/migrate.js
node dist/server/server/seed/seed-main.js
npx tsc -p server/tsconfig.json --watch --preserveWatchOutput >/dev/null &
STATIC_DIR=/nonexistent node --watch-path=dist/server dist/server/server/main.js &
npx ng serve --proxy-config proxy.conf.json
