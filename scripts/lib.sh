#!/usr/bin/env bash
# Shared helpers for start.sh, test.sh and stop.sh: installing what is missing and running
# PostgreSQL, Redis and the mail catcher on 127.0.0.1 inside one data folder.
# Sourced, so it sets no shell options: each caller chooses its own (start.sh and the others run
# with `set -euo pipefail`; test.sh keeps going after a failed step).

ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
PG_BIN="${PG_BIN:-}"

# Prints the first port from $1 upwards that nothing listens on (tests must not trip over a
# leftover server or a second run on the same machine).
free_port() {
  local p="$1"
  while (exec 3<>"/dev/tcp/127.0.0.1/$p") 2>/dev/null; do p=$((p + 1)); done
  echo "$p"
}

log() { printf '\033[36m[veilmeter]\033[0m %s\n' "$*"; }
fail() { printf '\033[31m[veilmeter]\033[0m %s\n' "$*" >&2; exit 1; }

as_root() {
  if [ "$(id -u)" = 0 ]; then "$@"; elif command -v sudo >/dev/null; then sudo "$@"; else
    fail "need root to run: $* (install it by hand, then re-run)"; fi
}

apt_updated=0
apt_install() {
  if [ "$apt_updated" = 0 ]; then
    log "apt-get update"
    as_root env DEBIAN_FRONTEND=noninteractive apt-get update -qq
    apt_updated=1
  fi
  log "apt-get install $*"
  as_root env DEBIAN_FRONTEND=noninteractive apt-get install -y -qq "$@" >/dev/null
}

find_pg_bin() {
  local d
  for d in /usr/lib/postgresql/*/bin; do
    if [ -x "$d/initdb" ] && [ -x "$d/pg_ctl" ]; then PG_BIN="$d"; fi
  done
}

# Installs Debian packages and npm dependencies that are missing. $1 = "with-browser" for tests.
ensure_system() {
  find_pg_bin
  local pkgs=()
  [ -n "$PG_BIN" ] || pkgs+=(postgresql)
  command -v redis-server >/dev/null || pkgs+=(redis-server)
  # camera raw photos are decoded by libraw's command-line tools (lib/image/raw.ts)
  { command -v dcraw_emu >/dev/null && command -v raw-identify >/dev/null; } || pkgs+=(libraw-bin)
  if [ "${1:-}" = with-browser ] && [ ! -x /usr/bin/chromium ]; then pkgs+=(chromium); fi
  if [ "${#pkgs[@]}" -gt 0 ]; then apt_install "${pkgs[@]}"; find_pg_bin; fi
  [ -n "$PG_BIN" ] || fail "PostgreSQL server binaries not found after install"
  id postgres >/dev/null 2>&1 || fail "the postgres system user is missing (Debian's postgresql package creates it)"
}

ensure_node_modules() {
  local stamp="$ROOT/node_modules/.veilmeter-lock"
  if [ ! -d "$ROOT/node_modules" ] || ! cmp -s "$ROOT/package-lock.json" "$stamp"; then
    log "npm ci"
    (cd "$ROOT" && npm ci --include=dev --no-audit --no-fund --loglevel=error)
    cp "$ROOT/package-lock.json" "$stamp"
  fi
}

# The postgres user must be able to reach the cluster folder; a checkout under /root or in a
# `mktemp -d` folder (mode 0700) is not reachable, so the cluster then lives in
# /var/lib/veilmeter/<hash of the data folder>/pg and DATA_DIR/pg links to it.
pg_dir_for() {
  local data="$1" want="$1/pg"
  mkdir -p "$data"
  if [ -L "$want" ]; then readlink -f "$want"; return; fi
  if (cd / && runuser -u postgres -- test -x "$data") 2>/dev/null; then echo "$want"; return; fi
  local alt="/var/lib/veilmeter/$(printf '%s' "$data" | sha1sum | cut -c1-12)/pg"
  mkdir -p "$(dirname "$alt")"; chmod 755 /var/lib/veilmeter "$(dirname "$alt")"
  ln -sfn "$alt" "$want"
  echo "$alt"
}

# pg_start DATA_DIR PORT durable|throwaway
pg_start() {
  local data="$1" port="$2" mode="$3" dir
  dir="$(pg_dir_for "$data")"
  if [ ! -f "$dir/PG_VERSION" ]; then
    log "initdb $dir"
    mkdir -p "$dir"; chown postgres:postgres "$dir"; chmod 700 "$dir"
    # initdb runs as postgres and must read the password file: it goes beside the cluster (a
    # folder postgres can reach, whichever of the two places that is), readable by postgres only
    local pw; pw="$(dirname "$dir")/.pgpass-init"
    (umask 077; printf '%s\n' "$PGPASSWORD" > "$pw"); chown postgres:postgres "$pw"
    # from / : the postgres user may not be allowed into the caller's working folder
    if ! (cd / && runuser -u postgres -- "$PG_BIN/initdb" -D "$dir" -U veilmeter --pwfile="$pw" \
      --auth-local=scram-sha-256 --auth-host=scram-sha-256 -E UTF8 --locale=C.UTF-8 >/dev/null); then
      rm -f "$pw"; fail "initdb failed for $dir"
    fi
    rm -f "$pw"
  fi
  local opts="-c listen_addresses=127.0.0.1 -p $port -c unix_socket_directories=''"
  if [ "$mode" = throwaway ]; then opts="$opts -c fsync=off -c synchronous_commit=off -c full_page_writes=off"; fi
  if (cd / && runuser -u postgres -- "$PG_BIN/pg_ctl" -D "$dir" status) >/dev/null 2>&1; then
    log "PostgreSQL already running on 127.0.0.1:$port"
  else
    (cd / && runuser -u postgres -- "$PG_BIN/pg_ctl" -D "$dir" -w -t 60 -l "$dir/server.log" -o "$opts" start) >/dev/null \
      || { tail -20 "$dir/server.log" >&2; fail "PostgreSQL did not start (log above)"; }
    log "PostgreSQL on 127.0.0.1:$port"
  fi
}

pg_ensure_db() {
  local port="$1" name="$2"
  PGPASSWORD="$PGPASSWORD" psql -h 127.0.0.1 -p "$port" -U veilmeter -d postgres -tAc \
    "SELECT 1 FROM pg_database WHERE datname='$name'" | grep -q 1 \
    || PGPASSWORD="$PGPASSWORD" psql -h 127.0.0.1 -p "$port" -U veilmeter -d postgres -qc "CREATE DATABASE \"$name\"" >/dev/null
}

pg_stop() {
  local data="$1" dir
  [ -e "$data/pg" ] || return 0
  dir="$(readlink -f "$data/pg")"
  if [ -f "$dir/postmaster.pid" ]; then
    (cd / && runuser -u postgres -- "$PG_BIN/pg_ctl" -D "$dir" -w -t 60 -m fast stop) >/dev/null 2>&1 || true
  fi
}

# pg_remove DATA_DIR: deletes a stopped throwaway cluster, including its folder under
# /var/lib/veilmeter when it was put there (and a password file an interrupted initdb left).
pg_remove() {
  local data="$1" dir
  dir="$(readlink -f "$data/pg" 2>/dev/null || true)"
  case "$dir" in /var/lib/veilmeter/?*/pg) rm -rf "$(dirname "$dir")" ;; esac
  rm -rf "$data/pg" "$data/.pgpass-init"
}

