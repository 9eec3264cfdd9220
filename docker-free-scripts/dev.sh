#!/usr/bin/env bash
# `npm run dev`: API with reload on 3000 and Vite's dev server on 5173 (proxying /api).
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
cd "$ROOT"
docker-free-scripts/install-node-packages.sh
docker-free-scripts/pg-start.sh cutline
export DATABASE_URL="${DATABASE_URL:-$(database_url cutline)}"
node --import tsx server/db/migrate.ts
node --import tsx server/seed/run.ts
npx tsx watch server/index.ts &
api=$!
node --import tsx server/worker.ts &
worker=$!
trap 'kill $api $worker 2>/dev/null' EXIT
npx vite
