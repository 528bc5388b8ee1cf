#!/usr/bin/env bash
# The cohort-scale missing-data benchmark, in one run: for an invented
# cohort of 100,000 rows × 30 variables (testdata/bench/cohort.py), with
# 20% of the values missing completely at random in 5 columns ("patterns")
# and with 10% of all cells missing ("cells"), it times
#   (a) a straightforward numpy EM grouping rows by pattern ("patterns" only),
#   (b) pathvet's EM alone,
#   (c) pathvet's EM + Little's test + multiple imputation (m = 20),
#   (d) the whole `pathvet check` of the package,
#   (e) the ML standard errors' observed information and its factor, EM
#       run before the timing,
# each as its own process under /usr/bin/time -v (peak memory). (a)-(c)
# and (e) print the time of the computation alone (data already in
# memory); the wall time of the process includes reading the CSV.
# With BASE=<git revision>, it also runs (d) with that revision's pathvet
# beside this tree's, and the benchmarks BASE_BENCH (default: BenchmarkEM
# and BenchmarkMI at 100,000 × 30, 10% of the cells missing) of both
# trees, to show the change.
# Needs Debian's python3-numpy (/usr/bin/python3).
# Usage: [CASES="patterns cells"] [BASE=REV [BASE_BENCH=REGEXP]] bash testdata/bench/cohort.sh [ROWS]
#        (from the repository root)
set -euo pipefail
cd "$(dirname "$0")/../.."
rows=${1:-100000}
dir=$(mktemp -d)
trap 'rm -rf "$dir"' EXIT
py=/usr/bin/python3
go build -o "$dir/pathvet" ./cmd/pathvet
go test -c -o "$dir/missing.test" ./checks/missing
if [ -n "${BASE:-}" ]; then
  mkdir -p "$dir/base"
  git archive "$BASE" | tar -x -C "$dir/base"
  (cd "$dir/base" && go build -o "$dir/pathvet-base" ./cmd/pathvet)
fi

# measure NAME COMMAND...: prints NAME, the computation's own seconds (from
# the command's output, when it prints them), the process's wall and CPU
# (user + system) seconds and its peak MB.
measure() {
  local name=$1
  shift
  /usr/bin/time -v -o "$dir/time.txt" "$@" > "$dir/out.txt" 2>&1 || { cat "$dir/out.txt"; exit 1; }
  local own wall cpu peak
  own=$(awk '/^numpy_em/ {print $2} /^Benchmark/ {print $3 / 1e9}' "$dir/out.txt" | head -1)
  wall=$(awk -F': ' '/Elapsed \(wall clock\)/ {n = split($2, t, ":"); s = 0; for (i = 1; i <= n; i++) s = s * 60 + t[i]; print s}' "$dir/time.txt")
  cpu=$(awk -F': ' '/User time|System time/ {s += $2} END {print s}' "$dir/time.txt")
  peak=$(awk -F': ' '/Maximum resident set size/ {printf "%.0f", $2 / 1024}' "$dir/time.txt")
  printf "%-9s %-34s %10s %10s %10s %8s\n" "$case" "$name" "${own:--}" "$wall" "$cpu" "$peak"
}

echo "case      measurement                        own (s)   wall (s)    cpu (s)  peak MB"
for case in ${CASES:-patterns cells}; do
  mkdir -p "$dir/$case"
  $py testdata/bench/cohort.py write "$dir/$case" "$case" "$rows"
  export PATHVET_COHORT_CSV=$dir/$case/rows.csv
  # The plain numpy EM loops over patterns in Python: with a pattern for
  # nearly every row it takes minutes, so it runs on the "patterns" case only.
  [ "$case" = patterns ] && measure "(a) numpy EM" $py testdata/bench/cohort.py em "$dir/$case"
  measure "(b) pathvet EM" "$dir/missing.test" -test.run XXX -test.bench '^BenchmarkCohortEM$' -test.benchtime 1x
  measure "(c) EM + Little + MI (m = 20)" "$dir/missing.test" -test.run XXX -test.bench '^BenchmarkCohortMissing$' -test.benchtime 1x
  measure "(d) pathvet check" "$dir/pathvet" check --quiet --format json --out "$dir/report.json" "$dir/$case/package.json"
  if [ -n "${BASE:-}" ]; then
    measure "(d) pathvet check, $BASE" "$dir/pathvet-base" check --quiet --format json \
      --out "$dir/report-base.json" "$dir/$case/package.json"
    echo "$case      $($py testdata/bench/cohort.py compare "$dir/report-base.json" "$dir/report.json")"
  fi
  measure "(e) ML information" "$dir/missing.test" -test.run XXX -test.bench '^BenchmarkCohortInformation$' -test.benchtime 1x
done

if [ -n "${BASE:-}" ]; then
  for tree in "$dir/base" .; do
    label=$([ "$tree" = . ] && echo "this tree" || echo "$BASE")
    (cd "$tree" && go test ./checks/missing -run XXX -bench "${BASE_BENCH:-^Benchmark(EM|MI)$/n=100000/p=30}" -benchtime 1x) |
      awk -v l="$label" '/^Benchmark/ {printf "%-40s %-12s %8.2f s\n", $1, l, $3 / 1e9}'
  done
fi
