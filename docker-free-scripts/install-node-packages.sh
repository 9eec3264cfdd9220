#!/usr/bin/env bash
# Installs the npm packages from the lockfile when node_modules is missing or older than it.
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
cd "$ROOT"
marker=node_modules/.package-lock.json
if [ ! -f "$marker" ] || [ package-lock.json -nt "$marker" ]; then
  say "installing npm packages (npm ci)"
  npm ci --no-audit --no-fund --loglevel=error >&2
fi
