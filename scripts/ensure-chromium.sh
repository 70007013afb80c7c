#!/usr/bin/env bash
# Browser tests use Debian's Chromium; Playwright never downloads a browser here.
set -euo pipefail
if [ -x /usr/bin/chromium ]; then exit 0; fi
if [ "$(id -u)" != 0 ]; then
  echo "Chromium is missing. Install it with: sudo apt-get install -y chromium" >&2
  exit 1
fi
echo "Installing Chromium from Debian's packages..."
export DEBIAN_FRONTEND=noninteractive
apt-get update -qq
apt-get install -y -qq chromium >/dev/null
