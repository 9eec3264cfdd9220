#!/usr/bin/env bash
# `npm run start:production`: Cutline for real use. Unlike `npm start` it seeds no demo
# organization (its passwords are public), starts no private PostgreSQL cluster and keeps no
# development outbox: it needs your PostgreSQL server (with PostGIS) and your secrets, and runs
# behind a reverse proxy that terminates TLS (SECURITY.md, "Left to the deployment").
# The first organization and its administrator: `npm run org:create` (once).
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
cd "$ROOT"
missing=()
[ "${NODE_ENV:-}" = production ] || missing+=("NODE_ENV=production")
[ -n "${DATABASE_URL:-}" ] || missing+=("DATABASE_URL (your PostgreSQL server, with PostGIS)")
[ -n "${SESSION_SECRET:-}" ] || missing+=("SESSION_SECRET")
[ -n "${SIGNING_KEY_PASSPHRASE:-}" ] || missing+=("SIGNING_KEY_PASSPHRASE")
if [ ${#missing[@]} -gt 0 ]; then
  say "set these first (see SECURITY.md): ${missing[*]}"
  exit 2
fi
# Refuses the development secrets and bad settings before anything else happens.
node --import tsx -e "import('./server/config.ts').then((m) => m.loadConfig()).catch((e) => { console.error(e.message); process.exit(2); })" >/dev/null
docker-free-scripts/install-node-packages.sh
say "applying migrations"
node --import tsx server/db/migrate.ts
say "building the client"
npx vite build --logLevel error
# Workers solve the queued runs: WORKERS of them here (default 1); more on other machines with
# `npm run worker` (DEVELOPERS.md, "Runs: queue, workers, budgets").
pids=()
for _ in $(seq 1 "${WORKERS:-1}"); do
  node --import tsx server/worker.ts &
  pids+=($!)
done
trap 'kill "${pids[@]}" 2>/dev/null; wait "${pids[@]}" 2>/dev/null' EXIT INT TERM
node --import tsx server/index.ts
