#!/usr/bin/env bash
# npm run restore -- FOLDER: puts back the database and the storage folder of a backup made by
# npm run backup. Stop the web app and the workers first (npm run stop stops PostgreSQL too: start
# it again, or point DATABASE_URL at a running server). The storage folder it replaces is kept
# beside it as STORAGE_DIR.replaced-<time>.
set -euo pipefail
. "$(dirname "$0")/lib.sh"
cd "$ROOT"
src="${1:-}"
[ -n "$src" ] || fail "usage: npm run restore -- FOLDER (a folder made by npm run backup)"
[ -f "$src/database.dump" ] || fail "$src has no database.dump: not a backup folder"
src="$(cd "$src" && pwd)"
find_pg_bin
[ -n "$PG_BIN" ] && [ -x "$PG_BIN/pg_dump" ] || fail "PostgreSQL client binaries not found under /usr/lib/postgresql/*/bin"
use_local_stack

log "restoring the database from $src/database.dump"
# a clean schema first, so tables that came after the backup do not survive it
"$PG_BIN/psql" --dbname="$DATABASE_URL" -v ON_ERROR_STOP=1 -qc 'DROP SCHEMA IF EXISTS public CASCADE; CREATE SCHEMA public;' >/dev/null
"$PG_BIN/pg_restore" --no-owner --no-privileges --exit-on-error --single-transaction --dbname="$DATABASE_URL" "$src/database.dump"

if [ -f "$src/storage.tar" ]; then
  stamp="$(date -u +%Y%m%dT%H%M%SZ)"
  staged="$STORAGE_DIR.restoring-$stamp"
  mkdir -p "$staged"
  tar -C "$staged" -xf "$src/storage.tar"
  if [ -d "$STORAGE_DIR" ]; then mv "$STORAGE_DIR" "$STORAGE_DIR.replaced-$stamp"; log "the previous storage folder is kept as $STORAGE_DIR.replaced-$stamp"; fi
  mv "$staged" "$STORAGE_DIR"
  log "storage folder restored to $STORAGE_DIR"
else
  log "this backup holds no storage folder ($(cat "$src/storage.kind" 2>/dev/null || echo unknown)): restore the object store from its own backup"
fi
log "restored from $src"
