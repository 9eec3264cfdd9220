#!/usr/bin/env bash
# Installs what the product needs from Debian when it is missing.
#   install-system-packages.sh          server: PostgreSQL and PostGIS
#   install-system-packages.sh --tests  also Chromium (browser tests), poppler-utils (pdfsig, pdftotext), gdal-bin, proj-bin, osmium-tool
#   install-system-packages.sh --bench  also g++ and libboost-graph-dev (the flow bench's reference solvers; npm test does not need them)
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"

if ! ls -d /usr/lib/postgresql/*/bin >/dev/null 2>&1; then apt_install postgresql; fi
apt_install "postgresql-$(pg_version)-postgis-3"
# gdal-bin (ogr2ogr, ogrinfo), proj-bin (cs2cs) and osmium-tool (OSM PBF) are the reference tools of the GIS format tests.
if [ "${1:-}" = "--tests" ]; then apt_install chromium poppler-utils gdal-bin proj-bin osmium-tool; fi
# Boost's max-flow solvers (header-only, compiled by tests/bench/flow/run.ts with g++) are the flow bench's outside reference.
if [ "${1:-}" = "--bench" ]; then apt_install g++ libboost-graph-dev; fi
