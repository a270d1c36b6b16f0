#!/usr/bin/env bash
# npm run restore -- DIR [DATABASE]: restore a backup made by npm run backup into a database that
# does not exist yet (default: $KW_DB_NAME) and into the image store, then verify row counts and
# every image's SHA-256 against the backup's manifest. Refuses to overwrite an existing database.
# With KW_STORAGE=s3 the images go into the bucket (KW_S3_*): unpacked into a temporary folder under
# TMPDIR (/tmp), imported, and verified by reading each one back from the bucket.
source "$(dirname "$0")/lib.sh"
export KW_IMAGE_DIR="${KW_IMAGE_DIR:-$KW_DATA_DIR/images}"
from="${1:?usage: npm run restore -- BACKUP_DIR [DATABASE]}"
target="${2:-$KW_DB_NAME}"

(cd "$from" && sha256sum --quiet -c SHA256SUMS) || { echo "restore: $from fails its checksums; it is damaged" >&2; exit 2; }
ensure_postgres_installed
pg_reachable || pg_start
if psql -h 127.0.0.1 -p "$KW_PG_PORT" -U postgres -tAc "select 1 from pg_database where datname='$target'" | grep -q 1; then
  echo "restore: database $target exists; stop the server and drop it first, or name a new database" >&2
  exit 2
fi

log "restoring database $target"
psql -h 127.0.0.1 -p "$KW_PG_PORT" -U postgres -qc "create database \"$target\""
"$(pg_bin)/pg_restore" -h 127.0.0.1 -p "$KW_PG_PORT" -U postgres --no-owner --exit-on-error -d "$target" "$from/database.dump"

archive() { npx ts-node --transpile-only -P server/tsconfig.json server/cli/image-archive.ts "$@"; }
if [ "${KW_STORAGE:-local}" = s3 ]; then
  log "restoring the images into the bucket"
  staging=$(mktemp -d "${TMPDIR:-/tmp}/kernwright-restore.XXXXXX")
  trap 'rm -rf "$staging"' EXIT
  tar -C "$staging" -xf "$from/images.tar"
  archive import "$staging"
  rm -rf "$staging"
else
  log "restoring the image store into $KW_IMAGE_DIR"
  mkdir -p "$KW_IMAGE_DIR"
  tar -C "$KW_IMAGE_DIR" -xf "$from/images.tar"
fi

log "verifying"
if ! diff <(table_counts "$target") "$from/row-counts.tsv" >/dev/null; then
  echo "restore: row counts differ from the backup's:" >&2
  diff <(table_counts "$target") "$from/row-counts.tsv" >&2 || true
  exit 1
fi
if [ "${KW_STORAGE:-local}" = s3 ]; then
  archive verify "$from/images.txt" || { echo "restore: images are missing from the bucket or damaged (listed above)" >&2; exit 1; }
else
  bad=0
  while read -r hash; do
    file="$KW_IMAGE_DIR/${hash:0:2}/${hash:2:2}/$hash"
    [ "$(sha256sum "$file" | cut -c1-64)" = "$hash" ] || { echo "restore: image $hash is missing or damaged" >&2; bad=1; }
  done < "$from/images.txt"
  [ "$bad" = 0 ] || exit 1
fi
log "restored $target: row counts and $(wc -l < "$from/images.txt") image checksums match the backup"
