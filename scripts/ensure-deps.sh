#!/usr/bin/env bash
# Installs npm dependencies when they are missing or older than package-lock.json.
set -euo pipefail
cd "$(dirname "$0")/.."
if [ ! -f node_modules/.package-lock.json ] || [ package-lock.json -nt node_modules/.package-lock.json ]; then
  echo "Installing npm dependencies..."
  npm ci --no-audit --no-fund
fi
