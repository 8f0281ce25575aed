#!/usr/bin/env bash
# npm test: the same bootstrap as npm start on a throwaway data folder and other ports, then
# typecheck, lint, vitest (unit + integration against the real services) and Playwright.
set -uo pipefail
. "$(dirname "$0")/lib.sh"
cd "$ROOT"
set -e

PORT="$(free_port "${TEST_PORT:-3107}")"; PGPORT="$(free_port "${TEST_PGPORT:-54339}")"
REDIS_PORT="$(free_port "${TEST_REDIS_PORT:-63809}")"; SMTP_PORT="$(free_port "${TEST_SMTP_PORT:-2539}")"
S3_FAKE_PORT="$(free_port "${TEST_S3_PORT:-45689}")"
export PORT PGPORT REDIS_PORT SMTP_PORT
mkdir -p .test-data
export DATA_DIR="$(mktemp -d "$ROOT/.test-data/run-XXXXXX")"
export PGDATABASE=veilmeter_test NODE_ENV=production VEILMETER_TEST=1
# the tests read mail from the local catcher (tests/e2e/helpers.ts waitForMail)
export MAIL_CATCHER=1
RUN="$DATA_DIR/run"; mkdir -p "$RUN"

ensure_system with-browser
ensure_node_modules
load_secrets "$DATA_DIR"
. "$ROOT/scripts/env.sh"

cleanup() {
  set +e
  for f in "$RUN"/*.pid; do [ -e "$f" ] && stop_pidfile "$f"; done
  redis_stop "$DATA_DIR" "$REDIS_PORT"
  pg_stop "$DATA_DIR"
  pg_remove "$DATA_DIR"
  rm -rf "$DATA_DIR"
}
trap cleanup EXIT
trap 'exit 130' INT TERM

pg_start "$DATA_DIR" "$PGPORT" throwaway
pg_ensure_db "$PGPORT" "$PGDATABASE"
redis_start "$DATA_DIR" "$REDIS_PORT" throwaway
mail_start "$RUN"
s3_fake_start "$RUN" "$S3_FAKE_PORT"

npx tsx db/migrate.ts latest
npx tsx db/seeds/run.ts --if-empty
set +e

status=0
step() {
  local name="$1"; shift
  log "── $name"
  local t0=$SECONDS
  if "$@"; then log "── $name passed ($((SECONDS - t0)) s)"; else log "── $name FAILED"; status=1; return 1; fi
}

step worker-build node scripts/build-worker.mjs
step typecheck npx tsc --noEmit
step lint npx eslint --max-warnings=0 .
step vitest npx vitest run --reporter=default
# the browser tests run only against this run's build: an earlier one's BUILD_ID is removed first,
# and a failed build skips them
dist="${NEXT_DIST_DIR:-.next}"
rm -f "$dist/BUILD_ID"
built=0
step build bash -c 'npx next build > "$0/build.log" 2>&1 || { tail -60 "$0/build.log"; exit 1; }' "$RUN" && built=1
if [ "$built" = 1 ] && [ -f "$dist/BUILD_ID" ] && [ -f .build/worker/index.mjs ]; then
  worker_spawn "$RUN/worker.log" "$RUN/worker.pid"
  step e2e npx playwright test
  [ "$status" = 0 ] || { echo "--- worker log (tail)"; tail -30 "$RUN/worker.log"; }
fi

# the production install README describes (npm ci --omit=dev, the build copied in), in a temp folder
if [ "$built" = 1 ]; then
  step production-install bash scripts/check-production.sh "$dist" "$(free_port $((PORT + 100)))"
fi

if [ "$status" = 0 ]; then log "all tests passed"; else log "some tests FAILED"; fi
exit "$status"
