package missing

import (
	"context"
	"encoding/csv"
	"fmt"
	"io"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strconv"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// benchData reads the n × p data with 10% missing cells that
// testdata/bench/compare.sh writes (so numpy runs EM on the same data),
// or makes data of that shape: correlated normal columns, each cell
// missing completely at random with probability .1.
func benchData(tb testing.TB, n, p int) [][]float64 {
	if dir := os.Getenv("PATHVET_BENCH_DIR"); dir != "" {
		return readBenchCSV(tb, filepath.Join(dir, fmt.Sprintf("em_%d_%d.csv", n, p)), p)
	}
	r := rand.New(rand.NewPCG(uint64(n), uint64(p)))
	cols := make([][]float64, p)
	for j := range cols {
		cols[j] = make([]float64, n)
	}
	for i := range n {
		f := r.NormFloat64()
		for j := range p {
			cols[j][i] = 0.6*f + 0.8*r.NormFloat64()
			if r.Float64() < 0.1 {
				cols[j][i] = math.NaN()
			}
		}
	}
	return cols
}

func readBenchCSV(tb testing.TB, path string, p int) [][]float64 {
	f, err := os.Open(path)
	if err != nil {
		tb.Fatal(err)
	}
	defer f.Close()
	return readCSVColumns(tb, f, false)
}

// readCSVColumns reads numbers by columns, "nan" or empty missing, after a header
// line when header is set.
func readCSVColumns(tb testing.TB, f io.Reader, header bool) [][]float64 {
	r := csv.NewReader(f)
	var cols [][]float64
	for line := 1; ; line++ {
		rec, err := r.Read()
		if err == io.EOF {
			return cols
		}
		if err != nil {
			tb.Fatal(err)
		}
		if cols == nil {
			cols = make([][]float64, len(rec))
		}
		if header && line == 1 {
			continue
		}
		for j, v := range rec {
			x := math.NaN()
			if v != "nan" && v != "" {
				if x, err = strconv.ParseFloat(v, 64); err != nil {
					tb.Fatalf("line %d: %v", line, err)
				}
			}
			cols[j] = append(cols[j], x)
		}
	}
}

var benchShapes = []struct{ n, p int }{{10_000, 10}, {10_000, 30}, {100_000, 10}, {100_000, 30}}

func BenchmarkEM(b *testing.B) {
	for _, s := range benchShapes {
		cols := benchData(b, s.n, s.p)
		b.Run(fmt.Sprintf("n=%d/p=%d", s.n, s.p), func(b *testing.B) {
			b.ReportAllocs()
			var iters int
			for b.Loop() {
				em, err := EM(context.Background(), cols, Options{Tolerance: 1e-8})
				if err != nil {
					b.Fatal(err)
				}
				iters = em.Iterations
			}
			b.ReportMetric(float64(iters), "iterations")
		})
	}
}

func BenchmarkMI(b *testing.B) {
	for _, s := range benchShapes {
		cols := benchData(b, s.n, s.p)
		em, err := EM(context.Background(), cols, Options{Tolerance: 1e-8})
		if err != nil {
			b.Fatal(err)
		}
		b.Run(fmt.Sprintf("n=%d/p=%d/m=20", s.n, s.p), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				opt := ImputeOptions{M: 20, Seed: 1, EM: Options{Tolerance: 1e-6}}
				discard := func(int, *mat.Dense) error { return nil }
				if err := ImputeEach(context.Background(), cols, em, opt, discard); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkObservedInformation is the observed information at 20,000 ×
// 30 with 10% of the cells missing, a pattern in nearly every row (about
// 10,176 patterns, about 4.4·10⁹ operations against MaxInformationWork).
func BenchmarkObservedInformation(b *testing.B) {
	cols := benchData(b, 20000, 30)
	em, err := EM(context.Background(), cols, Options{})
	if err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		if _, err := EstimateCovariance(context.Background(), cols, em); err != nil {
			b.Fatal(err)
		}
	}
}
