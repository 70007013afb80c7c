#!/usr/bin/env bash
# Private PostgreSQL cluster on 127.0.0.1 for development and tests.
#   scripts/db.sh start   init (first time) and start; create the owner and app roles and databases
# Two roles: the owner (kerfbook_owner) owns the schema and runs migrations; the app role
# (kerfbook) the server connects as has only the table privileges the migration grants it,
# so it cannot alter, disable or drop triggers and constraints. Re-running upgrades a cluster
# made when the app role owned everything.
#   scripts/db.sh stop    stop the cluster
#   scripts/db.sh status
# PostgreSQL refuses to run as root, so as root the server runs as the `postgres` OS user.
set -euo pipefail
cd "$(dirname "$0")/.."
ROOT="$(pwd)"
PGPORT="${PGPORT:-54329}"
APP_USER=kerfbook
APP_PASSWORD="${KERFBOOK_DB_PASSWORD:-kerfbook}"
OWNER_USER=kerfbook_owner
OWNER_PASSWORD="${KERFBOOK_DB_OWNER_PASSWORD:-kerfbook-owner}"
SUPER_PASSWORD="${KERFBOOK_DB_SUPER_PASSWORD:-kerfbook-super}"

find_pg_bin() {
  local d
  for d in /usr/lib/postgresql/*/bin; do
    [ -x "$d/pg_ctl" ] && { echo "$d"; return 0; }
  done
  return 1
}

ensure_postgres_installed() {
  if PG_BIN="$(find_pg_bin)"; then return 0; fi
  if [ "$(id -u)" != 0 ]; then
    echo "PostgreSQL server binaries are missing. Install them with: sudo apt-get install -y postgresql" >&2
    exit 1
  fi
  echo "Installing PostgreSQL from Debian's packages..."
  export DEBIAN_FRONTEND=noninteractive
  apt-get update -qq
  apt-get install -y -qq postgresql >/dev/null
  # Debian's package starts its own cluster on 5432; ours runs beside it on $PGPORT.
  PG_BIN="$(find_pg_bin)"
}

# Where the cluster lives: .data/pg, unless we run as root and the postgres user cannot
# reach the project folder (e.g. under /root); then a temporary folder keyed by the path.
data_dir() {
  if [ -n "${KERFBOOK_PGDATA:-}" ]; then echo "$KERFBOOK_PGDATA"; return 0; fi # a second cluster (fault tests)
  local dir="$ROOT/.data/pg"
  if [ "$(id -u)" = 0 ] && ! runuser -u postgres -- test -x "$ROOT" 2>/dev/null; then
    local key; key="$(printf '%s' "$ROOT" | sha256sum | cut -c1-12)"
    dir="/tmp/kerfbook-pg-$key"
  fi
  echo "$dir"
}

as_pg() {
  if [ "$(id -u)" = 0 ]; then (cd / && runuser -u postgres -- "$@"); else "$@"; fi
}

psql_super() {
  PGPASSWORD="$SUPER_PASSWORD" "$PG_BIN/psql" -h 127.0.0.1 -p "$PGPORT" -U postgres -d postgres -v ON_ERROR_STOP=1 -qtA "$@"
}

psql_super_in() {
  local db="$1"; shift
  PGPASSWORD="$SUPER_PASSWORD" "$PG_BIN/psql" -h 127.0.0.1 -p "$PGPORT" -U postgres -d "$db" -v ON_ERROR_STOP=1 -qtA "$@"
}

ensure_role() { # name password attributes
  psql_super -c "DO \$\$ BEGIN IF NOT EXISTS (SELECT 1 FROM pg_roles WHERE rolname = '$1') THEN CREATE ROLE $1 LOGIN PASSWORD '$2'; END IF; END \$\$;"
  psql_super -c "ALTER ROLE $1 $3"
}

start() {
  ensure_postgres_installed
  local dir; dir="$(data_dir)"
  mkdir -p "$dir"
  if [ "$(id -u)" = 0 ]; then chown postgres:postgres "$dir"; chmod 700 "$dir"; fi
  if [ ! -f "$dir/PG_VERSION" ]; then
    echo "Creating the PostgreSQL cluster in $dir"
    local pw; pw="$(mktemp)"; printf '%s\n' "$SUPER_PASSWORD" > "$pw"
    [ "$(id -u)" = 0 ] && chown postgres "$pw"
    as_pg "$PG_BIN/initdb" -D "$dir" -U postgres --auth=scram-sha-256 --pwfile="$pw" -E UTF8 --locale=C.UTF-8 >/dev/null
    rm -f "$pw"
    cat >> "$dir/postgresql.conf" <<CONF
listen_addresses = '127.0.0.1'
port = $PGPORT
unix_socket_directories = ''
max_connections = 200
fsync = ${KERFBOOK_DB_FSYNC:-on}
CONF
  fi
  if as_pg "$PG_BIN/pg_ctl" -D "$dir" status >/dev/null 2>&1; then
    echo "PostgreSQL already running on 127.0.0.1:$PGPORT"
  elif (exec 3<>"/dev/tcp/127.0.0.1/$PGPORT") 2>/dev/null; then
    # Another checkout's cluster with the same credentials is fine to share; anything else is not.
    if psql_super -c 'select 1' >/dev/null 2>&1; then
      echo "Using the Kerfbook PostgreSQL already listening on 127.0.0.1:$PGPORT"
    else
      echo "Port $PGPORT is taken by another program. Set PGPORT to a free port and try again." >&2
      exit 1
    fi
  else
    as_pg "$PG_BIN/pg_ctl" -D "$dir" -l "$dir/server.log" -o "-p $PGPORT" -w -t 60 start >/dev/null
    echo "PostgreSQL started on 127.0.0.1:$PGPORT (data: $dir)"
  fi
  # Neither role is a superuser, so grants and triggers bind both; only the owner may change the schema.
  ensure_role "$OWNER_USER" "$OWNER_PASSWORD" "NOSUPERUSER CREATEDB"
  ensure_role "$APP_USER" "$APP_PASSWORD" "NOSUPERUSER NOCREATEDB"
  local db
  for db in ${KERFBOOK_DATABASES:-kerfbook kerfbook_test kerfbook_e2e}; do
    if [ -z "$(psql_super -c "SELECT 1 FROM pg_database WHERE datname = '$db'")" ]; then
      psql_super -c "CREATE DATABASE $db OWNER $OWNER_USER" >/dev/null
      echo "Created database $db"
    fi
    # Upgrade: a database (and its tables) made when the app role owned them passes to the owner.
    # The next migration run grants the app role its privileges again.
    if [ -n "$(psql_super -c "SELECT 1 FROM pg_database d JOIN pg_roles r ON r.oid = d.datdba WHERE d.datname = '$db' AND r.rolname <> '$OWNER_USER'")" ]; then
      psql_super -c "ALTER DATABASE $db OWNER TO $OWNER_USER"
      echo "Database $db now belongs to $OWNER_USER"
    fi
    psql_super_in "$db" -c "REASSIGN OWNED BY $APP_USER TO $OWNER_USER"
  done
}

stop() {
  PG_BIN="$(find_pg_bin)" || { echo "PostgreSQL is not installed"; return 0; }
  local dir; dir="$(data_dir)"
  if [ -f "$dir/PG_VERSION" ] && as_pg "$PG_BIN/pg_ctl" -D "$dir" status >/dev/null 2>&1; then
    as_pg "$PG_BIN/pg_ctl" -D "$dir" -m fast -w stop >/dev/null
    echo "PostgreSQL stopped"
  else
    echo "PostgreSQL was not running"
  fi
}

status() {
  PG_BIN="$(find_pg_bin)" || { echo "not installed"; return 1; }
  as_pg "$PG_BIN/pg_ctl" -D "$(data_dir)" status
}

case "${1:-start}" in
  start) start ;;
  stop) stop ;;
  status) status ;;
  *) echo "usage: scripts/db.sh start|stop|status" >&2; exit 2 ;;
esac
