#!/usr/bin/env bash
# npm run restore FILE — load a backup made by npm run backup into the configured database and
# upload folder. Refuses to overwrite a database that already holds tables unless RESTORE_FORCE=1.
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
cd "$ROOT"
FILE="${1:-}"
[ -n "$FILE" ] || die "usage: npm run restore FILE   (a .tar.gz made by npm run backup)"
[ -f "$FILE" ] || die "no such backup file: $FILE"
ensure_debian_packages mariadb-client-core

DB_PORT="${DB_PORT:-3406}"
DB_NAME="${DB_NAME:-platewright}"
DB_USER="${DB_USER:-platewright}"
DB_PASSWORD="${DB_PASSWORD:-platewright-local}"
UPLOAD_DIR="${UPLOAD_DIR:-$ROOT/.data/uploads}"

work="$(mktemp -d)"
trap 'rm -rf "$work"' EXIT
tar -xzf "$FILE" -C "$work" || die "$FILE is not a readable backup archive"
[ -f "$work/manifest.json" ] && [ -f "$work/db.sql" ] || die "$FILE is not a Platewright backup (no manifest.json / db.sql)"
grep -q '"format":"platewright-backup-1"' "$work/manifest.json" || die "$FILE has an unknown backup format"

export MYSQL_PWD="$DB_PASSWORD"
sql() { mariadb --no-defaults -h127.0.0.1 -P"$DB_PORT" -u"$DB_USER" "$@"; }
sql -e "SELECT 1" >/dev/null 2>&1 || die "the database on 127.0.0.1:$DB_PORT does not answer (npm run db:start)"
tables=$(sql -N -e "SELECT COUNT(*) FROM information_schema.tables WHERE table_schema='$DB_NAME'" 2>/dev/null || echo 0)
if [ "${tables:-0}" != 0 ] && [ "${RESTORE_FORCE:-}" != 1 ]; then
  die "database $DB_NAME already holds $tables tables; restore into an empty database, or set RESTORE_FORCE=1 to replace it"
fi
if [ "${tables:-0}" != 0 ]; then
  warn "RESTORE_FORCE=1: replacing the contents of $DB_NAME"
  sql -N -e "SELECT CONCAT('DROP TABLE IF EXISTS \`', table_name, '\`;') FROM information_schema.tables WHERE table_schema='$DB_NAME'" "$DB_NAME" \
    | { echo 'SET FOREIGN_KEY_CHECKS=0;'; cat; } | sql "$DB_NAME"
fi
sql -e "CREATE DATABASE IF NOT EXISTS \`$DB_NAME\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci" 2>/dev/null || true
sql "$DB_NAME" <"$work/db.sql" || die "loading the dump into $DB_NAME failed (nothing else was changed; the database may be partly loaded — restore again with RESTORE_FORCE=1)"
mkdir -p "$UPLOAD_DIR"
cp -a "$work/uploads/." "$UPLOAD_DIR/"
say "restored $FILE into $DB_NAME on 127.0.0.1:$DB_PORT ($(cat "$work/manifest.json"))"
