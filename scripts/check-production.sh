#!/usr/bin/env bash
# The production install as README's "Running on more machines" describes it, on a copy of this
# checkout in a temporary folder: `npm ci --omit=dev`, the build artefacts (.next/ and .build/ from
# this checkout) copied in, then the compiled worker, the compiled CLI, the migration runner and
# `node scripts/web.mjs` started there. Passes when no development package (test fakes, build and
# test tools) is installed, the worker says it is ready, the CLI answers and the app answers its
# health check, its sign-in page and the files of public/. npm test runs it after its build, with the test stack's
# environment (DATABASE_URL, REDIS_URL, NEXTAUTH_*, STORAGE_DIR).
#
#   bash scripts/check-production.sh [DIST_DIR (default .next)] [PORT (default: a free one from 3207)]
set -euo pipefail
. "$(dirname "$0")/lib.sh"
cd "$ROOT"
dist="${1:-.next}"
port="${2:-$(free_port 3207)}"
[ -f "$dist/BUILD_ID" ] || fail "no web build in $dist: run npx next build first"
[ -f .build/worker/index.mjs ] && [ -f .build/cli/veilmeter.mjs ] || fail "no compiled worker and CLI in .build: run node scripts/build-worker.mjs first"
: "${DATABASE_URL:?needs the environment of a running stack (DATABASE_URL, REDIS_URL, NEXTAUTH_SECRET)}"

t0=$SECONDS
tmp="$(mktemp -d /tmp/vm-production-XXXXXX)"
pids=()
cleanup() {
  local p
  for p in "${pids[@]}"; do kill -TERM -- "-$p" 2>/dev/null || true; done
  for p in "${pids[@]}"; do
    for _ in $(seq 1 25); do kill -0 "$p" 2>/dev/null || break; sleep 0.2; done
    kill -KILL -- "-$p" 2>/dev/null || true
  done
  rm -rf "$tmp"
}
trap cleanup EXIT

# the checkout's own files (tracked and new, not ignored), then the build artefacts
git ls-files -z --cached --others --exclude-standard \
  | tar --null -T - --ignore-failed-read -cf - 2>/dev/null | tar -C "$tmp" -xf -
tar --exclude="$dist/cache" -cf - "$dist" .build/worker .build/cli | tar -C "$tmp" -xf -

cd "$tmp"
log "production install: npm ci --omit=dev in $tmp"
npm ci --omit=dev --prefer-offline --no-audit --no-fund --loglevel=error >"$tmp/npm.log" 2>&1 \
  || { tail -20 "$tmp/npm.log" >&2; fail "npm ci --omit=dev failed (log above)"; }

# no test fake and no test tool. (Some development packages come in as dependencies of runtime
# ones: esbuild for tsx, and @playwright/test, an optional peer of next, which npm keeps unless
# optional packages are left out too, and that would leave out sharp's native binaries.)
for pkg in @20minutes/s3rver s3rver smtp-server mailparser autocannon vitest eslint; do
  [ ! -e "node_modules/$pkg" ] || fail "the production install has the development package $pkg"
done
if npm ls --omit=dev --all --parseable 2>/dev/null | grep -E '/node_modules/(@20minutes/s3rver|s3rver|smtp-server|mailparser|autocannon)$'; then
  fail "npm ls --omit=dev lists a test fake or tool (above)"
fi

# the CLI and the migration runner (tsx is a runtime dependency for db/migrate.ts and the seed)
out="$(node scripts/veilmeter.mjs --version)" || fail "the compiled CLI did not run"
log "CLI: $out"
npx --no-install tsx db/migrate.ts status >"$tmp/migrate.log" 2>&1 || { cat "$tmp/migrate.log" >&2; fail "the migration runner did not run"; }
log "migrations: $(tail -1 "$tmp/migrate.log")"

# a worker on a queue of its own whose sweeper finds nothing old enough to put back, so it takes
# no analysis of the test stack's
QUEUE_PREFIX="vmprod$$" setsid node --enable-source-maps .build/worker/index.mjs --sweep-grace=999999999 >"$tmp/worker.log" 2>&1 &
pids+=($!)
NEXT_DIST_DIR="$dist" WEB_PROCESSES=1 setsid node scripts/web.mjs -p "$port" -H 127.0.0.1 >"$tmp/web.log" 2>&1 &
pids+=($!)
echo "${pids[1]}" > "$tmp/web.pid"

ready=0
for _ in $(seq 1 300); do
  grep -q ready "$tmp/worker.log" && { ready=1; break; }
  kill -0 "${pids[0]}" 2>/dev/null || break
  sleep 0.2
done
[ "$ready" = 1 ] || { tail -20 "$tmp/worker.log" >&2; fail "the worker of the production install did not start (log above)"; }

wait_healthy "$port" "$tmp/web.pid" "$tmp/web.log" 90
code="$(curl -s -o /dev/null -w '%{http_code}' "http://127.0.0.1:$port/sign-in")"
[ "$code" = 200 ] || { tail -20 "$tmp/web.log" >&2; fail "the sign-in page of the production install answered $code"; }

# the static files of public/ answer without a session (the page proxy must not send them to sign-in)
for f in robots.txt manifest.webmanifest icon.svg icon-192.png; do
  code="$(curl -s -o /dev/null -w '%{http_code}' "http://127.0.0.1:$port/$f")"
  [ "$code" = 200 ] || fail "/$f answered $code in the production install"
done

log "production install works: worker ready, web app healthy on :$port ($((SECONDS - t0)) s)"
