#!/usr/bin/env bash
# Backup and restore of the database and the stored files.
#   scripts/backup.sh create [OUT_DIR]          writes OUT_DIR (default backups/<timestamp>) with
#                                               db.sql, files.tar and manifest.txt
#   scripts/backup.sh restore BACKUP_DIR        loads db.sql into $DB_NAME (which must be empty or
#                                               absent) and unpacks files.tar into $STORAGE_DIR
# Uses $DB_HOST/$DB_PORT/$DB_USER/$DB_PASSWORD/$DB_NAME and $STORAGE_DIR like the app. Files kept in
# S3-compatible storage are not included: back those up with the bucket's own tools.
set -euo pipefail
cd "$(dirname "$0")/.."
export PATH="$PATH:/usr/sbin"
. scripts/read-env.sh

DB_HOST=${DB_HOST:-127.0.0.1}
DB_PORT=${DB_PORT:-3307}
DB_USER=${DB_USER:-app}
DB_NAME=${DB_NAME:-platewright}
STORAGE_DIR=${STORAGE_DIR:-.data/files}
export MYSQL_PWD=${DB_PASSWORD:-platewright-dev}   # read by the clients; keeps it out of `ps`

client_args=(--no-defaults --protocol=tcp -h"$DB_HOST" -P"$DB_PORT" -u"$DB_USER")
die() { printf 'backup: error: %s\n' "$*" >&2; exit 1; }

create() {
  local out=${1:-backups/$(date -u +%Y%m%d-%H%M%S)}
  mkdir -p "$out"
  mariadb-dump "${client_args[@]}" --single-transaction --skip-lock-tables --routines --triggers \
    --hex-blob --default-character-set=utf8mb4 "$DB_NAME" > "$out/db.sql.partial"
  mv "$out/db.sql.partial" "$out/db.sql"
  if [ -d "$STORAGE_DIR" ]; then
    tar -C "$STORAGE_DIR" -cf "$out/files.tar" --exclude='./.tmp' .
  else
    tar -cf "$out/files.tar" -T /dev/null
  fi
  {
    echo "database $DB_NAME"
    echo "created $(date -u +%FT%TZ)"
    mariadb "${client_args[@]}" -N -e "SELECT CONCAT('rows ', table_name, ' ', table_rows) FROM information_schema.tables WHERE table_schema = '$DB_NAME'" 
    (cd "$STORAGE_DIR" 2>/dev/null && find . -type f ! -path './.tmp/*' -print0 | sort -z | xargs -0 -r sha256sum | sed 's/^/file /') || true
  } > "$out/manifest.txt"
  echo "backup: wrote $out"
}

restore() {
  local dir=${1:-}
  [ -n "$dir" ] && [ -f "$dir/db.sql" ] || die "usage: scripts/backup.sh restore BACKUP_DIR (with db.sql in it)"
  local tables
  tables=$(mariadb "${client_args[@]}" -N -e "SELECT COUNT(*) FROM information_schema.tables WHERE table_schema = '$DB_NAME'")
  [ "$tables" = 0 ] || die "database $DB_NAME is not empty ($tables tables); restore only into an empty one"
  mariadb "${client_args[@]}" -e "CREATE DATABASE IF NOT EXISTS \`$DB_NAME\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci"
  mariadb "${client_args[@]}" "$DB_NAME" < "$dir/db.sql"
  mkdir -p "$STORAGE_DIR"
  [ -f "$dir/files.tar" ] && tar -C "$STORAGE_DIR" -xf "$dir/files.tar"
  echo "backup: restored $dir into database $DB_NAME and $STORAGE_DIR"
}

case "${1:-}" in
  create) shift; create "$@" ;;
  restore) shift; restore "$@" ;;
  *) die "usage: scripts/backup.sh create [OUT_DIR] | restore BACKUP_DIR" ;;
esac
