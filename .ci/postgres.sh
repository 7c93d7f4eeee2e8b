#!/usr/bin/env bash
# A throw-away PostgreSQL cluster for the test suite: sourced by .ci/run, usable by hand.
#   source .ci/postgres.sh; pg_throwaway_start; ...; pg_throwaway_stop
# pg_throwaway_start installs Debian's postgresql when initdb is missing, creates a cluster in a temporary directory
# owned by an unprivileged user (initdb and the server refuse to run as root), starts it on a free port of
# 127.0.0.1 with trust authentication for local connections only, creates the database winnow_test and exports
# WINNOW_TEST_DB_URL. pg_throwaway_stop stops it and removes the directory.

pg_throwaway_bin() {
  local bin
  bin=$(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V | tail -n 1)
  [ -n "$bin" ] && [ -x "$bin/initdb" ] && echo "$bin"
}

pg_throwaway_start() {
  if [ -z "$(pg_throwaway_bin)" ]; then
    apt-get update -qq
    DEBIAN_FRONTEND=noninteractive apt-get install -y -qq postgresql
  fi
  PG_BIN=$(pg_throwaway_bin)
  PG_USER=postgres
  if ! id -u "$PG_USER" >/dev/null 2>&1; then
    PG_USER=winnowpg
    id -u "$PG_USER" >/dev/null 2>&1 || useradd --system --no-create-home --shell /usr/sbin/nologin "$PG_USER"
  fi
  PG_DIR=$(mktemp -d /tmp/winnow-pg.XXXXXX)
  chown "$PG_USER" "$PG_DIR"
  PG_PORT=$(pg_throwaway_free_port)
  pg_as() { if [ "$(id -u)" = 0 ]; then runuser -u "$PG_USER" -- "$@"; else "$@"; fi; }
  pg_as "$PG_BIN/initdb" -D "$PG_DIR/data" -U postgres --auth=trust -E UTF8 --locale=C.UTF-8 >"$PG_DIR/initdb.log" 2>&1 \
    || { cat "$PG_DIR/initdb.log"; return 1; }
  pg_as "$PG_BIN/pg_ctl" -D "$PG_DIR/data" -l "$PG_DIR/server.log" -w -t 60 \
    -o "-c listen_addresses=127.0.0.1 -p $PG_PORT -k $PG_DIR -c max_connections=300 -c fsync=off -c synchronous_commit=off -c full_page_writes=off" start \
    || { cat "$PG_DIR/server.log"; return 1; }
  pg_as "$PG_BIN/createdb" -h 127.0.0.1 -p "$PG_PORT" -U postgres winnow_test
  export WINNOW_TEST_DB_URL="jdbc:postgresql://127.0.0.1:$PG_PORT/winnow_test?user=postgres"
  echo "throw-away PostgreSQL $("$PG_BIN/postgres" --version | awk '{print $3}') on port $PG_PORT ($PG_DIR)"
}

pg_throwaway_stop() {
  if [ -n "${PG_DIR:-}" ] && [ -d "$PG_DIR/data" ]; then
    pg_as "$PG_BIN/pg_ctl" -D "$PG_DIR/data" -m immediate -w stop >/dev/null 2>&1 || true
    rm -rf "$PG_DIR"
  fi
}

# The first port from 54320 on that nothing listens on.
pg_throwaway_free_port() {
  local port
  for port in $(seq 54320 54999); do
    if ! (exec 3<>"/dev/tcp/127.0.0.1/$port") 2>/dev/null; then
      echo "$port"
      return 0
    fi
  done
  return 1
}
