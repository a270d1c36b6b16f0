# Shared set-up steps for start.sh, test.sh, stop.sh and .ci/run. Source it; do not run it.
# Settings (environment variables, with defaults):
#   PORT          web app + API port (8081)
#   KW_DATA_DIR   project-local data: PostgreSQL cluster, image store, JWT secret (./.data)
#   KW_PG_PORT    PostgreSQL port, bound to 127.0.0.1 (54329)
#   KW_DB_NAME    database name (kernwright)
set -euo pipefail

ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$ROOT"
export PORT="${PORT:-8081}"
export KW_DATA_DIR="${KW_DATA_DIR:-$ROOT/.data}"
export KW_PG_PORT="${KW_PG_PORT:-54329}"
export KW_DB_NAME="${KW_DB_NAME:-kernwright}"
export PGDATA_DIR="$KW_DATA_DIR/pg"
# Node flags for the processes that run the vision worker pool (the server, the demo seed):
# POOL_PROCESS_NODE_FLAGS in server/vision/pool.ts says why; tests/unit/vision/pool-flags.test.ts checks they agree.
KW_POOL_NODE_FLAGS=(--single-threaded-gc)

log() { printf '\033[1m[kernwright]\033[0m %s\n' "$*"; }

as_root_or_fail() {
  if [ "$(id -u)" != 0 ]; then
    log "Missing Debian packages: $*. Install them with: sudo apt-get install -y $*"; exit 1
  fi
}

# Installs Debian packages that are missing (only root can; otherwise says what to run).
ensure_debian_packages() {
  local missing=()
  for pkg in "$@"; do dpkg -s "$pkg" >/dev/null 2>&1 || missing+=("$pkg"); done
  [ ${#missing[@]} -eq 0 ] && return 0
  as_root_or_fail "${missing[@]}"
  log "installing Debian packages: ${missing[*]}"
  DEBIAN_FRONTEND=noninteractive apt-get update -qq
  DEBIAN_FRONTEND=noninteractive apt-get install -y -qq "${missing[@]}" >/dev/null
}

pg_bin() {
  local bin
  bin=$(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V | tail -1 || true)
  [ -n "$bin" ] && [ -x "$bin/initdb" ] && { echo "$bin"; return; }
  echo ""
}

ensure_postgres_installed() {
  if [ -z "$(pg_bin)" ]; then ensure_debian_packages postgresql; fi
  if [ -z "$(pg_bin)" ]; then
    # The package may be installed with its binaries removed: reinstall it.
    as_root_or_fail postgresql
    DEBIAN_FRONTEND=noninteractive apt-get install -y -qq --reinstall "postgresql-$(ls /usr/lib/postgresql | sort -V | tail -1)" >/dev/null
  fi
}

# npm ci when node_modules is absent or was installed from another package-lock.json.
ensure_node_modules() {
  local want have=""
  want=$(sha256sum package-lock.json | cut -c1-64)
  [ -f node_modules/.kernwright-lock ] && have=$(cat node_modules/.kernwright-lock)
  if [ ! -d node_modules ] || [ "$want" != "$have" ]; then
    log "installing npm packages (npm ci)"
    npm ci --no-audit --no-fund --loglevel=error
    echo "$want" > node_modules/.kernwright-lock
  fi
}

# PostgreSQL refuses to run as root: the cluster belongs to the postgres user when we are root.
pg_run() {
  if [ "$(id -u)" = 0 ]; then runuser -u postgres -- "$@"; else "$@"; fi
}

pg_start() {
  local bin owner
  bin=$(pg_bin)
  if [ "$(id -u)" = 0 ]; then owner=postgres; else owner=$(id -un); fi
  mkdir -p "$PGDATA_DIR"
  chown "$owner" "$PGDATA_DIR"; chmod 700 "$PGDATA_DIR"
  if [ ! -s "$PGDATA_DIR/PG_VERSION" ]; then
    log "creating a PostgreSQL cluster in $PGDATA_DIR"
    pg_run "$bin/initdb" -D "$PGDATA_DIR" -U postgres --auth=trust --encoding=UTF8 --locale=C.UTF-8 >/dev/null
  fi
  if ! pg_run "$bin/pg_ctl" -D "$PGDATA_DIR" status >/dev/null 2>&1; then
    log "starting PostgreSQL on 127.0.0.1:$KW_PG_PORT"
    pg_run "$bin/pg_ctl" -D "$PGDATA_DIR" -l "$PGDATA_DIR/server.log" -w -t 60 \
      -o "-p $KW_PG_PORT -c listen_addresses=127.0.0.1 -c unix_socket_directories='$PGDATA_DIR' ${KW_PG_EXTRA_OPTS:-}" start >/dev/null
  fi
  pg_create_db "$KW_DB_NAME"
}

# True when the cluster answers on KW_PG_PORT (started by this checkout or another process).
pg_reachable() {
  psql -h 127.0.0.1 -p "$KW_PG_PORT" -U postgres -tAc 'select 1' >/dev/null 2>&1
}

# "table<TAB>rows" for every table of the public schema, sorted: what a backup must bring back.
table_counts() {
  local db="$1" t
  for t in $(psql -h 127.0.0.1 -p "$KW_PG_PORT" -U postgres -d "$db" -tAc "select tablename from pg_tables where schemaname = 'public' order by tablename"); do
    printf '%s\t%s\n' "$t" "$(psql -h 127.0.0.1 -p "$KW_PG_PORT" -U postgres -d "$db" -tAc "select count(*) from public.\"$t\"")"
  done
}

pg_create_db() {
  psql -h 127.0.0.1 -p "$KW_PG_PORT" -U postgres -tAc "select 1 from pg_database where datname='$1'" | grep -q 1 \
    || psql -h 127.0.0.1 -p "$KW_PG_PORT" -U postgres -qc "create database \"$1\""
}

pg_stop() {
  local bin; bin=$(pg_bin)
  [ -n "$bin" ] && [ -s "$PGDATA_DIR/PG_VERSION" ] || return 0
  if pg_run "$bin/pg_ctl" -D "$PGDATA_DIR" status >/dev/null 2>&1; then
    log "stopping PostgreSQL"
    pg_run "$bin/pg_ctl" -D "$PGDATA_DIR" -m fast -w stop >/dev/null
  fi
}

# The web build is reused while none of its inputs changed.
web_inputs_hash() {
  find app components hooks lib shared assets app.json babel.config.js package-lock.json -type f 2>/dev/null \
    | LC_ALL=C sort | xargs sha256sum | sha256sum | cut -c1-64
}

build_web() {
  local want; want=$(web_inputs_hash)
  if [ -f dist/.kernwright-build ] && [ "$(cat dist/.kernwright-build)" = "$want" ]; then return 0; fi
  log "building the web app (expo export)"
  CI=1 EXPO_OFFLINE=1 npx expo export --platform web --output-dir dist >/dev/null
  echo "$want" > dist/.kernwright-build
}

build_server() {
  log "building the server (tsc)"
  rm -rf dist-server
  npx tsc -p server/tsconfig.build.json
}
