#!/usr/bin/env bash
# The local fake payment server (scripts/fake-payments.ts): start|stop|status, stopped by its own pid.
# Environment: PAYMENTS_FAKE_PORT (default 12111), STRIPE_SECRET_KEY / STRIPE_WEBHOOK_SECRET (the
# fake test keys by default; the app must see the same values).
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
cd "$ROOT"

PAYMENTS_FAKE_PORT="${PAYMENTS_FAKE_PORT:-12111}"
STATE="$ROOT/.data/fake-payments"
PIDFILE="$STATE/$PAYMENTS_FAKE_PORT.pid"
LOG="$STATE/$PAYMENTS_FAKE_PORT.log"

# Ours when the pid runs (not a zombie) and really is the payment fake on our port.
our_pid() {
  local pid
  pid="$(pid_from_file "$PIDFILE")" || return 1
  cmdline_has "$pid" fake-payments.ts && environ_has "$pid" "PAYMENTS_FAKE_PORT=$PAYMENTS_FAKE_PORT" || return 1
  echo "$pid"
}

start() {
  local pid
  if pid="$(our_pid)"; then say "payment fake already running (pid $pid, 127.0.0.1:$PAYMENTS_FAKE_PORT)"; return 0; fi
  if port_in_use "$PAYMENTS_FAKE_PORT"; then
    die "port $PAYMENTS_FAKE_PORT on 127.0.0.1 is taken by another program — stop it or choose another port with PAYMENTS_FAKE_PORT=…"
  fi
  mkdir -p "$STATE"
  rm -f "$PIDFILE"
  PAYMENTS_FAKE_PORT="$PAYMENTS_FAKE_PORT" PAYMENTS_FAKE_PIDFILE="$PIDFILE" \
    nohup node --import tsx scripts/fake-payments.ts >"$LOG" 2>&1 </dev/null &
  local i
  for i in $(seq 1 80); do
    if our_pid >/dev/null && port_in_use "$PAYMENTS_FAKE_PORT"; then
      say "payment fake on http://127.0.0.1:$PAYMENTS_FAKE_PORT (pid $(our_pid), log ${LOG#$ROOT/})"
      return 0
    fi
    sleep 0.25
  done
  tail -20 "$LOG" >&2
  die "the payment fake did not start within 20 s (its log above)"
}

stop() {
  local pid
  if ! pid="$(our_pid)"; then say "payment fake not running (port $PAYMENTS_FAKE_PORT)"; rm -f "$PIDFILE"; return 0; fi
  stop_pid "$pid" 4 || true
  rm -f "$PIDFILE"
  say "payment fake stopped (port $PAYMENTS_FAKE_PORT)"
}

status() {
  local pid
  if pid="$(our_pid)"; then echo "up pid=$pid port=$PAYMENTS_FAKE_PORT"; else echo "down port=$PAYMENTS_FAKE_PORT"; return 3; fi
}

case "${1:-}" in
  start) start ;;
  stop) stop ;;
  status) status ;;
  *) echo "usage: $0 start|stop|status" >&2; exit 2 ;;
esac
