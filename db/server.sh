#!/usr/bin/env bash
# A private MariaDB instance for this checkout, on 127.0.0.1 only.
# Data lives in .data/mariadb (git-ignored); the system datadir and port 3306 are never touched.
#
#   db/server.sh start    install mariadb-server if missing, init once, start, wait, create databases
#   db/server.sh stop     clean shutdown
#   db/server.sh status   "running" or "stopped"
set -euo pipefail

ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
DATA="$ROOT/.data/mariadb"
PORT="${DB_PORT:-3307}"
HOST="127.0.0.1"
CNF="$DATA/my.cnf"
# Socket paths must stay under 107 characters: keep it short and in /tmp, keyed by port.
SOCK="/tmp/loopwright-mariadb-$PORT.sock"
PIDFILE="$DATA/mariadbd.pid"
APP_USER="${DB_USER:-app}"
APP_PASSWORD="${DB_PASSWORD:-app-local-password}"
DB_APP="${DB_NAME:-loopwright}"
DB_TEST="${DB_TEST_NAME:-loopwright_test}"

log() { printf '[db] %s\n' "$*"; }

ensure_installed() {
  if command -v mariadbd >/dev/null 2>&1 || [ -x /usr/sbin/mariadbd ]; then return; fi
  log "mariadb-server is not installed; installing it from Debian's packages"
  if [ "$(id -u)" != 0 ]; then log "need root for apt-get (run as root or install mariadb-server)"; exit 1; fi
  apt-get update -qq
  DEBIAN_FRONTEND=noninteractive apt-get install -y -qq --no-install-recommends mariadb-server >/dev/null
}

write_cnf() {
  mkdir -p "$DATA/data"
  cat >"$CNF" <<CNF
[mariadbd]
user=root
datadir=$DATA/data
socket=$SOCK
pid-file=$PIDFILE
log-error=$DATA/error.log
port=$PORT
bind-address=$HOST
skip-name-resolve
default-time-zone=+00:00
character-set-server=utf8mb4
collation-server=utf8mb4_unicode_ci
innodb_buffer_pool_size=128M
innodb_log_file_size=48M
max_connections=200
# Durability: write and flush the InnoDB log at every commit, so a committed transaction
# survives a crash or power cut. The binary log is off (no replication); if log_bin is ever
# turned on, sync_binlog=1 keeps it in step.
innodb_flush_log_at_trx_commit=1
innodb_doublewrite=1
sync_binlog=1
CNF
}

ping() { mariadb-admin --no-defaults --protocol=tcp -h "$HOST" -P "$PORT" -uroot ping >/dev/null 2>&1; }

sql() { mariadb --no-defaults --protocol=tcp -h "$HOST" -P "$PORT" -uroot -e "$1"; }

create_databases() {
  sql "CREATE DATABASE IF NOT EXISTS \`$DB_APP\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;
       CREATE DATABASE IF NOT EXISTS \`$DB_TEST\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;
       CREATE USER IF NOT EXISTS '$APP_USER'@'127.0.0.1' IDENTIFIED BY '$APP_PASSWORD';
       CREATE USER IF NOT EXISTS '$APP_USER'@'localhost' IDENTIFIED BY '$APP_PASSWORD';
       GRANT ALL PRIVILEGES ON \`$DB_APP\`.* TO '$APP_USER'@'127.0.0.1', '$APP_USER'@'localhost';
       GRANT ALL PRIVILEGES ON \`${DB_TEST}%\`.* TO '$APP_USER'@'127.0.0.1', '$APP_USER'@'localhost';
       FLUSH PRIVILEGES;"
}

start() {
  ensure_installed
  mkdir -p "$DATA"
  exec 9>"$DATA/.lock"
  flock 9
  if ping; then log "already running on $HOST:$PORT"; create_databases; return; fi
  if [ -f "$PIDFILE" ]; then
    pid="$(cat "$PIDFILE" 2>/dev/null || true)"
    if [ -n "$pid" ] && [ -d "/proc/$pid" ] && grep -q mariadbd "/proc/$pid/comm" 2>/dev/null \
       && ! grep -q '^State:.*Z' "/proc/$pid/status" 2>/dev/null; then
      log "mariadbd (pid $pid) is alive but does not answer on $HOST:$PORT; refusing to start a second one"
      exit 1
    fi
    log "removing stale pid file and socket"
    rm -f "$PIDFILE" "$SOCK"
  fi
  write_cnf
  if [ ! -d "$DATA/data/mysql" ]; then
    log "initialising a new instance in $DATA/data"
    mariadb-install-db --defaults-file="$CNF" --auth-root-authentication-method=normal \
      --skip-test-db >"$DATA/install.log" 2>&1 || { cat "$DATA/install.log"; exit 1; }
  fi
  setsid nohup mariadbd --defaults-file="$CNF" >/dev/null 2>&1 </dev/null 9>&- &
  for _ in $(seq 1 120); do
    if ping; then break; fi
    sleep 0.25
  done
  if ! ping; then log "MariaDB did not answer within 30 s; see $DATA/error.log"; tail -20 "$DATA/error.log" || true; exit 1; fi
  log "running on $HOST:$PORT"
  create_databases
}

stop() {
  if ping; then
    mariadb-admin --no-defaults --protocol=tcp -h "$HOST" -P "$PORT" -uroot shutdown
    log "stopped"
  else
    log "not running"
  fi
}

case "${1:-}" in
  start) start ;;
  stop) stop ;;
  status) if ping; then echo running; else echo stopped; fi ;;
  *) echo "usage: db/server.sh start|stop|status" >&2; exit 2 ;;
esac
