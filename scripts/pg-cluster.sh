#!/usr/bin/env bash
# A throw-away PostgreSQL cluster on loopback for the PostgreSQL test run (and for trying the app on it).
#   scripts/pg-cluster.sh start [port]   → prints DATABASE_URL for a fresh cluster; data in a temp dir
#   scripts/pg-cluster.sh stop           → stops it and removes the data dir
# PostgreSQL refuses to run as root, so as root the cluster runs as the unprivileged `postgres` user
# that Debian's package creates. State (data dir, port) is kept in $PG_STATE (default /tmp/sunreckon-pg).
set -euo pipefail
STATE="${PG_STATE:-/tmp/sunreckon-pg}"
BIN="$(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V | tail -1)"
if [ -z "$BIN" ]; then echo "PostgreSQL is not installed (apt-get install -y postgresql)" >&2; exit 1; fi

as_owner() {
  if [ "$(id -u)" = 0 ]; then runuser -u postgres -- "$@"; else "$@"; fi
}

case "${1:-}" in
  start)
    PORT="${2:-55432}"
    mkdir -p "$STATE"
    DATA="$(mktemp -d /tmp/sunreckon-pgdata.XXXXXX)"
    [ "$(id -u)" = 0 ] && chown postgres "$DATA"
    as_owner "$BIN/initdb" -D "$DATA" -U sunreckon --auth=trust -E UTF8 --locale=C.UTF-8 >/dev/null
    as_owner "$BIN/pg_ctl" -D "$DATA" -l "$DATA/server.log" -w \
      -o "-h 127.0.0.1 -p $PORT -k $DATA -c fsync=off -c synchronous_commit=off -c full_page_writes=off -c max_connections=300" start >/dev/null
    echo "$DATA" > "$STATE/data"
    echo "$PORT" > "$STATE/port"
    echo "postgres://sunreckon@127.0.0.1:$PORT/postgres"
    ;;
  stop)
    if [ -f "$STATE/data" ]; then
      DATA="$(cat "$STATE/data")"
      as_owner "$BIN/pg_ctl" -D "$DATA" -m fast -w stop >/dev/null || true
      rm -rf "$DATA" "$STATE"
    fi
    ;;
  *) echo "usage: $0 start [port] | stop" >&2; exit 2 ;;
esac
