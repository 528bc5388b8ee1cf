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

// BenchmarkCohortMissing is what the missing-data check computes for the
// cohort, whose only binary variable is complete and no claim's outcome:
// EM, Little's test, and m = 20 imputations, each reduced to its means and
// covariance matrix (ImputeMoments).
func BenchmarkCohortMissing(b *testing.B) {
	cohortMissing(b, func(cols [][]float64, em *EMResult) error {
		noop := func(int, []float64, *mat.SymDense) error { return nil }
		return ImputeMoments(context.Background(), cols, em, ImputeOptions{M: 20, Seed: 1}, noop)
	})
}

// BenchmarkCohortMissingRows is the same with the completed rows laid out
// (ImputeEach), as the check imputes when a binary variable has missing
// values or is a claim's outcome.
func BenchmarkCohortMissingRows(b *testing.B) {
	cohortMissing(b, func(cols [][]float64, em *EMResult) error {
		moments := func(_ int, data *mat.Dense) error {
			RowMoments(data)
			return nil
		}
		return ImputeEach(context.Background(), cols, em, ImputeOptions{M: 20, Seed: 1}, moments)
	})
}

func cohortMissing(b *testing.B, impute func(cols [][]float64, em *EMResult) error) {
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
		if err := impute(cols, em); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkCohortInformation is the ML estimates' covariance from the
// observed information (EstimateCovariance) at the EM estimate, EM run
// once before the timing.
func BenchmarkCohortInformation(b *testing.B) {
	cols := cohort(b)
	em, err := EM(context.Background(), cols, Options{})
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := EstimateCovariance(context.Background(), cols, em); err != nil {
			b.Fatal(err)
		}
	}
}
