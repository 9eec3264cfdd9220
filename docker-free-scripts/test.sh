#!/usr/bin/env bash
# `npm test`: installs what is missing, starts PostgreSQL, then type-checks, builds and runs
# every suite (unit, client, API against the real database, browser in Debian's Chromium).
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
cd "$ROOT"
docker-free-scripts/install-node-packages.sh
docker-free-scripts/install-system-packages.sh --tests
CUTLINE_PG_FAST=1 docker-free-scripts/pg-start.sh
export CUTLINE_TEST_DATABASE_BASE_URL="$(database_url '')"
say "auditing the shipped dependencies"
docker-free-scripts/audit.sh
say "checking the dependency rules (.dependency-cruiser.cjs)"
npm run --silent lint:deps
say "type-checking"
npx vue-tsc --build --force
say "building the client"
npx vite build --logLevel error
say "running the tests"
npx vitest run "$@"
