#!/usr/bin/env bash
# Times checks/latent's fits beside the R SEM reference's fits of the same
# data, in one run, and prints the ratios (testdata/bench/latent_reference.R
# says what each side times):
#   hs_cfa    Holzinger & Swineford (1939) three-factor CFA, per fit
#   big       a 10-construct x 4-item model with a structural DAG, per fit
#   class24   the 24 members of its structural class refitted warm from
#             the declared fit, all 24
# Needs Rscript and Debian's R SEM package (see the R script's header).
# Usage: bash testdata/bench/latent.sh   (from the repository root)
set -euo pipefail
cd "$(dirname "$0")/../.."
dir=$(mktemp -d)
trap 'rm -rf "$dir"' EXIT
Rscript testdata/bench/latent_reference.R write "$dir"
echo "load average before: $(cut -d' ' -f1-3 /proc/loadavg)"
PATHVET_BENCH_DIR=$dir go test ./checks/latent -run XXX -bench '^BenchmarkLatent' -benchmem 2>/dev/null \
  | awk '/^Benchmark/ {name=$1; sub(/-[0-9]+$/, "", name); sub(/^BenchmarkLatent(Fit\/)?/, "", name);
         if (name == "Class24") name = "class24"; print name, $3 / 1e9}' > "$dir/go.txt"
Rscript testdata/bench/latent_reference.R time "$dir" > "$dir/r.txt"
echo "load average after: $(cut -d' ' -f1-3 /proc/loadavg)"
echo "benchmark    pathvet (s/op)   R SEM reference (s/op)   reference / pathvet"
join <(sort "$dir/go.txt") <(sort "$dir/r.txt") | while read -r name go ref; do
  awk -v n="$name" -v g="$go" -v r="$ref" 'BEGIN { printf "%-12s %14.6g %24.6g %21.1f\n", n, g, r, r / g }'
done
