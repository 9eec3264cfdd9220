#!/usr/bin/env bash
# Creates (first time) and starts the private PostgreSQL cluster on 127.0.0.1:$CUTLINE_PG_PORT,
# then makes sure the databases named as arguments exist. Idempotent.
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
"$ROOT/docker-free-scripts/install-system-packages.sh"
BIN="$(pg_bin)"

# The postgres user must be able to reach the data directory through every parent folder.
if [ "$(id -u)" -eq 0 ] && ! runuser -u postgres -- test -x "$(dirname "$PGDATA_DIR")"; then
  say "the postgres user cannot traverse $(dirname "$PGDATA_DIR"); opening parent folders with o+x"
  d="$(dirname "$PGDATA_DIR")"
  while [ "$d" != "/" ]; do chmod o+x "$d"; d="$(dirname "$d")"; done
fi

if [ ! -f "$PGDATA_DIR/PG_VERSION" ]; then
  say "creating the cluster in $PGDATA_DIR"
  mkdir -p "$PGDATA_DIR"
  [ "$(id -u)" -eq 0 ] && chown postgres:postgres "$PGDATA_DIR"
  chmod 700 "$PGDATA_DIR"
  as_pg "$BIN/initdb" -D "$PGDATA_DIR" -U postgres --auth=trust -E UTF8 --locale=C.UTF-8 >/dev/null
fi

if as_pg "$BIN/pg_ctl" -D "$PGDATA_DIR" status >/dev/null 2>&1; then
  : # already running
else
  if (exec 3<>/dev/tcp/127.0.0.1/"$CUTLINE_PG_PORT") 2>/dev/null; then
    say "port $CUTLINE_PG_PORT is taken by another server; set CUTLINE_PG_PORT to a free port"; exit 1
  fi
  # TCP only: a Unix socket path over 107 bytes would stop the server in a deep checkout.
  # fsync and friends are off for speed when CUTLINE_PG_FAST=1 (tests only).
  opts="-p $CUTLINE_PG_PORT -c listen_addresses=127.0.0.1 -c unix_socket_directories="
  [ "${CUTLINE_PG_FAST:-0}" = "1" ] && opts="$opts -c fsync=off -c synchronous_commit=off -c full_page_writes=off"
  as_pg "$BIN/pg_ctl" -D "$PGDATA_DIR" -w -t 60 -l "$PGDATA_DIR/server.log" -o "$opts" start >/dev/null
  say "PostgreSQL $(pg_version) listening on 127.0.0.1:$CUTLINE_PG_PORT"
fi

for db in "$@"; do
  exists="$("$BIN/psql" -h 127.0.0.1 -p "$CUTLINE_PG_PORT" -U postgres -d postgres -tAc "SELECT 1 FROM pg_database WHERE datname='$db'")"
  [ "$exists" = "1" ] || "$BIN/psql" -h 127.0.0.1 -p "$CUTLINE_PG_PORT" -U postgres -d postgres -qc "CREATE DATABASE \"$db\"" >/dev/null
done
