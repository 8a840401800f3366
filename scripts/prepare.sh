#!/usr/bin/env bash
# Everything a fresh machine needs before the app can run: Debian packages, npm packages.
#   scripts/prepare.sh [--with-browser | --for-kernel-bench]
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"

pkgs=(mariadb-server-core mariadb-client-core)
if [ "${1:-}" = "--with-browser" ]; then pkgs+=(chromium poppler-utils fonts-dejavu-core mariadb-client nginx-light); fi
ensure_debian_packages "${pkgs[@]}"
# The kernel benchmark's native baseline (OpenCASCADE's DRAW); without it the bench runs and says so.
if [ "${1:-}" = "--for-kernel-bench" ]; then (ensure_debian_packages occt-draw) || warn "occt-draw could not be installed: the kernel benchmark runs without its native baseline"; fi
ensure_node_modules
