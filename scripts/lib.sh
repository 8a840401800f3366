#!/usr/bin/env bash
# Shared helpers for the project's shell entry points. Sourced, not run.
set -euo pipefail

ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
export ROOT

say() { printf '\033[1;34m[platewright]\033[0m %s\n' "$*"; }
warn() { printf '\033[1;33m[platewright]\033[0m %s\n' "$*" >&2; }
die() { printf '\033[1;31m[platewright]\033[0m %s\n' "$*" >&2; exit 1; }

# ensure_debian_packages PKG... — install what is missing (as root), or say what to install.
ensure_debian_packages() {
  local missing=()
  local p
  for p in "$@"; do
    dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q 'install ok installed' || missing+=("$p")
  done
  [ ${#missing[@]} -eq 0 ] && return 0
  if [ "$(id -u)" -ne 0 ]; then
    die "missing Debian packages: ${missing[*]} — install them with: sudo apt-get install -y --no-install-recommends ${missing[*]}"
  fi
  say "installing Debian packages: ${missing[*]}"
  export DEBIAN_FRONTEND=noninteractive
  if ! apt-get install -y -qq --no-install-recommends "${missing[@]}" >/tmp/platewright-apt.log 2>&1; then
    apt-get update -qq >>/tmp/platewright-apt.log 2>&1 || true
    apt-get install -y -qq --no-install-recommends "${missing[@]}" >>/tmp/platewright-apt.log 2>&1 \
      || { tail -20 /tmp/platewright-apt.log >&2; die "could not install ${missing[*]} (log above)"; }
  fi
}

# ensure_node_modules — npm ci when node_modules is missing or older than the lock file.
ensure_node_modules() {
  cd "$ROOT"
  local stamp="node_modules/.platewright-lock"
  if [ -d node_modules ] && [ -f "$stamp" ] && cmp -s package-lock.json "$stamp"; then
    return 0
  fi
  say "installing npm packages (npm ci)"
  npm ci --no-audit --no-fund --loglevel=error
  cp package-lock.json "$stamp"
}

# ensure_build — astro build when sources are newer than the last build.
ensure_build() {
  cd "$ROOT"
  local dist="${PLATEWRIGHT_DIST:-dist}"
  local marker="$dist/.platewright-build"
  if [ -f "$marker" ] && [ -z "$(find src public templates astro.config.mjs package-lock.json scripts/lib.sh -newer "$marker" -print -quit 2>/dev/null)" ]; then
    return 0
  fi
  say "building the app"
  npx astro build >"/tmp/platewright-build-$$.log" 2>&1 || { tail -40 "/tmp/platewright-build-$$.log" >&2; die "build failed (log above)"; }
  touch "$marker"
}

# --- background processes of our own (the private MariaDB and the local fakes) ---

# pid_alive PID — the process runs and is not a zombie (a zombie keeps kill -0 true).
pid_alive() {
  [ -n "${1:-}" ] && [ -d "/proc/$1" ] || return 1
  [ "$(awk '/^State:/ {print $2}' "/proc/$1/status" 2>/dev/null)" != "Z" ]
}

# pid_from_file FILE — the pid in FILE when that process is alive.
pid_from_file() {
  [ -f "$1" ] || return 1
  local pid
  pid="$(cat "$1" 2>/dev/null)" || return 1
  pid_alive "$pid" || return 1
  echo "$pid"
}

# cmdline_has PID TEXT — the process's command line contains TEXT.
cmdline_has() { tr '\0' ' ' <"/proc/$1/cmdline" 2>/dev/null | grep -q -- "$2"; }

# environ_has PID NAME=VALUE — the process was started with exactly that variable.
environ_has() { tr '\0' '\n' <"/proc/$1/environ" 2>/dev/null | grep -qxF -- "$2"; }

# port_in_use PORT — something answers on 127.0.0.1:PORT.
port_in_use() {
  (exec 3<>"/dev/tcp/127.0.0.1/$1") 2>/dev/null && { exec 3>&- 3<&-; return 0; }
  return 1
}

# stop_pid PID SECONDS — SIGTERM, wait up to SECONDS, then SIGKILL. Returns 1 if it had to kill.
stop_pid() {
  local pid="$1" limit=$(( ${2:-10} * 10 )) i
  kill "$pid" 2>/dev/null || true
  for i in $(seq 1 "$limit"); do pid_alive "$pid" || return 0; sleep 0.1; done
  kill -9 "$pid" 2>/dev/null || true
  return 1
}
