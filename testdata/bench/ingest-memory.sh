#!/usr/bin/env bash
# Peak memory of the API taking one large multipart upload: builds pathvet
# (from the work tree, or from commit BASE), makes a database of its own on
# the server at PATHVET_TEST_DATABASE_URL's host, starts `pathvet serve
# --workers 0` under /usr/bin/time -v, sends the coding-club demo package
# with ROWS rows (default 2,000,000; about 43 MB) with curl, stops the
# server and prints the HTTP status and its maximum resident set size.
set -euo pipefail
cd "$(dirname "$0")/../.."
ROWS=${ROWS:-2000000}
BASE_URL=${PATHVET_TEST_DATABASE_URL:-postgres://postgres@127.0.0.1:5432/postgres?sslmode=disable}
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
if [ -n "${BASE:-}" ]; then
  git worktree add -q --detach "$tmp/src" "$BASE"
  (cd "$tmp/src" && go build -o "$tmp/pathvet" ./cmd/pathvet)
  git worktree remove --force "$tmp/src"
else
  go build -o "$tmp/pathvet" ./cmd/pathvet
fi
db=pathvet_ingest_mem_$$
server=${BASE_URL%%\?*}; server=${server%/*}
psql -q "$BASE_URL" -c "CREATE DATABASE $db"
trap 'psql -q "$BASE_URL" -c "DROP DATABASE IF EXISTS $db WITH (FORCE)"; rm -rf "$tmp"' EXIT
export PATHVET_DATABASE_URL="$server/$db?sslmode=disable"
"$tmp/pathvet" migrate up >/dev/null
"$tmp/pathvet" offices create "Bench office" >/dev/null
token=$("$tmp/pathvet" keys create --office "Bench office" --role editor --label bench | tail -1)
python3 - "$ROWS" > "$tmp/rows.csv" <<'PY'
import sys
lines = open("testdata/demo/coding-club/rows.csv").read().split("\n")
lines = [l for l in lines if l]
out = [lines[0]]
body = lines[1:]
for i in range(int(sys.argv[1])):
    out.append("Q%07d," % i + body[i % len(body)].split(",", 1)[1])
sys.stdout.write("\n".join(out) + "\n")
PY
GODEBUG=${GODEBUG:-} /usr/bin/time -v -o "$tmp/time.txt" "$tmp/pathvet" serve --workers 0 --addr 127.0.0.1:18089 \
  --job-memory-mib 100000 2>"$tmp/serve.log" &
pid=$!
for _ in $(seq 100); do curl -s -o /dev/null http://127.0.0.1:18089/healthz && break; sleep 0.1; done
ls -l "$tmp/rows.csv" | awk '{print "csv bytes:", $5}'
curl -s -o "$tmp/out.json" -w 'status: %{http_code}\n' -H "Authorization: Bearer $token" \
  -F "package=@testdata/demo/coding-club/package.json;type=application/json" \
  -F "data=@$tmp/rows.csv;type=text/csv" http://127.0.0.1:18089/v1/submissions
head -c 300 "$tmp/out.json"; echo
kill -TERM "$(pgrep -P $pid || echo $pid)" 2>/dev/null || true
wait $pid || true
grep "Maximum resident" "$tmp/time.txt"
[ -n "${GODEBUG:-}" ] && grep "^gc " "$tmp/serve.log" | tail -12
psql -Atq "$PATHVET_DATABASE_URL" -c "SELECT octet_length(data), md5(data) FROM submissions"
md5sum "$tmp/rows.csv"
