#!/usr/bin/env bash
# npm run backup [FILE] — one archive with the database (every revision, review, released file)
# and the stored uploads. Consistent: one transaction for the dump.
# Environment as for scripts/db.sh (DB_PORT, DB_DIR, DB_NAME, DB_USER, DB_PASSWORD) and UPLOAD_DIR.
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
cd "$ROOT"
ensure_debian_packages mariadb-client

DB_PORT="${DB_PORT:-3406}"
DB_NAME="${DB_NAME:-platewright}"
DB_USER="${DB_USER:-platewright}"
DB_PASSWORD="${DB_PASSWORD:-platewright-local}"
UPLOAD_DIR="${UPLOAD_DIR:-$ROOT/.data/uploads}"
OUT="${1:-$ROOT/.data/backups/platewright-$(date -u +%Y%m%dT%H%M%SZ).tar.gz}"
mkdir -p "$(dirname "$OUT")"

work="$(mktemp -d)"
trap 'rm -rf "$work"' EXIT
export MYSQL_PWD="$DB_PASSWORD"
mariadb-dump --no-defaults -h127.0.0.1 -P"$DB_PORT" -u"$DB_USER" --single-transaction --triggers --routines \
  --hex-blob --default-character-set=utf8mb4 --skip-lock-tables "$DB_NAME" >"$work/db.sql" \
  || die "mariadb-dump failed: is the database running on 127.0.0.1:$DB_PORT? (npm run db:start)"
mkdir -p "$work/uploads"
if [ -d "$UPLOAD_DIR" ]; then cp -a "$UPLOAD_DIR/." "$work/uploads/"; fi
revisions=$(mariadb --no-defaults -h127.0.0.1 -P"$DB_PORT" -u"$DB_USER" -N -e "SELECT COUNT(*) FROM revisions" "$DB_NAME")
artifacts=$(mariadb --no-defaults -h127.0.0.1 -P"$DB_PORT" -u"$DB_USER" -N -e "SELECT COUNT(*) FROM artifacts" "$DB_NAME")
cat >"$work/manifest.json" <<JSON
{"format":"platewright-backup-1","createdAt":"$(date -u +%Y-%m-%dT%H:%M:%SZ)","database":"$DB_NAME","revisions":$revisions,"artifacts":$artifacts,"uploadFiles":$(find "$work/uploads" -type f | wc -l)}
JSON
tar -czf "$OUT" -C "$work" manifest.json db.sql uploads
say "backup written: $OUT ($revisions revisions, $artifacts stored files)"
