#!/usr/bin/env bash
# npm run stop: stops the web app, the workers, the mail catcher, Redis and PostgreSQL of a data folder.
set -euo pipefail
. "$(dirname "$0")/lib.sh"
cd "$ROOT"
DATA_DIR="${DATA_DIR:-.data}"
[ -d "$DATA_DIR" ] || { log "nothing to stop"; exit 0; }
DATA_DIR="$(cd "$DATA_DIR" && pwd)"; RUN="$DATA_DIR/run"
find_pg_bin
for f in "$RUN"/web.pid "$RUN"/worker-*.pid "$RUN"/mail.pid; do [ -e "$f" ] && stop_pidfile "$f"; done
if [ -f "$DATA_DIR/secrets.env" ]; then
  set -a; . "$DATA_DIR/secrets.env"; [ -f "$RUN/ports.env" ] && . "$RUN/ports.env"; set +a
  redis_stop "$DATA_DIR" "${REDIS_PORT:-63799}"
fi
pg_stop "$DATA_DIR"
log "stopped"
