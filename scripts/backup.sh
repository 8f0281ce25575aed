#!/usr/bin/env bash
# npm run backup [-- FOLDER]: a pg_dump of the database and a copy of the stored photos and maps,
# into FOLDER or DATA_DIR/backups/<UTC time>. Uses DATABASE_URL and STORAGE_DIR when set (another
# machine); otherwise the settings of the local data folder that npm start made.
set -euo pipefail
. "$(dirname "$0")/lib.sh"
cd "$ROOT"
find_pg_bin
[ -n "$PG_BIN" ] && [ -x "$PG_BIN/pg_dump" ] || fail "PostgreSQL client binaries not found under /usr/lib/postgresql/*/bin"
use_local_stack

out="${1:-$DATA_DIR/backups/$(date -u +%Y%m%dT%H%M%SZ)}"
[ -e "$out/database.dump" ] && fail "$out already holds a backup: pick another folder"
mkdir -p "$out"
out="$(cd "$out" && pwd)"

log "dumping the database"
"$PG_BIN/pg_dump" --format=custom --no-owner --no-privileges --dbname="$DATABASE_URL" --file="$out/database.dump.part"
mv "$out/database.dump.part" "$out/database.dump"

if [ "${STORAGE_DRIVER:-local}" = s3 ]; then
  log "photos are in the object store (S3_BUCKET=${S3_BUCKET:-?}): back it up with the store's own versioning or replication"
  echo "s3" > "$out/storage.kind"
else
  log "copying the storage folder $STORAGE_DIR"
  mkdir -p "$STORAGE_DIR"
  # .part files are uploads still being written: not part of any row yet
  tar -C "$STORAGE_DIR" --exclude='*.part' -cf "$out/storage.tar" .
  echo "local" > "$out/storage.kind"
fi
files=0
[ -f "$out/storage.tar" ] && files="$(tar -tf "$out/storage.tar" | grep -vc '/$' || true)"
cat > "$out/README.txt" <<EOT
Veilmeter backup made $(date -u +%Y-%m-%dT%H:%M:%SZ)
database.dump  pg_dump custom format ($(du -h "$out/database.dump" | cut -f1))
storage.tar    the storage folder ($files files)
Restore with: npm run restore -- $out
EOT
log "backup written to $out ($files stored files)"
