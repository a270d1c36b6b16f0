#!/usr/bin/env bash
# npm start: install what is missing, start PostgreSQL, migrate, seed the demo, build and serve the app.
source "$(dirname "$0")/lib.sh"

ensure_postgres_installed
ensure_node_modules
mkdir -p "$KW_DATA_DIR"
pg_start
build_web
build_server

node "${KW_POOL_NODE_FLAGS[@]}" dist-server/server/cli/prepare.js

cleanup() { trap - INT TERM EXIT; [ -n "${SERVER_PID:-}" ] && kill "$SERVER_PID" 2>/dev/null; wait "${SERVER_PID:-}" 2>/dev/null || true; pg_stop; rm -f "$KW_DATA_DIR/server.pid"; }
trap cleanup INT TERM EXIT
node "${KW_POOL_NODE_FLAGS[@]}" dist-server/server/main.js &
SERVER_PID=$!
echo "$SERVER_PID" > "$KW_DATA_DIR/server.pid"
wait "$SERVER_PID"
