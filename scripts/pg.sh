#!/usr/bin/env bash
# The project's own PostgreSQL 15: installed from Debian's packages when missing,
# a cluster in the project's data folder, served on 127.0.0.1 only.
#   scripts/pg.sh start   ensure installed, initialised and running (reuses a running server)
#   scripts/pg.sh stop    stop the server this project runs
#   scripts/pg.sh status  exit 0 when running
#   scripts/pg.sh url [db]  print the connection URL
# With DATABASE_URL set in the environment, nothing is started or stopped.
# As root with a data folder the postgres user cannot enter, the cluster, its socket and
# its log live in TW_PG_FALLBACK_DIR (default /var/tmp/torquewright-pg) instead.
set -euo pipefail

ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
DATA_ROOT="${TW_DATA_DIR:-$ROOT/.data}"
PG_PORT="${TW_PG_PORT:-54329}"
PG_BIN="${TW_PG_BIN:-/usr/lib/postgresql/15/bin}"
DB_NAME="${TW_DB_NAME:-torquewright}"

is_root() { [ "$(id -u)" = "0" ]; }
# As root, the server's tools run as the postgres user, from / (they refuse a current
# folder they cannot enter, such as a checkout in a private home).
as_pg() { if is_root; then (cd / && runuser -u postgres -- "$@"); else "$@"; fi; }

FALLBACK_ROOT="${TW_PG_FALLBACK_DIR:-/var/tmp/torquewright-pg}"

# The cluster lives in the data folder unless the postgres OS user cannot reach it
# (a checkout under a private home, a folder made by mktemp -d); then in a folder it can
# reach, named after the data folder. Everything the server reads or writes (cluster,
# socket, log) goes where the cluster goes.
cluster_dir() {
  local preferred="$DATA_ROOT/pg"
  if is_root && ! runuser -u postgres -- test -x "$DATA_ROOT" 2>/dev/null; then
    local hash key="$DATA_ROOT"
    # the default data folder keeps the name it always had (the checkout's)
    [ "$DATA_ROOT" = "$ROOT/.data" ] && key="$ROOT"
    hash=$(printf '%s' "$key" | sha256sum | cut -c1-12)
    echo "$FALLBACK_ROOT/$hash"
  else
    echo "$preferred"
  fi
}

# The server's log: in the data folder beside the cluster, or beside the fallback cluster.
log_file() {
  local dir="$1"
  if [ "$dir" = "$DATA_ROOT/pg" ]; then echo "$DATA_ROOT/pg.log"; else echo "$dir.log"; fi
}

ensure_installed() {
  if [ ! -x "$PG_BIN/pg_ctl" ]; then
    echo "pg: installing PostgreSQL 15 from Debian's packages…" >&2
    if is_root; then
      apt-get update -qq >&2 && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq postgresql-15 >&2
    else
      echo "pg: PostgreSQL 15 is missing and installing it needs root (apt-get install postgresql-15)" >&2
      exit 1
    fi
  fi
}

url() { echo "postgres://postgres@127.0.0.1:$PG_PORT/${1:-$DB_NAME}"; }

# Running means: a pid file whose process is alive (not a zombie left by a crash) and answers.
running() {
  local dir="$1" pid state
  [ -f "$dir/postmaster.pid" ] || return 1
  pid=$(head -1 "$dir/postmaster.pid" 2>/dev/null)
  [ -n "$pid" ] && [ -d "/proc/$pid" ] || return 1
  state=$(awk '/^State:/ {print $2}' "/proc/$pid/status" 2>/dev/null)
  [ "$state" != "Z" ] || return 1
  "$PG_BIN/pg_isready" -h 127.0.0.1 -p "$PG_PORT" -q -t 5
}

start() {
  ensure_installed
  mkdir -p "$DATA_ROOT"
  local dir; dir=$(cluster_dir)
  local sock="$dir/../run-$(basename "$dir")"
  mkdir -p "$dir" "$sock"
  # the fallback folder itself must let the postgres user through, whatever the umask
  if [ "$dir" != "$DATA_ROOT/pg" ]; then chmod 755 "$(dirname "$dir")"; fi
  if is_root; then
    chown postgres:postgres "$dir" "$sock"; chmod 700 "$dir"
    if ! runuser -u postgres -- test -x "$dir"; then
      echo "pg: the postgres user cannot reach $dir; set TW_PG_FALLBACK_DIR to a folder it can enter" >&2
      exit 1
    fi
  fi
  if [ ! -f "$dir/PG_VERSION" ]; then
    echo "pg: creating a cluster in $dir" >&2
    as_pg "$PG_BIN/initdb" -D "$dir" -U postgres --auth=trust -E UTF8 --no-locale >/dev/null
  fi
  if running "$dir"; then
    echo "pg: reusing the server already running on 127.0.0.1:$PG_PORT ($dir)" >&2
  else
    # A pid file left by a crash is recovered: the server is not running, so it is stale.
    if [ -f "$dir/postmaster.pid" ]; then
      echo "pg: removing a stale pid file" >&2
      rm -f "$dir/postmaster.pid"
    fi
    local log; log=$(log_file "$dir")
    touch "$log"; if is_root; then chown postgres:postgres "$log"; fi
    as_pg "$PG_BIN/pg_ctl" -D "$dir" -l "$log" -w -t 60 \
      -o "-h 127.0.0.1 -p $PG_PORT -k $sock ${TW_PG_OPTIONS:-}" start >/dev/null
    echo "pg: started PostgreSQL 15 on 127.0.0.1:$PG_PORT (data: $dir, log: $log)" >&2
  fi
  for _ in $(seq 1 60); do
    if "$PG_BIN/pg_isready" -h 127.0.0.1 -p "$PG_PORT" -q; then break; fi
    sleep 0.5
  done
  "$PG_BIN/pg_isready" -h 127.0.0.1 -p "$PG_PORT" -q
  if ! "$PG_BIN/psql" "$(url postgres)" -tAc "select 1 from pg_database where datname='$DB_NAME'" | grep -q 1; then
    "$PG_BIN/createdb" -h 127.0.0.1 -p "$PG_PORT" -U postgres "$DB_NAME"
  fi
}

stop() {
  local dir; dir=$(cluster_dir)
  if running "$dir"; then
    as_pg "$PG_BIN/pg_ctl" -D "$dir" -m fast -w stop >/dev/null
    echo "pg: stopped the server on 127.0.0.1:$PG_PORT" >&2
  fi
}

cmd="${1:-status}"
if [ -n "${DATABASE_URL:-}" ] && [ "$cmd" != "url" ]; then
  echo "pg: DATABASE_URL is set; using that server, starting nothing" >&2
  exit 0
fi
case "$cmd" in
  start) start ;;
  stop) stop ;;
  status) running "$(cluster_dir)" ;;
  url) if [ -n "${DATABASE_URL:-}" ] && [ -z "${2:-}" ]; then echo "$DATABASE_URL"; else url "${2:-}"; fi ;;
  *) echo "usage: scripts/pg.sh start|stop|status|url [db]" >&2; exit 2 ;;
esac