# redis_start DATA_DIR PORT durable|throwaway
redis_start() {
  local data="$1" port="$2" mode="$3" dir="$1/redis"
  mkdir -p "$dir"
  if redis-cli -p "$port" -a "$REDIS_PASSWORD" --no-auth-warning ping >/dev/null 2>&1; then
    log "Redis already running on 127.0.0.1:$port"; return
  fi
  local persist=(--appendonly yes --appendfsync everysec)
  [ "$mode" = throwaway ] && persist=(--save '' --appendonly no)
  redis-server --bind 127.0.0.1 --port "$port" --daemonize yes --dir "$dir" \
    --pidfile "$dir/redis.pid" --logfile "$dir/redis.log" --requirepass "$REDIS_PASSWORD" \
    --maxmemory-policy noeviction "${persist[@]}"
  local i
  for i in $(seq 1 100); do
    redis-cli -p "$port" -a "$REDIS_PASSWORD" --no-auth-warning ping >/dev/null 2>&1 && { log "Redis on 127.0.0.1:$port"; return; }
    sleep 0.05
  done
  fail "Redis did not start (see $dir/redis.log)"
}

redis_stop() {
  local data="$1" port="$2"
  redis-cli -p "$port" -a "$REDIS_PASSWORD" --no-auth-warning shutdown nosave >/dev/null 2>&1 || true
  rm -f "$data/redis/redis.pid"
}

# mail_start RUN_DIR: the local mail catcher on 127.0.0.1:$SMTP_PORT, waited for, so mail sent right
# after (the demo seed's target alerts, for one) is caught rather than refused.
mail_start() {
  local run="$1" i
  setsid npx tsx "$ROOT/scripts/mail-catcher.ts" >"$run/mail.log" 2>&1 & echo $! > "$run/mail.pid"
  for i in $(seq 1 150); do
    grep -q "catching on" "$run/mail.log" 2>/dev/null && return
    kill -0 "$(cat "$run/mail.pid")" 2>/dev/null || break
    sleep 0.1
  done
  cat "$run/mail.log" >&2; fail "the mail catcher did not start (log above)"
}

