#!/usr/bin/env bash
# npm run dev: Vite with hot reload on :5173 (proxying /api) and the server in watch mode on :3000.
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/ensure-deps.sh
bash scripts/db.sh start
npx tsx scripts/migrate.ts
npx tsx seed/run.ts
exec npx concurrently -k -n server,client -c blue,green "tsx watch server/index.ts" "vite"
