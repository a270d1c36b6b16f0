#!/usr/bin/env bash
# npm run backup [-- DIR]: a consistent copy of the database (pg_dump, custom format) and of the
# image store, with a manifest of row counts and checksums that npm run restore verifies.
# Default DIR: $KW_DATA_DIR/backups/<UTC time>. The server may keep running: pg_dump reads one
# snapshot, and images are written before the rows that name them, so every named image is copied.
source "$(dirname "$0")/lib.sh"
export KW_IMAGE_DIR="${KW_IMAGE_DIR:-$KW_DATA_DIR/images}"
out="${1:-$KW_DATA_DIR/backups/$(date -u +%Y%m%dT%H%M%SZ)}"

ensure_postgres_installed
pg_reachable || pg_start
mkdir -p "$out"
[ -z "$(ls -A "$out")" ] || { echo "backup: $out is not empty; choose a new folder" >&2; exit 2; }

log "dumping database $KW_DB_NAME"
"$(pg_bin)/pg_dump" -h 127.0.0.1 -p "$KW_PG_PORT" -U postgres -Fc --no-owner -f "$out/database.dump" "$KW_DB_NAME"
table_counts "$KW_DB_NAME" > "$out/row-counts.tsv"

log "copying the image store"
mkdir -p "$KW_IMAGE_DIR"
tar -C "$KW_IMAGE_DIR" --exclude="*.tmp" -cf "$out/images.tar" .
(cd "$KW_IMAGE_DIR" && find . -type f ! -name "*.tmp" -printf '%f\n' | sort) > "$out/images.txt"

(cd "$out" && sha256sum database.dump images.tar row-counts.tsv images.txt > SHA256SUMS)
log "backup written to $out ($(wc -l < "$out/images.txt") images, $(awk '{s+=$2} END {print s+0}' "$out/row-counts.tsv") rows)"