# wait_healthy PORT PID_FILE LOG_FILE [SECONDS (default 60)]: returns once the web app on
# 127.0.0.1:PORT answers /api/health with 2xx (it does when PostgreSQL and Redis answer it); stops
# the calling script with the reason and the log's tail when the process exits first or time runs out.
wait_healthy() {
  local port="$1" pidf="$2" logf="$3" secs="${4:-60}" url="http://127.0.0.1:$1/api/health" i
  for i in $(seq 1 $((secs * 5))); do
    curl -fsS --max-time 5 "$url" >/dev/null 2>&1 && return 0
    if ! kill -0 "$(cat "$pidf" 2>/dev/null)" 2>/dev/null; then
      tail -20 "$logf" >&2
      fail "the web app exited before answering its health check (log above, full log in $logf)"
    fi
    sleep 0.2
  done
  tail -20 "$logf" >&2
  echo "health check answer: $(curl -sS --max-time 5 "$url" 2>&1 | head -c 300)" >&2
  fail "the web app did not answer its health check on $url within $secs s (log above, full log in $logf)"
}

# worker_spawn LOG_FILE PID_FILE: one worker process, compiled by scripts/build-worker.mjs, on plain Node.
worker_spawn() {
  setsid node --enable-source-maps "$ROOT/.build/worker/index.mjs" >"$1" 2>&1 & echo $! > "$2"
}

# s3_fake_start RUN_DIR PORT: the S3-compatible fake on 127.0.0.1 (objects under DATA_DIR/s3), with
# the S3_* settings exported so tests can reach it; STORAGE_DRIVER is left as it is.
s3_fake_start() {
  local run="$1" port="$2" i
  export S3_ENDPOINT="http://127.0.0.1:$port" S3_BUCKET="${S3_BUCKET:-veilmeter-test}"
  export S3_ACCESS_KEY_ID=S3RVER S3_SECRET_ACCESS_KEY=S3RVER
  setsid npx tsx "$ROOT/scripts/s3-fake.ts" >"$run/s3.log" 2>&1 & echo $! > "$run/s3.pid"
  for i in $(seq 1 150); do
    grep -q ready "$run/s3.log" 2>/dev/null && { log "S3 fake on 127.0.0.1:$port"; return; }
    kill -0 "$(cat "$run/s3.pid")" 2>/dev/null || break
    sleep 0.1
  done
  cat "$run/s3.log" >&2; fail "the S3 fake did not start (log above)"
}

s3_fake_stop() { stop_pidfile "$1/s3.pid"; }

# Secrets are made once per data folder and kept there (git-ignored).
load_secrets() {
  local data="$1" f="$1/secrets.env"
  mkdir -p "$data"; chmod 755 "$data"
  if [ ! -f "$f" ]; then
    umask 077
    {
      echo "PGPASSWORD=$(head -c 18 /dev/urandom | base64 | tr -dc 'A-Za-z0-9')"
      echo "REDIS_PASSWORD=$(head -c 18 /dev/urandom | base64 | tr -dc 'A-Za-z0-9')"
      echo "NEXTAUTH_SECRET=$(head -c 32 /dev/urandom | base64 | tr -dc 'A-Za-z0-9')"
    } > "$f"
    umask 022
  fi
  set -a; . "$f"; set +a
}

# The settings of the stack npm start made in DATA_DIR (default .data), unless DATABASE_URL is set
# already (another machine). For the tools run beside it: backup, restore, load.
use_local_stack() {
  DATA_DIR="${DATA_DIR:-.data}"; mkdir -p "$DATA_DIR"; export DATA_DIR="$(cd "$DATA_DIR" && pwd)"
  if [ -z "${DATABASE_URL:-}" ]; then
    [ -f "$DATA_DIR/secrets.env" ] || fail "no DATABASE_URL and no $DATA_DIR/secrets.env: run npm start first, or set DATABASE_URL or DATA_DIR"
    set -a; . "$DATA_DIR/secrets.env"; [ -f "$DATA_DIR/run/ports.env" ] && . "$DATA_DIR/run/ports.env"; set +a
    export PGPORT="${PGPORT:-54329}" REDIS_PORT="${REDIS_PORT:-63799}" PGDATABASE="${PGDATABASE:-veilmeter}" PORT="${PORT:-3000}"
    . "$ROOT/scripts/env.sh"
  fi
  export STORAGE_DIR="${STORAGE_DIR:-$DATA_DIR/storage}"
}

stop_pidfile() {
  local f="$1" pid
  [ -f "$f" ] || return 0
  pid="$(cat "$f")"
  if kill -0 "$pid" 2>/dev/null; then
    kill -TERM -- "-$pid" 2>/dev/null || kill -TERM "$pid" 2>/dev/null || true
    local i; for i in $(seq 1 50); do kill -0 "$pid" 2>/dev/null || break; sleep 0.2; done
    kill -KILL -- "-$pid" 2>/dev/null || true
  fi
  rm -f "$f"
}
