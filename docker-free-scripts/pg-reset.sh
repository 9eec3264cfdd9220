#!/usr/bin/env bash
# Stops the private cluster and deletes its data directory: the next start begins empty.
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
"$ROOT/docker-free-scripts/pg-stop.sh"
rm -rf "$PGDATA_DIR"
say "removed $PGDATA_DIR"
