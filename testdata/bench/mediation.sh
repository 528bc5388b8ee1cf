#!/usr/bin/env bash
# Times the percentile bootstrap of an indirect effect (2,000 resamples of
# 10,000 rows × 10 variables) in pathvet's core (BenchmarkBootstrap10kx10,
# checks/mediation) and in the R SEM reference (testdata/bench/mediation.R,
# Debian's R SEM package) on the same rows, in one run, and prints both,
# the ratio, both intervals and the machine's load before and after.
# Usage: bash testdata/bench/mediation.sh   (from the repository root)
set -euo pipefail
cd "$(dirname "$0")/../.."
dir=$(mktemp -d)
trap 'rm -rf "$dir"' EXIT
Rscript testdata/bench/mediation.R write "$dir/rows.csv"
echo "load before: $(cut -d' ' -f1-3 /proc/loadavg) on $(nproc) cores"
PATHVET_BENCH_MEDIATION_CSV=$dir/rows.csv \
  go test ./checks/mediation -run XXX -bench '^BenchmarkBootstrap10kx10$' -benchtime 5x \
  | awk '/^Benchmark/ {print $3 / 1e9} /^interval/ {print $2, $3 > "/dev/stderr"}' > "$dir/go.txt" 2> "$dir/go_ci.txt"
Rscript testdata/bench/mediation.R time "$dir/rows.csv" > "$dir/r.txt"
echo "load after:  $(cut -d' ' -f1-3 /proc/loadavg)"
read -r go < "$dir/go.txt"
read -r r rlo rhi < "$dir/r.txt"
read -r glo ghi < "$dir/go_ci.txt"
awk -v g="$go" -v r="$r" 'BEGIN { printf "bootstrap 2000 × 10000 rows: pathvet %.3g s, R SEM reference %.3g s, ratio %.1f\n", g, r, r / g }'
echo "95% percentile intervals: pathvet [$glo, $ghi], R SEM reference [$rlo, $rhi]"
