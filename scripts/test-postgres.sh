#!/usr/bin/env bash
# The server tests against PostgreSQL (docs/scale-out.md): starts a throwaway PostgreSQL server from
# Debian's `postgresql` package in a temporary folder on loopback, runs the vitest files given (the
# server, route and seed tests by default) with TEST_DATABASE_URL pointing at it, then stops it and
# removes the folder.
#   npm run test:postgres [-- vitest files or options]
# Settings: TEST_PG_PORT (default 54329).
set -euo pipefail
cd "$(dirname "$0")/.."

bin=$(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V | tail -n 1 || true)
if [ -z "$bin" ] || [ ! -x "$bin/initdb" ]; then
	echo "PostgreSQL is not installed: on Debian, 'apt-get install postgresql' brings it." >&2
	exit 1
fi
port=${TEST_PG_PORT:-54329}
dir=$(mktemp -d -t fw-postgres-XXXXXX)
# initdb and the server refuse to run as root; they run as the package's `postgres` user then.
as_owner() { if [ "$(id -u)" = 0 ]; then runuser -u postgres -- "$@"; else "$@"; fi; }
[ "$(id -u)" = 0 ] && chown postgres "$dir"

stop() {
	as_owner "$bin/pg_ctl" -D "$dir/data" -m immediate stop >/dev/null 2>&1 || true
	rm -rf "$dir"
}
trap stop EXIT

as_owner "$bin/initdb" -D "$dir/data" -A trust -U postgres >/dev/null
# A test server: loopback only, no durability (fsync off), room for the many small pools of a run.
as_owner "$bin/pg_ctl" -D "$dir/data" -l "$dir/server.log" -w -o \
	"-p $port -k $dir -c listen_addresses=127.0.0.1 -c fsync=off -c synchronous_commit=off -c full_page_writes=off -c max_connections=400" \
	start >/dev/null

if [ $# -eq 0 ]; then set -- src/lib/server src/routes db; fi
TEST_DATABASE_URL="postgres://postgres@127.0.0.1:$port/postgres" npx vitest run "$@"
