#!/usr/bin/env bash
# Restores a backup made by backup.sh into a database, replacing what it holds — only once the
# backup has been read whole: the file's table of contents is checked (pg_restore --list), the
# backup is restored into a scratch database in one transaction, and only on success is the
# scratch database swapped in under the database's name (two renames in one transaction). A
# truncated or corrupt file, or a full disk, leaves the database as it was.
# Stop the server and workers first.   restore.sh FILE [DATABASE]   default database: cutline
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
file="${1:?usage: restore.sh FILE [DATABASE]}"
db="${2:-cutline}"
[ -f "$file" ] || { say "no backup file $file"; exit 1; }
BIN="$(pg_bin)"
psql_admin() { "$BIN/psql" -h 127.0.0.1 -p "$CUTLINE_PG_PORT" -U postgres -d postgres -v ON_ERROR_STOP=1 -qAtc "$1"; }
scratch="${db:0:40}_restore_$$"
old="${db:0:40}_replaced_$$"

if ! "$BIN/pg_restore" --list "$file" >/dev/null 2>&1; then
  say "$file is not a readable backup (pg_restore --list failed); $db is unchanged"
  exit 1
fi

cleanup() { psql_admin "DROP DATABASE IF EXISTS \"$scratch\" WITH (FORCE)" >/dev/null 2>&1 || true; }
trap cleanup EXIT
psql_admin "DROP DATABASE IF EXISTS \"$scratch\" WITH (FORCE)"
psql_admin "CREATE DATABASE \"$scratch\""
if ! "$BIN/pg_restore" -h 127.0.0.1 -p "$CUTLINE_PG_PORT" -U postgres -d "$scratch" --no-owner --exit-on-error --single-transaction "$file"; then
  say "restoring $file failed; $db is unchanged"
  exit 1
fi

# The swap: no one may be connected to the database while it is renamed.
exists="$(psql_admin "SELECT 1 FROM pg_database WHERE datname = '$db'")"
if [ "$exists" = 1 ]; then
  psql_admin "ALTER DATABASE \"$db\" WITH ALLOW_CONNECTIONS false"
  psql_admin "SELECT pg_terminate_backend(pid) FROM pg_stat_activity WHERE datname = '$db'" >/dev/null
  psql_admin "BEGIN; ALTER DATABASE \"$db\" RENAME TO \"$old\"; ALTER DATABASE \"$scratch\" RENAME TO \"$db\"; COMMIT;" || {
    psql_admin "ALTER DATABASE \"$db\" WITH ALLOW_CONNECTIONS true"
    say "could not swap the restored database in; $db is unchanged"
    exit 1
  }
  psql_admin "DROP DATABASE \"$old\" WITH (FORCE)"
else
  psql_admin "ALTER DATABASE \"$scratch\" RENAME TO \"$db\""
fi
trap - EXIT
say "restored $file into $db"
