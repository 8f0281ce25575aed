#!/usr/bin/env bash
# npm run load [-- --web=N]: the read and upload load test (bench/load.ts) on the PostgreSQL and
# Redis of the data folder npm start made, started here if they are not running (and stopped again
# afterwards), or on those DATABASE_URL and REDIS_URL name. It seeds, and afterwards deletes, its
# own throwaway lab; the demo data is not touched.
set -euo pipefail
. "$(dirname "$0")/lib.sh"
cd "$ROOT"
given="${DATABASE_URL:-}"
use_local_stack
started=()
if [ -z "$given" ]; then
  find_pg_bin
  if ! runuser -u postgres -- "$PG_BIN/pg_ctl" -D "$(pg_dir_for "$DATA_DIR")" status >/dev/null 2>&1; then
    pg_start "$DATA_DIR" "$PGPORT" durable; started+=(pg)
  fi
  if ! redis-cli -p "$REDIS_PORT" -a "$REDIS_PASSWORD" --no-auth-warning ping >/dev/null 2>&1; then
    redis_start "$DATA_DIR" "$REDIS_PORT" durable; started+=(redis)
  fi
  npx tsx db/migrate.ts latest >/dev/null
fi
cleanup() {
  for s in "${started[@]}"; do
    case "$s" in pg) pg_stop "$DATA_DIR" ;; redis) redis_stop "$DATA_DIR" "$REDIS_PORT" ;; esac
  done
}
trap cleanup EXIT
npx tsx bench/load.ts "$@"
