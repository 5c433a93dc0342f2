#!/usr/bin/env bash
# The two commands. `npm start` → start, `npm test` → test, `npm run dev` → dev, `npm run bench` → bench,
# `npm run stop` → stop.
# Sets up everything a fresh clone needs: npm packages, MariaDB (Debian's package, private
# instance on 127.0.0.1), the schema, the demo data, the local fakes, then the app or the tests.
set -euo pipefail
ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$ROOT"
export NEXT_TELEMETRY_DISABLED=1
PORT="${PORT:-3000}"

log() { printf '[loopwright] %s\n' "$*"; }

ensure_node_modules() {
  # npm ci when node_modules is missing or older than the lock file.
  if [ ! -f node_modules/.package-lock.json ] || [ package-lock.json -nt node_modules/.package-lock.json ]; then
    log "installing npm packages (npm ci)"
    npm ci --no-audit --no-fund --loglevel=error
  fi
}

ensure_chromium() {
  if [ -x /usr/bin/chromium ]; then return; fi
  log "installing Debian's chromium for the browser tests"
  if [ "$(id -u)" != 0 ]; then log "need root for apt-get install chromium"; exit 1; fi
  apt-get update -qq
  DEBIAN_FRONTEND=noninteractive apt-get install -y -qq --no-install-recommends chromium >/dev/null
}

PIDS=()
cleanup() {
  for pid in "${PIDS[@]:-}"; do
    [ -n "$pid" ] && kill "$pid" 2>/dev/null || true
  done
  wait 2>/dev/null || true
}

start_background() { # name, command...
  local name="$1"; shift
  "$@" &
  PIDS+=("$!")
  log "started $name (pid $!)"
}

wait_for_app() { # pid: wait until /api/health answers, or fail if the app process died
  for _ in $(seq 1 240); do
    if ! kill -0 "$1" 2>/dev/null; then log "the app did not start (is port $PORT already in use?)"; exit 1; fi
    if node -e 'fetch(process.argv[1]).then((r) => process.exit(r.ok ? 0 : 1), () => process.exit(1))' \
      "http://127.0.0.1:$PORT/api/health"; then return; fi
    sleep 0.25
  done
  log "the app did not answer within 60 s"; exit 1
}

wait_for_url() { # name, url, pid: wait until the url answers, or fail if the process died
  for _ in $(seq 1 120); do
    if ! kill -0 "$3" 2>/dev/null; then log "the $1 did not start"; exit 1; fi
    if node -e 'fetch(process.argv[1]).then((r) => process.exit(r.ok ? 0 : 1), () => process.exit(1))' \
      "$2"; then return; fi
    sleep 0.25
  done
  log "the $1 did not answer within 30 s"; exit 1
}

prepare() {
  ensure_node_modules
  node --import tsx lib/env-check.ts
  bash db/server.sh start
}

case "${1:-}" in
  start|dev)
    prepare
    npx tsx db/migrate.ts latest
    trap cleanup EXIT INT TERM
    start_background mail-fake node --import tsx mocks/mail/server.ts
    start_background upload-fake node --import tsx mocks/uploads/server.ts
    export PAYMENTS_FAKE_WEBHOOK_URL="${PAYMENTS_FAKE_WEBHOOK_URL:-http://127.0.0.1:$PORT/api/webhooks/payments}"
    start_background payments-fake node --import tsx mocks/payments/server.ts
    # The demo seed pays for its jobs on the payment fake's pages, so the fake comes first.
    wait_for_url "payment fake" "http://127.0.0.1:${STRIPE_API_PORT:-12111}/_fake/health" "${PIDS[-1]}"
    npx tsx db/seed.ts
    start_background worker node --import tsx lib/worker/main.ts
    if [ "$1" = start ]; then
      log "building the app"
      npx next build >/tmp/loopwright-build.log 2>&1 || { tail -40 /tmp/loopwright-build.log; exit 1; }
      start_background app node node_modules/next/dist/bin/next start -H 127.0.0.1 -p "$PORT"
    else
      start_background app node node_modules/next/dist/bin/next dev -H 127.0.0.1 -p "$PORT"
    fi
    wait_for_app "${PIDS[-1]}"
    npx tsx db/print-demo-logins.ts "http://127.0.0.1:$PORT"
    log "Ctrl-C stops the app and the fakes; 'npm run stop' stops the database"
    wait -n "${PIDS[@]}"
    ;;
  test)
    started=$(date +%s)
    prepare
    ensure_chromium
    DB_TARGET=test npx tsx db/migrate.ts latest
    log "typecheck"; npx tsc --noEmit
    log "lint"; npx eslint --max-warnings 0 .
    log "format"; npx prettier --check --log-level warn .
    log "build"; npx next build >/tmp/loopwright-build.log 2>&1 || { tail -60 /tmp/loopwright-build.log; exit 1; }
    log "tests"
    set +e
    DB_TARGET=test npx vitest run
    rc=$?
    set -e
    log "npm test took $(( $(date +%s) - started )) s"
    exit $rc
    ;;
  screenshots)
    # Refreshes the README's screenshots (docs/screenshots/) from three browser-test files run
    # against the test stack; the files' other screenshots are not written in this mode.
    prepare
    ensure_chromium
    DB_TARGET=test npx tsx db/migrate.ts latest
    log "build"; npx next build >/tmp/loopwright-build.log 2>&1 || { tail -60 /tmp/loopwright-build.log; exit 1; }
    mkdir -p docs/screenshots
    SCREENSHOTS_DIR=docs/screenshots DB_TARGET=test npx vitest run --project e2e \
      tests/e2e/journey-homeowner.test.ts tests/e2e/journey-job.test.ts tests/e2e/phone.test.ts
    du -ch docs/screenshots/*.png | tail -1
    ;;
  bench)
    # `npm run bench`: the performance bench (tests/bench/run.ts) from a fresh clone; it builds
    # the app, seeds its own database and starts its own fakes. Arguments pass through.
    prepare
    ensure_chromium
    shift
    exec npx tsx tests/bench/run.ts "$@"
    ;;
  stop)
    bash db/server.sh stop
    ;;
  *)
    echo "usage: db/stack.sh start|dev|test|bench|screenshots|stop" >&2; exit 2 ;;
esac
