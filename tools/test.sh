#!/usr/bin/env bash
# npm test: the same install steps as npm start, a separate test cluster, then every test:
# shared + server + app projects, then the browser tests in band. Non-zero on any failure.
set -euo pipefail
source "$(dirname "$0")/lib/common.sh"
source "$ROOT/tools/lib/pg.sh"
cd "$ROOT"

export PGPORT_TEST=${PGPORT_TEST:-54339}
ensure_node_modules
# Lint before anything else: a lint error fails the run in seconds, not after the browser tests.
say "linting…"
npm run --silent lint || die "lint found problems (npm run lint)"
ensure_postgres_installed
pg_up pg-test "$PGPORT_TEST" fluxwalk_e2e_test
export E2E_DATABASE_URL=$DATABASE_URL
pg_up pg-test "$PGPORT_TEST" fluxwalk_test
export TEST_DATABASE_URL=$DATABASE_URL
unset DATABASE_URL
trap 'pg_down pg-test' EXIT

ensure_build
FAKE_SMTP_PORT=2526 FAKE_SMTP_WEB_PORT=8026 source "$ROOT/tools/fake-smtp.sh" # servers the tests start send mail to a fake
# Browser tests and the API tests of the tag sheet need chromium and pdftoppm.
bash "$ROOT/tools/lib/ensure-browser-tools.sh"

# Tests are compiled one file at a time (isolatedModules) and so never type-checked by jest: check them here.
say "type-checking the tests…"
npx tsc --noEmit -p tsconfig.node-jest.json || die "the tests do not type-check"

rc=0
npx jest --selectProjects shared server app "$@" || rc=$?
if ls test/e2e/*.e2e.ts >/dev/null 2>&1; then
  npx jest --selectProjects e2e --runInBand "$@" || rc=$?
fi
[ $rc = 0 ] && say "all tests passed" || say "tests FAILED"
exit $rc
