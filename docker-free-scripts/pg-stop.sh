#!/usr/bin/env bash
# Stops the private cluster if it runs.
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
BIN="$(pg_bin)"
if [ -f "$PGDATA_DIR/PG_VERSION" ] && as_pg "$BIN/pg_ctl" -D "$PGDATA_DIR" status >/dev/null 2>&1; then
  as_pg "$BIN/pg_ctl" -D "$PGDATA_DIR" -w -m fast stop >/dev/null
  say "PostgreSQL stopped"
fi
