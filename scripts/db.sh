#!/usr/bin/env bash
# Private MariaDB for Platewright: start | stop | status | reset | sql.
# Data lives in $PW_DB_DIR (default .data/mariadb, git-ignored); the socket and pid file live in
# $PW_DB_RUN_DIR (default /tmp/platewright-db-$DB_PORT), outside the project so the build's file
# scan never meets a socket. Listens on 127.0.0.1:$DB_PORT only, never the system's 3306 instance.
set -euo pipefail
cd "$(dirname "$0")/.."
ROOT=$(pwd)
. scripts/read-env.sh

DB_PORT=${DB_PORT:-3307}
DB_NAME=${DB_NAME:-platewright}
DB_USER=${DB_USER:-app}
DB_PASSWORD=${DB_PASSWORD:-platewright-dev}
DB_TEST_NAME=${DB_TEST_NAME:-platewright_test}
DB_E2E_NAME=${DB_E2E_NAME:-platewright_e2e}
DATA_DIR=${PW_DB_DIR:-$ROOT/.data/mariadb}
RUN_DIR=${PW_DB_RUN_DIR:-/tmp/platewright-db-$DB_PORT}
SOCK=$RUN_DIR/mysqld.sock
PID=$RUN_DIR/mariadbd.pid
LOG=$DATA_DIR/../mariadb-error.log

say() { printf 'db: %s\n' "$*"; }
die() { printf 'db: error: %s\n' "$*" >&2; exit 1; }

admin() { mariadb-admin --no-defaults --protocol=socket --socket="$SOCK" -uroot "$@"; }
sql() { mariadb --no-defaults --protocol=socket --socket="$SOCK" -uroot "$@"; }

ensure_installed() {
  if command -v mariadbd >/dev/null 2>&1 || [ -x /usr/sbin/mariadbd ]; then
    export PATH="$PATH:/usr/sbin"; return
  fi
  if [ "$(id -u)" != 0 ]; then
    die "mariadbd is not installed. As root run: apt-get update && apt-get install -y mariadb-server (or run this script as root)."
  fi
  say "installing Debian's mariadb-server (one time)…"
  apt-get update -qq
  DEBIAN_FRONTEND=noninteractive apt-get install -y -qq mariadb-server >/dev/null
  export PATH="$PATH:/usr/sbin"
}

running() { [ -S "$SOCK" ] && admin ping >/dev/null 2>&1; }

start() {
  ensure_installed
  mkdir -p "$RUN_DIR" "$(dirname "$DATA_DIR")"
  if running; then say "already running on 127.0.0.1:$DB_PORT"; provision; return; fi
  # A crash leaves a stale pid file or socket behind: clear them when no server answers.
  if [ -f "$PID" ] && ! kill -0 "$(cat "$PID")" 2>/dev/null; then rm -f "$PID"; fi
  if [ -f "$PID" ]; then
    say "a server (pid $(cat "$PID")) holds the data folder but does not answer; waiting"
  else
    rm -f "$SOCK"
    if [ ! -d "$DATA_DIR/mysql" ]; then
      say "initialising a private data folder in $DATA_DIR"
      mkdir -p "$DATA_DIR"
      mariadb-install-db --no-defaults --user="$(id -un)" --datadir="$DATA_DIR" \
        --auth-root-authentication-method=normal --skip-test-db --skip-name-resolve >/dev/null
    fi
    local userflag=()
    [ "$(id -u)" = 0 ] && userflag=(--user=root)
    nohup mariadbd --no-defaults "${userflag[@]}" --datadir="$DATA_DIR" \
      --bind-address=127.0.0.1 --port="$DB_PORT" --socket="$SOCK" --pid-file="$PID" \
      --log-error="$LOG" --skip-name-resolve --character-set-server=utf8mb4 \
      --collation-server=utf8mb4_unicode_ci --max-connections=300 >/dev/null 2>&1 &
  fi
  for _ in $(seq 1 150); do
    if running; then break; fi
    sleep 0.2
  done
  running || { tail -20 "$LOG" >&2 || true; die "MariaDB did not start; see $LOG"; }
  say "running on 127.0.0.1:$DB_PORT (socket $SOCK)"
  provision
}

provision() {
  sql <<SQL
CREATE DATABASE IF NOT EXISTS \`$DB_NAME\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;
CREATE DATABASE IF NOT EXISTS \`$DB_TEST_NAME\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;
CREATE DATABASE IF NOT EXISTS \`$DB_E2E_NAME\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;
CREATE USER IF NOT EXISTS '$DB_USER'@'127.0.0.1' IDENTIFIED BY '$DB_PASSWORD';
CREATE USER IF NOT EXISTS '$DB_USER'@'localhost' IDENTIFIED BY '$DB_PASSWORD';
ALTER USER '$DB_USER'@'127.0.0.1' IDENTIFIED BY '$DB_PASSWORD';
ALTER USER '$DB_USER'@'localhost' IDENTIFIED BY '$DB_PASSWORD';
GRANT ALL PRIVILEGES ON \`$DB_NAME\`.* TO '$DB_USER'@'127.0.0.1', '$DB_USER'@'localhost';
GRANT ALL PRIVILEGES ON \`platewright\\_%\`.* TO '$DB_USER'@'127.0.0.1', '$DB_USER'@'localhost';
GRANT ALL PRIVILEGES ON \`$DB_E2E_NAME\`.* TO '$DB_USER'@'127.0.0.1', '$DB_USER'@'localhost';
FLUSH PRIVILEGES;
SQL
}

stop() {
  if running; then admin shutdown && say "stopped"; else say "not running"; fi
  rm -f "$SOCK"
}

status() {
  if running; then say "running on 127.0.0.1:$DB_PORT (data $DATA_DIR)"; else say "not running"; return 1; fi
}

reset() {
  stop || true
  say "removing $DATA_DIR"
  rm -rf "$DATA_DIR"
  start
}

case "${1:-status}" in
  start) start ;;
  stop) stop ;;
  status) status ;;
  reset) reset ;;
  sql) shift; ensure_installed; sql "$@" ;;
  *) die "usage: scripts/db.sh start|stop|status|reset|sql" ;;
esac
