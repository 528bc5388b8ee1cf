#!/usr/bin/env bash
# Runs pathvet locally without Docker. With PATHVET_DATABASE_URL set, it
# uses that database; without it, it starts a throwaway PostgreSQL from the
# machine's own binaries on a free port under .pgdata/. Then it migrates,
# creates a demo editor key (printed once) and serves on PATHVET_ADDR
# (default 127.0.0.1:8080); flags are passed to pathvet serve. It stops
# first, printing no key, when that address is taken. Ctrl-C stops both.
set -euo pipefail
cd "$(dirname "$0")/.."

# The address serve will listen on (--addr, else PATHVET_ADDR): refuse to
# go on, before a database is started or a key printed, when something
# already listens there.
addr=${PATHVET_ADDR:-127.0.0.1:8080}
prev=
for a in "$@"; do
  case "$a" in --addr=*) addr=${a#--addr=} ;; esac
  [ "$prev" = --addr ] && addr=$a
  prev=$a
done
host=${addr%:*}; port=${addr##*:}
case "$host" in "" | 0.0.0.0 | "[::]") host=127.0.0.1 ;; esac
host=${host#[}; host=${host%]}
if (exec 3<>"/dev/tcp/$host/$port") 2>/dev/null; then
  echo "dev-server: $addr is already in use (another pathvet serve?); stop it, or choose another" \
    "address: bash deploy/dev-server.sh --addr 127.0.0.1:8081" >&2
  exit 1
fi

if [ -z "${PATHVET_DATABASE_URL:-}" ]; then
  PATHVET_DATABASE_URL=$(bash deploy/throwaway-postgres.sh .pgdata)
  export PATHVET_DATABASE_URL
  trap 'bash deploy/throwaway-postgres.sh stop .pgdata' EXIT
  echo "dev-server: throwaway PostgreSQL at $PATHVET_DATABASE_URL (data in .pgdata/)" >&2
fi

go build -o bin/pathvet ./cmd/pathvet
bin/pathvet migrate up >/dev/null
echo "dev-server: demo editor token (keep it; it is shown once):" >&2
bin/pathvet offices list | grep -q "Demo office" || bin/pathvet offices create "Demo office" >/dev/null
bin/pathvet keys create --office "Demo office" --role editor --label "Demo editor"
bin/pathvet serve "$@"
