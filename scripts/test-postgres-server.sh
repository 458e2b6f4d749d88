#!/usr/bin/env bash
# Starts a throwaway PostgreSQL server for `npm run test:pg` at postgres://postgres@127.0.0.1:5433,
# from Debian's postgresql package (installed if missing). Its data lives in a temporary
# directory; `scripts/test-postgres-server.sh stop` stops it. Needs root (apt-get, runuser).
set -euo pipefail
port="${TEST_PG_PORT:-5433}"
data="${TEST_PG_DATA:-/tmp/steamlane-test-pg}"

bin_dir() { ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V | tail -n1; }

if [ "${1:-start}" = "stop" ]; then
  runuser -u postgres -- "$(bin_dir)/pg_ctl" -D "$data" stop -m fast
  exit 0
fi

if [ -z "$(bin_dir)" ]; then
  apt-get update -qq
  DEBIAN_FRONTEND=noninteractive apt-get install -y -qq postgresql >/dev/null
fi
bin="$(bin_dir)"

if [ ! -f "$data/PG_VERSION" ]; then
  mkdir -p "$data"
  chown postgres:postgres "$data"
  runuser -u postgres -- "$bin/initdb" -A trust -E UTF8 --locale=C.UTF-8 -D "$data" >/dev/null
fi
if runuser -u postgres -- "$bin/pg_ctl" -D "$data" status >/dev/null 2>&1; then
  echo "PostgreSQL is already running on 127.0.0.1:$port (data in $data)"
  exit 0
fi
# Test databases are thrown away, so durability is traded for speed.
runuser -u postgres -- "$bin/pg_ctl" -D "$data" -l "$data/server.log" -w start \
  -o "-p $port -h 127.0.0.1 -k /tmp -c fsync=off -c synchronous_commit=off -c full_page_writes=off -c max_connections=200"
echo "PostgreSQL $("$bin/postgres" --version | awk '{print $3}') on 127.0.0.1:$port (data in $data)"
