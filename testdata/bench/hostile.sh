#!/usr/bin/env bash
# Peak memory and CPU of refusing hostile packages, side by side: builds
# pathvet from BASE (default: where this branch left main) and from the
# work tree, writes the hostile packages of checks/load/hostile_test.go
# (each under the 5 MiB package limit), then for each package and each
# build runs `pathvet check` and a fresh `pathvet serve --workers 0`
# taking it as one POST /v1/submissions, both under /usr/bin/time, and
# prints the HTTP status, max RSS (MB) and CPU seconds. A run is cut at
# TIMEOUT seconds (default 60). Needs PostgreSQL at
# PATHVET_TEST_DATABASE_URL's server (default 127.0.0.1:5432).
set -euo pipefail
cd "$(dirname "$0")/../.."
BASE=${BASE:-$(git merge-base HEAD main)}
TIMEOUT=${TIMEOUT:-60}
BASE_URL=${PATHVET_TEST_DATABASE_URL:-postgres://postgres@127.0.0.1:5432/postgres?sslmode=disable}
tmp=$(mktemp -d)
server=${BASE_URL%%\?*}; server=${server%/*}
cleanup() {
  for b in old new; do psql -q "$BASE_URL" -c "DROP DATABASE IF EXISTS pathvet_hostile_${b}_$$ WITH (FORCE)" || true; done
  git worktree remove --force "$tmp/src" 2>/dev/null || true
  rm -rf "$tmp"
}
trap cleanup EXIT
git worktree add -q --detach "$tmp/src" "$BASE"
(cd "$tmp/src" && go build -o "$tmp/old" ./cmd/pathvet)
go build -o "$tmp/new" ./cmd/pathvet
mkdir "$tmp/pk"
go test ./checks/load -count=1 -run 'TestLoad_HostilePackagesAreCheap$' -args -hostile-out "$tmp/pk" >/dev/null
for b in old new; do
  db=pathvet_hostile_${b}_$$
  psql -q "$BASE_URL" -c "CREATE DATABASE $db"
  export PATHVET_DATABASE_URL="$server/$db?sslmode=disable"
  "$tmp/$b" migrate up >/dev/null
  "$tmp/$b" offices create "Bench office" >/dev/null
  "$tmp/$b" keys create --office "Bench office" --role editor --label bench | tail -1 >"$tmp/$b.token"
done

# measure BUILD PACKAGE: one line, the CLI's and the API's figures.
measure() {
  local b=$1 f=$2 port=18090
  : >"$tmp/cli.txt"
  timeout -s KILL "$TIMEOUT" /usr/bin/time -f '%M %U %S' -o "$tmp/cli.txt" "$tmp/$b" check --quiet "$f" \
    >/dev/null 2>&1 || true
  export PATHVET_DATABASE_URL="$server/pathvet_hostile_${b}_$$?sslmode=disable"
  /usr/bin/time -f '%M %U %S' -o "$tmp/api.txt" "$tmp/$b" serve --workers 0 --addr 127.0.0.1:$port 2>/dev/null &
  local pid=$!
  for _ in $(seq 100); do curl -s -o /dev/null http://127.0.0.1:$port/healthz && break; sleep 0.1; done
  local status
  status=$(curl -s -o /dev/null -w '%{http_code}' --max-time "$TIMEOUT" -H "Authorization: Bearer $(cat "$tmp/$b.token")" \
    -H 'Content-Type: application/json' --data-binary "@$f" http://127.0.0.1:$port/v1/submissions) || status=cut
  kill -KILL "$(pgrep -P $pid)" 2>/dev/null || true
  wait $pid 2>/dev/null || true
  local cm cu cs am au as
  cm=$(grep -Eo '^[0-9]+ [0-9.]+ [0-9.]+' "$tmp/cli.txt" | tail -1 || true)
  read -r cm cu cs <<<"${cm:-- - -}"
  am=$(grep -Eo '^[0-9]+ [0-9.]+ [0-9.]+' "$tmp/api.txt" | tail -1 || true)
  read -r am au as <<<"${am:-- - -}"
  awk -v b="$b" -v n="$(basename "$f" .json)" -v st="$status" -v cm="$cm" -v cu="$cu" -v cs="$cs" \
    -v am="$am" -v au="$au" -v as="$as" 'function mb(k) { return k == "-" ? "cut" : sprintf("%.0f", k / 1024) }
    function s(u, v) { return u == "-" ? "cut" : sprintf("%.2f", u + v) }
    BEGIN { printf "%-30s %-4s %6s MB %7s s | %4s %6s MB %7s s\n", n, b, mb(cm), s(cu, cs), st, mb(am), s(au, as) }'
}
uptime
printf '%-30s %-4s %9s %9s | %4s %9s %9s\n' package code "CLI RSS" "CLI CPU" HTTP "API RSS" "API CPU"
for f in "$tmp"/pk/*.json; do
  for b in old new; do measure "$b" "$f"; done
done
