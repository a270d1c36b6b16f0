#!/usr/bin/env bash
# npm run demo:reset: drop the demo database and seed it again (the server must be stopped).
source "$(dirname "$0")/lib.sh"
ensure_postgres_installed
ensure_node_modules
pg_start
psql -h 127.0.0.1 -p "$KW_PG_PORT" -U postgres -qc "drop database if exists \"$KW_DB_NAME\" with (force)"
pg_create_db "$KW_DB_NAME"
build_server
node "${KW_POOL_NODE_FLAGS[@]}" dist-server/server/cli/prepare.js
log "demo reset; start the app with npm start"
