#!/usr/bin/env bash
# The dense summary package side by side with its numpy floor, in one run:
# testdata/bench/dense.py writes a complete DAG on 100 invented variables
# with 200 claims; then, in alternating rounds, it times
#   (a) the numpy floor (testdata/bench/dense_floor.py: the local
#       regressions the one-edit neighbours and the claims need, solved on
#       the correlation matrix; computation alone, package already read),
#   (b) the whole `pathvet check` of the package (reading it, all ten
#       checks, the JSON report), as its own process under /usr/bin/time -v,
# and prints each round, the fastest of each and their ratio, and the same
# for CPU time (the floor's computation; pathvet's whole process), which
# moves less on a shared machine. numpy runs with one BLAS thread, as
# pathvet's cores run on one.
# Needs Debian's python3-numpy (/usr/bin/python3).
# Usage: [ROUNDS=3] bash testdata/bench/dense.sh   (from the repository root)
set -euo pipefail
cd "$(dirname "$0")/../.."
dir=$(mktemp -d)
trap 'rm -rf "$dir"' EXIT
py=/usr/bin/python3
go build -o "$dir/pathvet" ./cmd/pathvet
$py testdata/bench/dense.py "$dir"
echo "package: $(wc -c < "$dir/package.json") bytes; load average: $(cut -d' ' -f1-3 /proc/loadavg)"
echo "round  floor wall (s)  floor cpu (s)  check wall (s)  check cpu (s)  check peak MB"
best_floor=999999 best_check=999999 best_fcpu=999999 best_ccpu=999999
for round in $(seq "${ROUNDS:-3}"); do
  read -r _ floor _ fcpu < <(OPENBLAS_NUM_THREADS=1 OMP_NUM_THREADS=1 $py testdata/bench/dense_floor.py "$dir/package.json")
  /usr/bin/time -v -o "$dir/time.txt" "$dir/pathvet" check --quiet --format json --out "$dir/report.json" \
    "$dir/package.json" || [ $? -le 1 ]
  wall=$(awk -F': ' '/Elapsed \(wall clock\)/ {n = split($2, t, ":"); s = 0; for (i = 1; i <= n; i++) s = s * 60 + t[i]; print s}' "$dir/time.txt")
  cpu=$(awk -F': ' '/User time|System time/ {s += $2} END {print s}' "$dir/time.txt")
  peak=$(awk -F': ' '/Maximum resident set size/ {printf "%.0f", $2 / 1024}' "$dir/time.txt")
  printf "%5d  %15s  %13s  %14s  %13s  %13s\n" "$round" "$floor" "$fcpu" "$wall" "$cpu" "$peak"
  best_floor=$(awk -v a="$best_floor" -v b="$floor" 'BEGIN {print (b < a) ? b : a}')
  best_check=$(awk -v a="$best_check" -v b="$wall" 'BEGIN {print (b < a) ? b : a}')
  best_fcpu=$(awk -v a="$best_fcpu" -v b="$fcpu" 'BEGIN {print (b < a) ? b : a}')
  best_ccpu=$(awk -v a="$best_ccpu" -v b="$cpu" 'BEGIN {print (b < a) ? b : a}')
done
awk -v f="$best_floor" -v c="$best_check" -v fc="$best_fcpu" -v cc="$best_ccpu" 'BEGIN {
  printf "fastest wall: numpy floor %.3f s, pathvet check %.3f s; pathvet / floor = %.2f (goal: at most 3)\n", f, c, c / f
  printf "least CPU:    numpy floor %.3f s, pathvet check %.3f s; pathvet / floor = %.2f\n", fc, cc, cc / fc }'
echo "load average after: $(cut -d' ' -f1-3 /proc/loadavg)"
python3 - "$dir/report.json" <<'EOF'
import json, sys
r = json.load(open(sys.argv[1]))
for c in r["checks"]:
    print(f"  {c['id']:24} {c['status']:15} {c.get('run_error', '')}")
EOF
