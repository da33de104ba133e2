#!/usr/bin/env bash
# Installs the npm dependencies when node_modules is missing or older than the lockfile.
set -euo pipefail
cd "$(dirname "$0")/.."
if [ ! -d node_modules ] || [ package-lock.json -nt node_modules/.package-lock.json ]; then
  echo "Installing npm dependencies (npm ci)"
  npm ci --no-audit --no-fund
fi
