#!/usr/bin/env bash
# Installs everything Sluice needs on a fresh machine: the npm dependencies from the lock
# file and, with --browser, Debian's chromium for the headless page tests.
set -euo pipefail
cd "$(dirname "$0")/.."
npm ci --no-audit --no-fund
if [[ "${1:-}" == "--browser" ]] && ! command -v chromium >/dev/null 2>&1; then
  if command -v apt-get >/dev/null 2>&1 && [[ "$(id -u)" == "0" ]]; then
    echo "setup: installing Debian's chromium for the page tests" >&2
    apt-get update -qq >/dev/null
    DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium >/dev/null
  else
    echo "setup: chromium is missing and cannot be installed here (needs root and apt-get); page tests will fail" >&2
  fi
fi
