#!/usr/bin/env bash
# A private PostgreSQL cluster on 127.0.0.1, owned by this checkout.
#   scripts/pg.sh start NAME PORT   -> initialises (once) and starts; prints nothing on success
#   scripts/pg.sh stop  NAME
#   scripts/pg.sh url   NAME PORT DB -> prints the connection URL (TCP on 127.0.0.1)
#   scripts/pg.sh local-url NAME PORT DB -> the same database through the cluster's Unix socket
#                                         (cheaper per round trip than loopback TCP; the TCP URL when
#                                         the socket path would be too long for the system)
# NAME picks the cluster folder (.data/NAME), so the demo ("pg") and the tests ("pg-test")
# never share data. Installs Debian's postgresql when its server binaries are missing.
set -euo pipefail
here=$(cd "$(dirname "$0")/.." && pwd)
cmd=${1:?usage: pg.sh start|stop|url NAME [PORT] [DB]}
name=${2:?cluster name}

pgbin() {
  local d
  d=$(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V | tail -1 || true)
  if [ -z "$d" ] || [ ! -x "$d/initdb" ]; then
    echo "PostgreSQL server binaries missing: installing Debian's postgresql" >&2
    export DEBIAN_FRONTEND=noninteractive
    local sudo=""; [ "$(id -u)" = 0 ] || sudo="sudo"
    $sudo apt-get update -qq >&2 && $sudo apt-get install -y -qq postgresql >&2
    d=$(ls -d /usr/lib/postgresql/*/bin | sort -V | tail -1)
  fi
  echo "$d"
}

# The cluster lives in .data/NAME unless the postgres user cannot reach the checkout
# (e.g. a checkout under /root, mode 700); then under /var/tmp, keyed by the checkout path.
root_for() {
  local dir="$here/.data/$name"
  if [ "$(id -u)" = 0 ]; then
    if ! runuser -u postgres -- test -x "$here" 2>/dev/null; then
      dir="/var/tmp/starsway-$(echo "$here" | md5sum | cut -c1-12)/$name"
    fi
  fi
  echo "$dir"
}

as_pg() {
  if [ "$(id -u)" = 0 ]; then runuser -u postgres -- "$@"; else "$@"; fi
}

case "$cmd" in
  start)
    port=${3:?port}
    bin=$(pgbin)
    root=$(root_for)
    if [ "$(id -u)" = 0 ] && ! id postgres >/dev/null 2>&1; then useradd -r -M postgres; fi
    mkdir -p "$root/data" "$root/run"
    [ "$(id -u)" = 0 ] && chown -R postgres:postgres "$root"
    if [ ! -f "$root/data/PG_VERSION" ]; then
      as_pg "$bin/initdb" -D "$root/data" -U postgres --auth=trust -E UTF8 --locale=C.UTF-8 >"$root/run/initdb.log" 2>&1 \
        || { cat "$root/run/initdb.log" >&2; exit 1; }
    fi
    if as_pg "$bin/pg_ctl" -D "$root/data" status >/dev/null 2>&1; then exit 0; fi
    rm -f "$root/data/postmaster.pid"
    extra=""; case "$name" in *test*) extra="-c fsync=off -c synchronous_commit=off -c full_page_writes=off";; esac  # throwaway test clusters only
    as_pg "$bin/pg_ctl" -D "$root/data" -l "$root/run/pg.log" -w -t 60 \
      -o "-p $port -c listen_addresses=127.0.0.1 -c unix_socket_directories=$root/run $extra" start >/dev/null \
      || { tail -20 "$root/run/pg.log" >&2; exit 1; }
    ;;
  stop)
    bin=$(pgbin); root=$(root_for)
    if [ -f "$root/data/PG_VERSION" ]; then
      as_pg "$bin/pg_ctl" -D "$root/data" -m fast -w stop >/dev/null 2>&1 || true
    fi
    ;;
  url)
    port=${3:?port}; db=${4:-postgres}
    echo "postgres://postgres@127.0.0.1:$port/$db"
    ;;
  local-url)
    port=${3:?port}; db=${4:-postgres}
    run="$(root_for)/run"
    # sun_path holds 108 bytes; the host query parameter is read by both pg and Sequelize
    if [ $(( ${#run} + 20 )) -lt 100 ] && [ -S "$run/.s.PGSQL.$port" ]; then
      echo "postgres://postgres@127.0.0.1:$port/$db?host=$run"
    else
      echo "postgres://postgres@127.0.0.1:$port/$db"
    fi
    ;;
  *) echo "unknown command $cmd" >&2; exit 2 ;;
esac
