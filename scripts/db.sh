#!/usr/bin/env bash
# Private PostgreSQL cluster on 127.0.0.1 for development and tests.
#   scripts/db.sh start   init (first time) and start; create the app role and databases
#   scripts/db.sh stop    stop the cluster
#   scripts/db.sh status
# PostgreSQL refuses to run as root, so as root the server runs as the `postgres` OS user.
set -euo pipefail
cd "$(dirname "$0")/.."
ROOT="$(pwd)"
PGPORT="${PGPORT:-54329}"
APP_USER=kerfbook
APP_PASSWORD="${KERFBOOK_DB_PASSWORD:-kerfbook}"
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
  # App role: not a superuser, so table grants and triggers bind it.
  psql_super -c "DO \$\$ BEGIN IF NOT EXISTS (SELECT 1 FROM pg_roles WHERE rolname = '$APP_USER') THEN CREATE ROLE $APP_USER LOGIN PASSWORD '$APP_PASSWORD' CREATEDB; END IF; END \$\$;"
  local db
  for db in ${KERFBOOK_DATABASES:-kerfbook kerfbook_test kerfbook_e2e}; do
    if [ -z "$(psql_super -c "SELECT 1 FROM pg_database WHERE datname = '$db'")" ]; then
      psql_super -c "CREATE DATABASE $db OWNER $APP_USER" >/dev/null
      echo "Created database $db"
    fi
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
