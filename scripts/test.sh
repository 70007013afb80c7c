#!/usr/bin/env bash
# npm test: every test — domain units, API integration against PostgreSQL, browser end-to-end.
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/ensure-deps.sh
bash scripts/ensure-chromium.sh
bash scripts/db.sh start
echo "== Types, import boundaries and formatting"
npx tsc --noEmit -p tsconfig.json
npm run -s lint
echo "== Unit and API tests (Vitest)"
npx vitest run
echo "== Build the client"
npx vite build --logLevel warn
echo "== Browser tests (Playwright, Debian Chromium)"
npx playwright test
