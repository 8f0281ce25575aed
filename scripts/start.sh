#!/usr/bin/env bash
# npm start: install what is missing, start PostgreSQL and Redis on 127.0.0.1, migrate, seed the
# demo when the database is empty, build, then serve the web app and the worker until Ctrl-C.
set -euo pipefail
. "$(dirname "$0")/lib.sh"
cd "$ROOT"

export PORT="${PORT:-3000}" PGPORT="${PGPORT:-54329}" REDIS_PORT="${REDIS_PORT:-63799}"
export SMTP_PORT="${SMTP_PORT:-2529}" WORKERS="${WORKERS:-1}"
DATA_DIR="${DATA_DIR:-.data}"; mkdir -p "$DATA_DIR"; export DATA_DIR="$(cd "$DATA_DIR" && pwd)"
export PGDATABASE="${PGDATABASE:-veilmeter}" NODE_ENV=production
RUN="$DATA_DIR/run"; mkdir -p "$RUN"

ensure_system
ensure_node_modules
load_secrets "$DATA_DIR"
. "$ROOT/scripts/env.sh"

stopping=0
shutdown() {
  [ "$stopping" = 1 ] && return; stopping=1
  log "stopping"
  [ -f "$RUN/mail-tail.pid" ] && { kill "$(cat "$RUN/mail-tail.pid")" 2>/dev/null || true; rm -f "$RUN/mail-tail.pid"; }
  bash "$ROOT/scripts/stop.sh" >/dev/null 2>&1 || true
  log "stopped; data kept in $DATA_DIR"
}
trap shutdown EXIT
trap 'exit 130' INT TERM

pg_start "$DATA_DIR" "$PGPORT" durable
pg_ensure_db "$PGPORT" "$PGDATABASE"
redis_start "$DATA_DIR" "$REDIS_PORT" durable
cat > "$RUN/ports.env" <<EOT
PGPORT=$PGPORT
REDIS_PORT=$REDIS_PORT
EOT

# The mail catcher only when asked for (MAIL_CATCHER=1, which `npm run start:demo-mail` sets):
# a production start sends mail through the SMTP relay of SMTP_HOST instead.
if [ "$MAIL_CATCHER" = 1 ]; then
  mail_start "$RUN"
  MAIL_NOTE="mail catcher 127.0.0.1:$SMTP_PORT, asked for by MAIL_CATCHER=1: mail never leaves this machine, and each message's links are printed below"
elif [ -n "${SMTP_HOST:-}" ]; then
  MAIL_NOTE="mail through the relay $SMTP_HOST:$SMTP_PORT (TLS: ${SMTP_TLS:-starttls})"
else
  MAIL_NOTE="no mail: set SMTP_HOST (README, SECURITY) or MAIL_CATCHER=1 for the local catcher; invitations, resets and address confirmations cannot be sent"
fi

log "migrating"
npx tsx db/migrate.ts latest
npx tsx db/seeds/run.ts --if-empty

log "building"
npx next build >"$RUN/build.log" 2>&1 || { tail -40 "$RUN/build.log" >&2; fail "build failed (log above, full log in $RUN/build.log)"; }
# the worker runs compiled on plain Node (scripts/build-worker.mjs says why)
node scripts/build-worker.mjs || fail "worker build failed"

for i in $(seq 1 "$WORKERS"); do
  worker_spawn "$RUN/worker-$i.log" "$RUN/worker-$i.pid"
done
setsid node scripts/web.mjs -p "$PORT" -H "${HOST:-127.0.0.1}" >"$RUN/web.log" 2>&1 & echo $! > "$RUN/web.pid"

# "running" only once the app answers its health check (PostgreSQL and Redis reachable from it)
wait_healthy "$PORT" "$RUN/web.pid" "$RUN/web.log" 60

cat <<EOT

  Veilmeter is running at http://localhost:$PORT
  (PostgreSQL 127.0.0.1:$PGPORT, Redis 127.0.0.1:$REDIS_PORT, $WORKERS worker(s))
  Mail: $MAIL_NOTE

  Demo sign-ins: admin@example.test, lead@example.test, tester@example.test, viewer@example.test
  Demo password: $(npx tsx -e "import('./db/seeds/demo-data.ts').then(m => console.log(m.DEMO_PASSWORD))")

  Logs in $RUN. Ctrl-C or \`npm run stop\` stops everything; the data stays in $DATA_DIR.

EOT
# the catcher's log on this console: who each message went to and its links (a sign-up's
# confirmation, an invitation, a reset), the demo's way to read mail sent to invented addresses
if [ "$MAIL_CATCHER" = 1 ]; then
  tail -n 0 -F "$RUN/mail.log" 2>/dev/null & echo $! > "$RUN/mail-tail.pid"
fi
wait -n "$(cat "$RUN/web.pid")" 2>/dev/null || true
