package linmod

import (
	"encoding/csv"
	"io"
	"math/rand/v2"
	"os"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// benchRows reads the 100,000 × 31 CSV (30 predictors, then y) that
// testdata/bench/compare.sh writes, so statsmodels times the same data;
// without it, it makes data of that shape.
func benchRows(tb testing.TB) (*mat.Dense, []float64) {
	const n, k = 100_000, 30
	x := mat.NewDense(n, k, nil)
	y := make([]float64, n)
	if path := os.Getenv("PATHVET_BENCH_CSV"); path != "" {
		f, err := os.Open(path)
		if err != nil {
			tb.Fatal(err)
		}
		defer f.Close()
		r := csv.NewReader(f)
		r.ReuseRecord = true
		if _, err := r.Read(); err != nil {
			tb.Fatal(err)
		}
		for i := 0; ; i++ {
			rec, err := r.Read()
			if err == io.EOF {
				return x, y
			}
			if err != nil || i >= n {
				tb.Fatal(err, i)
			}
			for j := range k {
				x.Set(i, j, mustFloat(tb, rec[j]))
			}
			y[i] = mustFloat(tb, rec[k])
		}
	}
	r := rand.New(rand.NewPCG(1, 1))
	for i := range n {
		s := 0.0
		for j := range k {
			v := r.NormFloat64()
			x.Set(i, j, v)
			s += 0.1 * v
		}
		y[i] = s + r.NormFloat64()
	}
	return x, y
}

// BenchmarkOLS100kx30 times what pathvet runs for raw rows: the moments
// of the columns, then the least-squares fit from them (FromMoments).
func BenchmarkOLS100kx30(b *testing.B) {
	x, y := benchRows(b)
	n, k := x.Dims()
	d := mat.NewDense(n, k+1, nil)
	d.Slice(0, n, 0, k).(*mat.Dense).Copy(x)
	d.SetCol(k, y)
	pred := make([]int, k)
	for j := range pred {
		pred[j] = j
	}
	b.ReportAllocs()
	for b.Loop() {
		cov, means := rowMoments(d)
		if _, err := FromMoments(cov, means, n, k, pred, 0.95); err != nil {
			b.Fatal(err)
		}
	}
}
