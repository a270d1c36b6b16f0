#!/usr/bin/env bash
# npm test: the same set-up as npm start on a throw-away cluster, then every test (unit, API, browser).
# Extra arguments go to jest, e.g. `npm test -- tests/unit`.
export KW_DATA_DIR="${KW_TEST_DATA_DIR:-$(cd "$(dirname "$0")/.." && pwd)/.data-test}"
export KW_PG_PORT="${KW_TEST_PG_PORT:-54339}"
export KW_DB_NAME=kernwright_test_admin
export KW_PG_EXTRA_OPTS="-c fsync=off -c synchronous_commit=off -c full_page_writes=off -c max_connections=200"
source "$(dirname "$0")/lib.sh"

ensure_debian_packages chromium poppler-utils
ensure_postgres_installed
ensure_node_modules
mkdir -p "$KW_DATA_DIR"
trap pg_stop EXIT
pg_start
log "type-checking"
npm run -s typecheck
build_web
log "running the tests"
export KW_TEST_DATABASE_URL="postgres://postgres@127.0.0.1:$KW_PG_PORT"
npx jest --ci --maxWorkers=2 "$@"
