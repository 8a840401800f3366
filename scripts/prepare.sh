#!/usr/bin/env bash
# Everything a fresh machine needs before the app can run: Debian packages, npm packages.
#   scripts/prepare.sh [--with-browser]
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"

pkgs=(mariadb-server-core mariadb-client-core)
if [ "${1:-}" = "--with-browser" ]; then pkgs+=(chromium poppler-utils fonts-dejavu-core mariadb-client nginx-light); fi
ensure_debian_packages "${pkgs[@]}"
ensure_node_modules
