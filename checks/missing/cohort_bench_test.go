package missing

import (
	"context"
	"os"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// cohort reads the CSV (header, then rows; an empty cell missing) that
// testdata/bench/cohort.py writes, named by PATHVET_COHORT_CSV.
func cohort(b *testing.B) [][]float64 {
	path := os.Getenv("PATHVET_COHORT_CSV")
	if path == "" {
		b.Skip("PATHVET_COHORT_CSV is not set (testdata/bench/cohort.sh sets it)")
	}
	f, err := os.Open(path)
	if err != nil {
		b.Fatal(err)
	}
	defer f.Close()
	return readCSVColumns(b, f, true)
}

// BenchmarkCohortEM is EM alone, at the default tolerance the check uses.
func BenchmarkCohortEM(b *testing.B) {
	cols := cohort(b)
	b.ReportAllocs()
	for b.Loop() {
		em, err := EM(context.Background(), cols, Options{})
		if err != nil {
			b.Fatal(err)
		}
		b.ReportMetric(float64(em.Iterations), "iterations")
	}
}

// BenchmarkCohortMissing is what the missing-data check computes: EM,
// Little's test, and m = 20 imputations, each reduced to its means and
// covariance matrix.
func BenchmarkCohortMissing(b *testing.B) {
	cols := cohort(b)
	b.ReportAllocs()
	for b.Loop() {
		em, err := EM(context.Background(), cols, Options{})
		if err != nil {
			b.Fatal(err)
		}
		if _, err := LittleMCAR(cols, em); err != nil {
			b.Fatal(err)
		}
		moments := func(_ int, data *mat.Dense) error {
			RowMoments(data)
			return nil
		}
		err = ImputeEach(context.Background(), cols, em, ImputeOptions{M: 20, Seed: 1}, moments)
		if err != nil {
			b.Fatal(err)
		}
	}
}
