#!/usr/bin/env bash
# Backups of the Kerfbook database with Debian's pg_dump/pg_restore (the installed postgresql package).
#   scripts/db-backup.sh backup [file]          custom-format dump (default .data/backups/kerfbook-<UTC time>.dump)
#   scripts/db-backup.sh restore <file> [db]    into an EMPTY database (default KERFBOOK_DB or kerfbook), then
#                                               applies newer migrations, grants the app role its privileges
#                                               and ends every session the dump carried
# Both connect as the owner role: MIGRATION_DATABASE_URL, or the private cluster's kerfbook_owner
# on 127.0.0.1:$PGPORT. The dump holds the whole public schema: tables, sessions, the sign-off
# chain and its append-only triggers.
set -euo pipefail
cd "$(dirname "$0")/.."
PGPORT="${PGPORT:-54329}"

find_pg_bin() {
  local d
  for d in /usr/lib/postgresql/*/bin; do
    [ -x "$d/pg_dump" ] && { echo "$d"; return 0; }
  done
  echo "pg_dump is missing. Install it with: sudo apt-get install -y postgresql" >&2
  return 1
}

owner_url() { # database name
  if [ -n "${MIGRATION_DATABASE_URL:-}" ]; then
    # Same server and role, the named database.
    printf '%s\n' "${MIGRATION_DATABASE_URL%/*}/$1"
  else
    printf 'postgres://kerfbook_owner:%s@127.0.0.1:%s/%s\n' "${KERFBOOK_DB_OWNER_PASSWORD:-kerfbook-owner}" "$PGPORT" "$1"
  fi
}

default_db() {
  if [ -n "${MIGRATION_DATABASE_URL:-}" ]; then local u="${MIGRATION_DATABASE_URL##*/}"; echo "${u%%\?*}"; else echo "${KERFBOOK_DB:-kerfbook}"; fi
}

backup() {
  local bin; bin="$(find_pg_bin)"
  local db; db="$(default_db)"
  local file="${1:-.data/backups/kerfbook-$(date -u +%Y%m%dT%H%M%SZ).dump}"
  mkdir -p "$(dirname "$file")"
  "$bin/pg_dump" --format=custom --no-owner --no-privileges --schema=public --file="$file" "$(owner_url "$db")"
  echo "Backup of $db written to $file ($(du -h "$file" | cut -f1))"
}

restore() {
  local file="${1:?usage: scripts/db-backup.sh restore <file> [database]}"
  local db="${2:-$(default_db)}"
  [ -f "$file" ] || { echo "No such backup: $file" >&2; exit 1; }
  local bin; bin="$(find_pg_bin)"
  local url; url="$(owner_url "$db")"
  local tables
  tables="$("$bin/psql" "$url" -qtAc "select count(*) from pg_tables where schemaname = 'public'")"
  if [ "$tables" != 0 ]; then
    echo "Database $db is not empty ($tables tables). Restore into a new database, or empty this one first:" >&2
    echo "  psql \"<owner url>\" -c 'drop schema public cascade; create schema public;'" >&2
    exit 1
  fi
  # --clean --if-exists: the dump recreates the (empty) public schema; one transaction, all or nothing.
  "$bin/pg_restore" --no-owner --no-privileges --clean --if-exists --single-transaction --exit-on-error -d "$url" "$file"
  # Sessions in the dump were live when it was taken; a restored server must not honour them
  # (a stolen or since-revoked sign-in would come back), so everyone signs in again.
  "$bin/psql" "$url" -qtAc 'delete from session' >/dev/null
  # Migrations newer than the backup, and the app role's privileges (the dump carries none).
  local app_url="${DATABASE_URL:-postgres://kerfbook:${KERFBOOK_DB_PASSWORD:-kerfbook}@127.0.0.1:$PGPORT/$db}"
  DATABASE_URL="${app_url%/*}/$db" MIGRATION_DATABASE_URL="$url" npx tsx scripts/migrate.ts
  echo "Restored $file into $db"
}

case "${1:-}" in
  backup) shift; backup "$@" ;;
  restore) shift; restore "$@" ;;
  *) echo "usage: scripts/db-backup.sh backup [file] | restore <file> [database]" >&2; exit 2 ;;
esac
