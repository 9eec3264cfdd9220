#!/usr/bin/env bash
# Restores a backup made by backup.sh into a database, replacing what it holds.
# Stop the server and workers first.   restore.sh FILE [DATABASE]   default database: cutline
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
file="${1:?usage: restore.sh FILE [DATABASE]}"
db="${2:-cutline}"
[ -f "$file" ] || { say "no backup file $file"; exit 1; }
BIN="$(pg_bin)"
psql_admin() { "$BIN/psql" -h 127.0.0.1 -p "$CUTLINE_PG_PORT" -U postgres -d postgres -v ON_ERROR_STOP=1 -qc "$1"; }
psql_admin "DROP DATABASE IF EXISTS \"$db\" WITH (FORCE)"
psql_admin "CREATE DATABASE \"$db\""
"$BIN/pg_restore" -h 127.0.0.1 -p "$CUTLINE_PG_PORT" -U postgres -d "$db" --no-owner --exit-on-error "$file"
say "restored $file into $db"
