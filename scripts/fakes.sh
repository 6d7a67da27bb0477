#!/usr/bin/env bash
# Local fakes for development and tests: start | stop | status.
# One Node process (scripts/fakes/serve.ts) serves a fake SMTP server on 127.0.0.1:$SMTP_PORT (every
# message kept in $MAILBOX_DIR/messages.jsonl) and a fake payment API on 127.0.0.1:$PAYMENTS_FAKE_PORT.
# Idempotent: `start` does nothing when both ports already answer.
set -euo pipefail
cd "$(dirname "$0")/.."

export SMTP_PORT=${SMTP_PORT:-2525}
export PAYMENTS_FAKE_PORT=${PAYMENTS_FAKE_PORT:-4242}
export MAILBOX_DIR=${MAILBOX_DIR:-.data/mailbox}
RUN_DIR=.data/fakes
PID=$RUN_DIR/fakes.pid
LOG=$RUN_DIR/fakes.log

say() { printf 'fakes: %s\n' "$*"; }
answers() { (exec 3<>"/dev/tcp/127.0.0.1/$1") 2>/dev/null; }
running() { answers "$SMTP_PORT" && answers "$PAYMENTS_FAKE_PORT"; }

start() {
  mkdir -p "$RUN_DIR"
  if running; then say "already running (SMTP 127.0.0.1:$SMTP_PORT, payments 127.0.0.1:$PAYMENTS_FAKE_PORT)"; return; fi
  if [ -f "$PID" ] && kill -0 "$(cat "$PID")" 2>/dev/null; then
    say "pid $(cat "$PID") exists but does not answer; waiting"
  else
    nohup node_modules/.bin/tsx scripts/fakes/serve.ts >>"$LOG" 2>&1 &
    echo $! >"$PID"
  fi
  for _ in $(seq 1 100); do
    if running; then say "running (SMTP 127.0.0.1:$SMTP_PORT, payments http://127.0.0.1:$PAYMENTS_FAKE_PORT)"; return; fi
    sleep 0.2
  done
  tail -20 "$LOG" >&2 || true
  say "error: the fakes did not start; see $LOG" >&2
  exit 1
}

stop() {
  if [ -f "$PID" ] && kill -0 "$(cat "$PID")" 2>/dev/null; then
    kill "$(cat "$PID")"
    for _ in $(seq 1 50); do kill -0 "$(cat "$PID")" 2>/dev/null || break; sleep 0.1; done
    say "stopped"
  else
    say "not running"
  fi
  rm -f "$PID"
}

status() {
  if running; then say "running (SMTP 127.0.0.1:$SMTP_PORT, payments 127.0.0.1:$PAYMENTS_FAKE_PORT)"; else say "not running"; return 1; fi
}

case "${1:-status}" in
  start) start ;;
  stop) stop ;;
  status) status ;;
  *) echo "usage: scripts/fakes.sh start|stop|status" >&2; exit 2 ;;
esac
