#!/usr/bin/env bash
# Two Kerfbook instances on different loopback ports against one database, as behind a load
# balancer (sessions in PostgreSQL; the scheduled pass under an advisory lock). Ctrl-C stops both.
#   PORT_A (default 3001), PORT_B (default 3002); the database is the usual DATABASE_URL / PGPORT.
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/db.sh start
npx tsx scripts/migrate.ts
PORT_A="${PORT_A:-3001}" PORT_B="${PORT_B:-3002}"
PORT="$PORT_A" SMTP_PORT="${SMTP_PORT_A:-2526}" npx tsx server/index.ts & a=$!
PORT="$PORT_B" SMTP_PORT="${SMTP_PORT_B:-2527}" npx tsx server/index.ts & b=$!
# SIGTERM to both: each drains its requests and exits on its own.
trap 'kill -TERM "$a" "$b" 2>/dev/null; wait "$a" "$b"' INT TERM
echo "Instances at http://127.0.0.1:$PORT_A and http://127.0.0.1:$PORT_B (one database). Ctrl-C stops both."
wait "$a" "$b"
