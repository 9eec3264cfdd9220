#!/usr/bin/env bash
# Backs up one database of the private cluster to a file (pg_dump custom format).
#   backup.sh [DATABASE] [FILE]   defaults: cutline, backups/cutline-YYYYmmdd-HHMMSS.dump
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
db="${1:-cutline}"
file="${2:-$ROOT/backups/$db-$(date -u +%Y%m%d-%H%M%S).dump}"
mkdir -p "$(dirname "$file")"
"$(pg_bin)/pg_dump" -h 127.0.0.1 -p "$CUTLINE_PG_PORT" -U postgres -Fc --no-owner -f "$file" "$db"
say "backed up $db to $file ($(du -h "$file" | cut -f1))"
printf '%s\n' "$file"
