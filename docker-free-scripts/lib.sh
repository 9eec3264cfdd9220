# Shared settings for the docker-free scripts. Sourced, not run.
# The cluster is private to this checkout: data in .pgdata/, served on 127.0.0.1 only.
set -euo pipefail

ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
export CUTLINE_PG_PORT="${CUTLINE_PG_PORT:-54329}"
PGDATA_DIR="${CUTLINE_PGDATA:-$ROOT/.pgdata}"

say() { printf '[cutline] %s\n' "$*" >&2; }

# apt-get update runs at most once per script run, and only when something must be installed.
APT_UPDATED=0
apt_install() {
  local missing=()
  for pkg in "$@"; do
    dpkg-query -W -f='${Status}' "$pkg" 2>/dev/null | grep -q 'install ok installed' || missing+=("$pkg")
  done
  [ ${#missing[@]} -eq 0 ] && return 0
  if [ "$(id -u)" -ne 0 ]; then
    say "missing Debian packages: ${missing[*]} — install them with: sudo apt-get install -y ${missing[*]}"
    return 1
  fi
  say "installing from Debian: ${missing[*]}"
  if [ "$APT_UPDATED" -eq 0 ]; then apt-get update -qq >&2; APT_UPDATED=1; fi
  DEBIAN_FRONTEND=noninteractive apt-get install -y -qq --no-install-recommends "${missing[@]}" >&2
}

# The newest server Debian installed; Debian does not put it on PATH.
pg_bin() {
  local dir
  dir="$(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V | tail -n 1)"
  [ -n "$dir" ] || { say "no PostgreSQL server found under /usr/lib/postgresql"; return 1; }
  printf '%s' "$dir"
}

pg_version() { basename "$(dirname "$(pg_bin)")"; }

# initdb and postgres refuse to run as root: run them as Debian's postgres user then.
as_pg() {
  if [ "$(id -u)" -eq 0 ]; then runuser -u postgres -- "$@"; else "$@"; fi
}

database_url() { printf 'postgres://postgres@127.0.0.1:%s/%s' "$CUTLINE_PG_PORT" "$1"; }
