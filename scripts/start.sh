#!/usr/bin/env bash
# npm start: everything needed to run Kerfbook with its demo shop on this machine.
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/ensure-deps.sh
bash scripts/db.sh start
npx tsx scripts/migrate.ts
npx tsx seed/run.ts
echo "Building the client..."
npx vite build --logLevel warn
# exec: Ctrl-C goes straight to the server, which shuts down gracefully.
# PostgreSQL keeps running for a fast restart; `npm run db:stop` stops it.
# A heap cap makes V8 collect early: the due pass creates much short-lived garbage (docs/performance.md).
# A larger young generation lets the short-lived objects of a request or an import row die there
# instead of being promoted and marked (import: a third less CPU); the old space gives up what
# the young one takes (three semi-spaces), so the whole heap stays under the cap.
HEAP_MB="${KERFBOOK_HEAP_MB:-512}"
SEMI_SPACE_MB="${KERFBOOK_SEMI_SPACE_MB:-32}"
export NODE_OPTIONS="--max-old-space-size=$((HEAP_MB - 3 * SEMI_SPACE_MB)) --max-semi-space-size=${SEMI_SPACE_MB} ${NODE_OPTIONS:-}"
exec npx tsx server/index.ts
