#!/usr/bin/env bash
# `npm start`: everything needed to use Cutline on its demo data, on one port.
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
cd "$ROOT"
docker-free-scripts/install-node-packages.sh
docker-free-scripts/pg-start.sh cutline
export DATABASE_URL="${DATABASE_URL:-$(database_url cutline)}"
say "applying migrations"
node --import tsx server/db/migrate.ts
say "seeding the demo organization"
node --import tsx server/seed/run.ts
say "building the client"
npx vite build --logLevel error
# One worker solves the queued runs; add more with `npm run worker` (see DEVELOPERS.md).
node --import tsx server/worker.ts &
worker=$!
trap 'kill $worker 2>/dev/null; wait $worker 2>/dev/null' EXIT INT TERM
node --import tsx server/index.ts
