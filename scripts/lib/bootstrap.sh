# Sourced by start.sh, test.sh and dev.sh: installs what a fresh machine lacks.
# Debian packages are installed only when their binaries are missing (an install also
# upgrades neighbours, so never "just in case").

apt_updated=0
apt_install() {
  if [ "$(id -u)" != "0" ]; then
    echo "rejectra: $* is missing and installing it needs root: run 'sudo apt-get install -y $*'" >&2
    return 1
  fi
  if [ "$apt_updated" = "0" ]; then
    echo "rejectra: apt-get update (to install $*)"
    DEBIAN_FRONTEND=noninteractive apt-get update -qq >/dev/null
    apt_updated=1
  fi
  echo "rejectra: installing $* from Debian's packages"
  DEBIAN_FRONTEND=noninteractive apt-get install -y -qq "$@" >/dev/null
}

ensure_node_modules() {
  if [ ! -f node_modules/.package-lock.json ] || [ package-lock.json -nt node_modules/.package-lock.json ]; then
    echo "rejectra: installing npm dependencies (npm ci)"
    npm ci --no-audit --no-fund --loglevel=error
  fi
}

ensure_postgres_binaries() {
  if ! ls /usr/lib/postgresql/*/bin/pg_ctl >/dev/null 2>&1; then
    apt_install postgresql
    # Debian's package starts a cluster of its own; the project runs its own instead.
    if command -v pg_ctlcluster >/dev/null 2>&1; then
      for cluster in /etc/postgresql/*/main; do
        [ -d "$cluster" ] && pg_ctlcluster "$(basename "$(dirname "$cluster")")" main stop >/dev/null 2>&1 || true
      done
    fi
  fi
}
