#!/usr/bin/env bash
# Starts a throwaway PostgreSQL from the machine's own binaries (initdb,
# pg_ctl) on a free port, with its data under DIR (default .pgdata/), and
# prints its URL. "throwaway-postgres.sh stop DIR" stops it.
set -euo pipefail
cmd=start
if [ "${1:-}" = stop ]; then cmd=stop; shift; fi
data=$(realpath -m "${1:-.pgdata}")

bindir=$(pg_config --bindir 2>/dev/null || true)
if [ ! -x "$bindir/initdb" ]; then
  bindir=$(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V | tail -n 1)
fi
[ -x "$bindir/initdb" ] || { echo "throwaway-postgres: no initdb found; install PostgreSQL" >&2; exit 1; }
as_owner=()
if [ "$(id -u)" = 0 ]; then # initdb refuses to run as root
  as_owner=(runuser -u postgres --)
fi
if [ "$cmd" = stop ]; then
  "${as_owner[@]}" "$bindir/pg_ctl" -D "$data" -m fast stop >/dev/null
  exit 0
fi
mkdir -p "$data"
[ "$(id -u)" = 0 ] && chown postgres "$data"
if [ ! -s "$data/PG_VERSION" ]; then
  "${as_owner[@]}" "$bindir/initdb" -D "$data" -U postgres --auth=trust >/dev/null
fi
port=$(python3 -c 'import socket; s=socket.socket(); s.bind(("127.0.0.1", 0)); print(s.getsockname()[1])')
"${as_owner[@]}" "$bindir/pg_ctl" -D "$data" -o "-p $port -k /tmp -c listen_addresses=127.0.0.1" -l "$data/server.log" -w start >/dev/null
echo "postgres://postgres@127.0.0.1:$port/postgres?sslmode=disable"
