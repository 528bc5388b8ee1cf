#!/usr/bin/env bash
# GET /v1/submissions/{id}/report beside a bare Echo serving the same
# stored bytes, in one run: it builds pathvet and the load generator
# (testdata/bench/reportload), makes a database with one screened demo
# submission, starts `pathvet serve --workers 0` (the whole server: key
# lookup, scope check, report read, every middleware) and a bare Echo
# handler that writes the stored report from memory (no middleware, no
# storage), then alternates rounds of load against each: the report read
# with a key, the same with If-None-Match (304), and the bare server.
# Each round is one process sending C concurrent requests for D; the
# ratios of a round are taken within it, and the median over rounds is
# printed at the end. With BASE=<git revision> it also serves the same
# database with that revision's pathvet, in the same rounds, to show the
# change. Needs PostgreSQL (PATHVET_TEST_DATABASE_URL, default the
# machine's own, as the tests).
# Usage: [ROUNDS=5] [C=16] [D=5s] [BASE=REV] bash testdata/bench/report-get.sh   (from the repository root)
set -euo pipefail
cd "$(dirname "$0")/../.."
rounds=${ROUNDS:-5}
conc=${C:-16}
dur=${D:-5s}
admin=${PATHVET_TEST_DATABASE_URL:-postgres://postgres@127.0.0.1:5432/postgres?sslmode=disable}
dir=$(mktemp -d)
pids=()
cleanup() {
	for p in "${pids[@]}"; do kill "$p" 2>/dev/null || true; done
	wait 2>/dev/null || true
	if [ -f "$dir/env" ]; then "$dir/reportload" drop -admin "$admin" -db "$DBNAME" || true; fi
	rm -rf "$dir"
}
trap cleanup EXIT
go build -o "$dir/pathvet" ./cmd/pathvet
go build -o "$dir/reportload" ./testdata/bench/reportload
if [ -n "${BASE:-}" ]; then
	mkdir "$dir/base"
	git archive "$BASE" | tar -x -C "$dir/base"
	(cd "$dir/base" && go build -o "$dir/pathvet-base" ./cmd/pathvet)
fi
"$dir/reportload" setup -admin "$admin" -out "$dir"
# shellcheck disable=SC1091
. "$dir/env"

# serve NAME BINARY: starts a server with no workers, logging to NAME.log.
serve() {
	"$2" serve --database-url "$DBURL" --addr 127.0.0.1:0 --workers 0 >/dev/null 2>"$dir/$1.log" &
	pids+=($!)
}
# addr NAME: the address the server NAME logged once it served.
addr() {
	for _ in $(seq 100); do
		grep -q '"msg":"serving"' "$dir/$1.log" 2>/dev/null && break
		sleep 0.1
	done
	grep -o '"addr":"[^"]*"' "$dir/$1.log" | head -1 | cut -d'"' -f4
}
serve serve "$dir/pathvet"
pv=$(addr serve)
if [ -n "${BASE:-}" ]; then
	serve base "$dir/pathvet-base"
	pvbase=$(addr base)
fi
"$dir/reportload" bare -file "$dir/report.json" >"$dir/bare.addr" 2>&1 &
pids+=($!)
for _ in $(seq 100); do [ -s "$dir/bare.addr" ] && break; sleep 0.1; done
bare=$(head -1 "$dir/bare.addr")
path="/v1/submissions/$ID/report"
cmp -s <(curl -sf -H "Authorization: Bearer $TOKEN" "http://$pv$path") "$dir/report.json" ||
	{ echo "pathvet does not serve the stored bytes as they are" >&2; exit 1; }
cmp -s <(curl -sf "http://$bare/report") "$dir/report.json" || { echo "the bare server differs" >&2; exit 1; }

load() { "$dir/reportload" load -c "$conc" -d "$dur" "$@"; }
echo "report: $(wc -c <"$dir/report.json") bytes; $conc concurrent requests, $dur a round;" \
	"load average $(cut -d' ' -f1-3 /proc/loadavg)"
ratios=()
for r in $(seq "$rounds"); do
	a=$(load -url "http://$pv$path" -token "$TOKEN")
	e=$(load -url "http://$pv$path" -token "$TOKEN" -etag)
	b=$(load -url "http://$bare/report")
	ra=$(awk -v a="${a%% *}" -v b="${b%% *}" 'BEGIN { printf "%.2f", a / b }')
	re=$(awk -v a="${e%% *}" -v b="${b%% *}" 'BEGIN { printf "%.2f", a / b }')
	echo "round $r"
	echo "  pathvet GET report:                 $a"
	echo "  pathvet, If-None-Match (304):       $e"
	echo "  bare Echo, the same stored bytes:   $b"
	rb=-
	if [ -n "${BASE:-}" ]; then
		o=$(load -url "http://$pvbase$path" -token "$TOKEN")
		rb=$(awk -v a="${o%% *}" -v b="${b%% *}" 'BEGIN { printf "%.2f", a / b }')
		echo "  pathvet at $BASE GET report:        $o"
	fi
	echo "  ratio to bare: GET $ra, 304 $re, ${BASE:-base} GET $rb"
	ratios+=("$ra $re $rb")
done
printf '%s\n' "${ratios[@]}" | awk '{ a[NR] = $1; e[NR] = $2; o[NR] = $3 } END {
	asort(a); asort(e); asort(o); m = int((NR + 1) / 2)
	printf "median ratio to the bare server over %d rounds: GET %s, GET with If-None-Match %s, base GET %s\n",
		NR, a[m], e[m], o[m] }'
echo "load average after: $(cut -d' ' -f1-3 /proc/loadavg)"
