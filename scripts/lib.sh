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
