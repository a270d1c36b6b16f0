#!/usr/bin/env bash
# npm stop: stop the server and the PostgreSQL cluster that npm start started.
source "$(dirname "$0")/lib.sh"
if [ -f "$KW_DATA_DIR/server.pid" ]; then
  pid=$(cat "$KW_DATA_DIR/server.pid")
  if kill "$pid" 2>/dev/null; then log "stopped the server (pid $pid)"; fi
  rm -f "$KW_DATA_DIR/server.pid"
fi
pg_stop
