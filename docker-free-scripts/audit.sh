#!/usr/bin/env bash
# Dependency audit of the shipped packages; see docker-free-scripts/audit/README.md.
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
cd "$ROOT"
npx tsx server/cli/audit-dependencies.ts
