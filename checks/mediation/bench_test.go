package mediation

import (
	"context"
	"encoding/csv"
	"fmt"
	"math/rand/v2"
	"os"
	"strconv"
	"testing"
)

// benchParents is the benchmark's model over ten variables: seven
// covariates c1..c7 (0..6) cause the exposure x (7), the mediator m (8)
// and the outcome y (9); x → m → y and x → y. testdata/bench/mediation.R
// fits the same model.
var benchParents = [][]int{nil, nil, nil, nil, nil, nil, nil,
	{0, 1, 2, 3, 4, 5, 6}, {7, 0, 1, 2, 3, 4, 5, 6}, {8, 7, 0, 1, 2, 3, 4, 5, 6}}

// benchColumns reads the 10,000 × 10 CSV that testdata/bench/mediation.sh
// writes (PATHVET_BENCH_MEDIATION_CSV), so the R SEM reference times the
// same rows; without it, it simulates rows from the same model.
func benchColumns(tb testing.TB) [][]float64 {
	const n = 10_000
	cols := make([][]float64, len(benchParents))
	if path := os.Getenv("PATHVET_BENCH_MEDIATION_CSV"); path != "" {
		f, err := os.Open(path)
		if err != nil {
			tb.Fatal(err)
		}
		defer f.Close()
		recs, err := csv.NewReader(f).ReadAll()
		if err != nil {
			tb.Fatal(err)
		}
		for _, rec := range recs[1:] {
			for j, s := range rec {
				v, err := strconv.ParseFloat(s, 64)
				if err != nil {
					tb.Fatal(err)
				}
				cols[j] = append(cols[j], v)
			}
		}
		return cols
	}
	r := rand.New(rand.NewPCG(18, 10))
	for j := range cols {
		cols[j] = make([]float64, n)
	}
	for i := range n {
		for j, pa := range benchParents {
			v := r.NormFloat64()
			for k, p := range pa {
				v += 0.3 / float64(k+1) * cols[p][i]
			}
			cols[j][i] = v
		}
	}
	return cols
}

// BenchmarkBootstrap10kx10 times the percentile bootstrap of the indirect
// effect x → m → y, 2,000 resamples of 10,000 rows of ten variables (both
// equations refitted in each), on GOMAXPROCS workers. Given the rows by
// testdata/bench/mediation.sh, it prints the interval to set beside the
// reference's.
func BenchmarkBootstrap10kx10(b *testing.B) {
	cols := benchColumns(b)
	p := Path{From: 7, To: 9, Through: []int{8}}
	var iv *Interval
	for b.Loop() {
		var err error
		if iv, err = Bootstrap(context.Background(), cols, benchParents, p, BootOptions{Seed: 1}); err != nil {
			b.Fatal(err)
		}
	}
	if os.Getenv("PATHVET_BENCH_MEDIATION_CSV") != "" {
		fmt.Printf("interval %.6g %.6g\n", iv.Lo, iv.Hi)
	}
}

// BenchmarkMonteCarlo times the Monte Carlo interval of the same effect
// (20,000 draws).
func BenchmarkMonteCarlo(b *testing.B) {
	cols := benchColumns(b)
	m, err := FitModel(sampleCov(cols, false), len(cols[0]), benchParents, OLS)
	if err != nil {
		b.Fatal(err)
	}
	p := Path{From: 7, To: 9, Through: []int{8}}
	for b.Loop() {
		if _, err := MonteCarlo(context.Background(), m, p, MCOptions{Seed: 1}); err != nil {
			b.Fatal(err)
		}
	}
}
