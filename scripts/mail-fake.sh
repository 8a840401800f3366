#!/usr/bin/env bash
# The local mail catcher (scripts/fake-smtp.ts): start|stop|status, stopped by its own pid.
# Environment: MAIL_FAKE_PORT (default 2526), MAIL_FAKE_DIR (default .data/mail).
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
cd "$ROOT"

MAIL_FAKE_PORT="${MAIL_FAKE_PORT:-2526}"
MAIL_FAKE_DIR="${MAIL_FAKE_DIR:-$ROOT/.data/mail}"
case "$MAIL_FAKE_DIR" in /*) ;; *) MAIL_FAKE_DIR="$ROOT/$MAIL_FAKE_DIR" ;; esac
STATE="$ROOT/.data/fake-smtp"
PIDFILE="$STATE/$MAIL_FAKE_PORT.pid"
LOG="$STATE/$MAIL_FAKE_PORT.log"

# Ours when the pid runs (not a zombie) and really is the catcher on our port and folder.
our_pid() {
  local pid
  pid="$(pid_from_file "$PIDFILE")" || return 1
  cmdline_has "$pid" fake-smtp.ts && environ_has "$pid" "MAIL_FAKE_PORT=$MAIL_FAKE_PORT" && environ_has "$pid" "MAIL_FAKE_DIR=$MAIL_FAKE_DIR" || return 1
  echo "$pid"
}

start() {
  local pid
  if pid="$(our_pid)"; then say "mail catcher already running (pid $pid, 127.0.0.1:$MAIL_FAKE_PORT)"; return 0; fi
  if port_in_use "$MAIL_FAKE_PORT"; then
    die "port $MAIL_FAKE_PORT on 127.0.0.1 is taken by another program — stop it or choose another port with MAIL_FAKE_PORT=…"
  fi
  mkdir -p "$STATE" "$MAIL_FAKE_DIR"
  rm -f "$PIDFILE"
  MAIL_FAKE_PORT="$MAIL_FAKE_PORT" MAIL_FAKE_DIR="$MAIL_FAKE_DIR" MAIL_FAKE_PIDFILE="$PIDFILE" \
    nohup node --import tsx scripts/fake-smtp.ts >"$LOG" 2>&1 </dev/null &
  local i
  for i in $(seq 1 80); do
    if our_pid >/dev/null && port_in_use "$MAIL_FAKE_PORT"; then
      say "mail catcher on 127.0.0.1:$MAIL_FAKE_PORT (pid $(our_pid), messages in ${MAIL_FAKE_DIR#$ROOT/})"
      return 0
    fi
    sleep 0.25
  done
  tail -20 "$LOG" >&2
  die "the mail catcher did not start within 20 s (its log above)"
}

stop() {
  local pid
  if ! pid="$(our_pid)"; then say "mail catcher not running (port $MAIL_FAKE_PORT)"; rm -f "$PIDFILE"; return 0; fi
  stop_pid "$pid" 4 || true
  rm -f "$PIDFILE"
  say "mail catcher stopped (port $MAIL_FAKE_PORT)"
}

status() {
  local pid
  if pid="$(our_pid)"; then echo "up pid=$pid port=$MAIL_FAKE_PORT dir=$MAIL_FAKE_DIR"; else echo "down port=$MAIL_FAKE_PORT dir=$MAIL_FAKE_DIR"; return 3; fi
}

case "${1:-}" in
  start) start ;;
  stop) stop ;;
  status) status ;;
  *) echo "usage: $0 start|stop|status" >&2; exit 2 ;;
esac
