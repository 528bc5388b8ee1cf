#!/usr/bin/env bash
# Peak memory of screening one raw-data package, beside the working-memory
# estimate the service refuses by, in one run: for each CASE of the
# invented cohort (testdata/bench/cohort.py, ROWS rows × 30 variables), it
#   (a) runs `pathvet check` under /usr/bin/time -v (the CLI: the CSV read
#       from a file), and
#   (b) queues the package through `pathvet serve --workers 0` into a
#       database of its own (on the server at PATHVET_TEST_DATABASE_URL's
#       host) and screens it with `pathvet work --workers 1` under
#       /usr/bin/time -v (the worker: the package and CSV read from
#       PostgreSQL), stopped by SIGTERM once the submission is done,
# and prints each maximum resident set size beside the estimate
# (service.WorkingMemory, as the refusal of a second server with a job
# memory of 1 MiB words it). Both get a
# job memory large enough never to refuse (JOB_MIB, default 100000), so
# that the peak is measured, not refused; set JOB_MIB=900 to see the
# default budget at work.
# Needs Debian's python3-numpy (/usr/bin/python3) and psql.
# Usage: [CASES="patterns patterns-binary cells cells-binary"] [ROWS=395000] [JOB_MIB=N] \
#        bash testdata/bench/worker-memory.sh   (from the repository root)
set -euo pipefail
cd "$(dirname "$0")/../.."
ROWS=${ROWS:-395000}
JOB_MIB=${JOB_MIB:-100000}
BASE_URL=${PATHVET_TEST_DATABASE_URL:-postgres://postgres@127.0.0.1:5432/postgres?sslmode=disable}
tmp=$(mktemp -d)
db=pathvet_worker_mem_$$
trap 'psql -q "$BASE_URL" -c "DROP DATABASE IF EXISTS $db WITH (FORCE)" 2>/dev/null; rm -rf "$tmp"' EXIT
go build -o "$tmp/pathvet" ./cmd/pathvet
server=${BASE_URL%%\?*}; server=${server%/*}
psql -q "$BASE_URL" -c "CREATE DATABASE $db"
export PATHVET_DATABASE_URL="$server/$db?sslmode=disable"
"$tmp/pathvet" migrate up >/dev/null
"$tmp/pathvet" offices create "Bench office" >/dev/null
export PATHVET_TOKEN=$("$tmp/pathvet" keys create --office "Bench office" --role editor --label bench | tail -1)
"$tmp/pathvet" serve --workers 0 --addr 127.0.0.1:18091 --job-memory-mib "$JOB_MIB" 2>"$tmp/serve.log" &
serve=$!
"$tmp/pathvet" serve --workers 0 --addr 127.0.0.1:18092 --job-memory-mib 1 2>"$tmp/refuse.log" &
refuse=$!
trap 'kill -TERM $serve $refuse 2>/dev/null; wait $serve $refuse 2>/dev/null; psql -q "$BASE_URL" -c "DROP DATABASE IF EXISTS $db WITH (FORCE)" 2>/dev/null; rm -rf "$tmp"' EXIT
for port in 18091 18092; do
  for _ in $(seq 100); do curl -s -o /dev/null http://127.0.0.1:$port/healthz && break; sleep 0.1; done
done

peak() { awk -F': ' '/Maximum resident set size/ {printf "%.0f", $2 / 1024}' "$1"; }
echo "rows: $ROWS; load average: $(cut -d' ' -f1-3 /proc/loadavg)"
echo "case              estimate MB   check peak MB   worker peak MB   worker status"
for case in ${CASES:-patterns patterns-binary cells cells-binary}; do
  mkdir -p "$tmp/$case"
  /usr/bin/python3 testdata/bench/cohort.py write "$tmp/$case" "$case" "$ROWS"
  est=$({ "$tmp/pathvet" submit --server http://127.0.0.1:18092 "$tmp/$case/package.json" 2>&1 || true; } |
    sed -n 's/.*need about \([0-9]*\) MiB.*/\1/p' | head -1 | awk '{printf "%.0f", $1 * 1048576 / 1e6}')
  /usr/bin/time -v -o "$tmp/check.txt" "$tmp/pathvet" check --quiet --format json --out "$tmp/report.json" \
    "$tmp/$case/package.json" || [ $? -le 1 ]
  id=$("$tmp/pathvet" submit --server http://127.0.0.1:18091 "$tmp/$case/package.json" | awk '{print $1}')
  /usr/bin/time -v -o "$tmp/work.txt" "$tmp/pathvet" work --workers 1 --job-memory-mib "$JOB_MIB" 2>"$tmp/work.log" &
  work=$!
  status=queued
  for _ in $(seq 1800); do
    status=$(psql -Atq "$PATHVET_DATABASE_URL" -c "SELECT status FROM submissions WHERE id = '$id'")
    case $status in done | failed) break ;; esac
    sleep 1
  done
  kill -TERM "$(pgrep -P $work)" # pathvet work, the child of /usr/bin/time
  wait $work || true
  printf "%-17s %11s %15s %16s   %s\n" "$case" "$est" "$(peak "$tmp/check.txt")" "$(peak "$tmp/work.txt")" "$status"
done
