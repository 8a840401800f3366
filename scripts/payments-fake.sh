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
  [ -f "$PIDFILE" ] || return 1
  local pid state
  pid="$(cat "$PIDFILE" 2>/dev/null)" || return 1
  [ -n "$pid" ] && [ -d "/proc/$pid" ] || return 1
  state="$(awk '/^State:/ {print $2}' "/proc/$pid/status" 2>/dev/null)"
  [ "$state" != "Z" ] || return 1
  tr '\0' ' ' <"/proc/$pid/cmdline" 2>/dev/null | grep -q -- "fake-payments.ts" || return 1
  tr '\0' '\n' <"/proc/$pid/environ" 2>/dev/null | grep -qx -- "PAYMENTS_FAKE_PORT=$PAYMENTS_FAKE_PORT" || return 1
  echo "$pid"
}

port_in_use() {
  (exec 3<>"/dev/tcp/127.0.0.1/$PAYMENTS_FAKE_PORT") 2>/dev/null && { exec 3>&- 3<&-; return 0; }
  return 1
}

start() {
  local pid
  if pid="$(our_pid)"; then say "payment fake already running (pid $pid, 127.0.0.1:$PAYMENTS_FAKE_PORT)"; return 0; fi
  if port_in_use; then
    die "port $PAYMENTS_FAKE_PORT on 127.0.0.1 is taken by another program — stop it or choose another port with PAYMENTS_FAKE_PORT=…"
  fi
  mkdir -p "$STATE"
  rm -f "$PIDFILE"
  PAYMENTS_FAKE_PORT="$PAYMENTS_FAKE_PORT" PAYMENTS_FAKE_PIDFILE="$PIDFILE" \
    nohup node --import tsx scripts/fake-payments.ts >"$LOG" 2>&1 </dev/null &
  local i
  for i in $(seq 1 80); do
    if our_pid >/dev/null && port_in_use; then
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
  kill "$pid" 2>/dev/null || true
  local i
  for i in $(seq 1 40); do
    [ -d "/proc/$pid" ] && [ "$(awk '/^State:/ {print $2}' "/proc/$pid/status" 2>/dev/null)" != "Z" ] || break
    sleep 0.1
  done
  [ -d "/proc/$pid" ] && kill -9 "$pid" 2>/dev/null || true
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
