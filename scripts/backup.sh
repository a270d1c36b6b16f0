#!/usr/bin/env bash
# npm run backup [-- DIR]: a consistent copy of the database (pg_dump, custom format) and of the
# image store, with a manifest of row counts and checksums that npm run restore verifies.
# Default DIR: $KW_DATA_DIR/backups/<UTC time>. The server may keep running: pg_dump reads one
# snapshot, and images are written before the rows that name them, so every named image is copied.
# The image store is the local folder, or with KW_STORAGE=s3 the bucket (KW_S3_*): its objects are
# exported into the local folder's layout first, so images.tar is the same for either store.
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

archive() { npx ts-node --transpile-only -P server/tsconfig.json server/cli/image-archive.ts "$@"; }
if [ "${KW_STORAGE:-local}" = s3 ]; then
  log "exporting the image bucket"
  staging="$out/images.export"
  trap 'rm -rf "$staging"' EXIT
  archive export "$staging"
  images="$staging"
else
  log "copying the image store"
  mkdir -p "$KW_IMAGE_DIR"
  images="$KW_IMAGE_DIR"
fi
tar -C "$images" --exclude="*.tmp" -cf "$out/images.tar" .
(cd "$images" && find . -type f ! -name "*.tmp" -printf '%f\n' | sort) > "$out/images.txt"
[ -z "${staging:-}" ] || rm -rf "$staging"

(cd "$out" && sha256sum database.dump images.tar row-counts.tsv images.txt > SHA256SUMS)
log "backup written to $out ($(wc -l < "$out/images.txt") images, $(awk '{s+=$2} END {print s+0}' "$out/row-counts.tsv") rows)"
