#!/usr/bin/env bash
# Times pathvet's numerical cores and the same computations in numpy, scipy
# and statsmodels on the same inputs, in one run, and prints the ratios.
# Needs Debian's python3-statsmodels and python3-scipy (/usr/bin/python3).
# Usage: bash testdata/bench/compare.sh   (from the repository root)
set -euo pipefail
cd "$(dirname "$0")/../.."
dir=$(mktemp -d)
trap 'rm -rf "$dir"' EXIT
py=/usr/bin/python3
$py testdata/bench/reference_bench.py write "$dir"
PATHVET_BENCH_DIR=$dir PATHVET_BENCH_CSV=$dir/ols.csv \
  go test $(ls -d ./checks/sem ./checks/linmod ./checks/missing 2>/dev/null) -run XXX -bench '^Benchmark(FitDAG|OLS100kx30|EM)$' -benchmem 2>/dev/null \
  | awk '/^Benchmark/ {name=$1; sub(/-[0-9]+$/, "", name); print name, $3 / 1e9}' > "$dir/go.txt"
$py testdata/bench/reference_bench.py time "$dir" > "$dir/py.txt"
echo "benchmark                      pathvet (s/op)   reference (s/op)   reference / pathvet"
join <(sort "$dir/go.txt") <(sort "$dir/py.txt") | while read -r name go ref; do
  awk -v n="$name" -v g="$go" -v r="$ref" 'BEGIN { printf "%-30s %14.6g %18.6g %20.2f\n", n, g, r, r / g }'
done
