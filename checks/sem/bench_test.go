package sem

import (
	"context"
	"encoding/json"
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// benchModel is a DAG and a correlation matrix it was simulated from.
type benchModel struct {
	Parents [][]int     `json:"parents"`
	Cor     [][]float64 `json:"cor"`
	N       int         `json:"n"`
}

// loadOrMakeModel reads the model that testdata/bench/compare.sh wrote
// (so numpy times the same matrices) or, without it, makes one.
func loadOrMakeModel(tb testing.TB, p int) (*mat.SymDense, [][]int, int) {
	if dir := os.Getenv("PATHVET_BENCH_DIR"); dir != "" {
		b, err := os.ReadFile(filepath.Join(dir, fmt.Sprintf("model%d.json", p)))
		if err != nil {
			tb.Fatal(err)
		}
		var m benchModel
		if err := json.Unmarshal(b, &m); err != nil {
			tb.Fatal(err)
		}
		s := mat.NewSymDense(p, nil)
		for i := range p {
			for j := range p {
				s.SetSym(i, j, m.Cor[i][j])
			}
		}
		return s, m.Parents, m.N
	}
	return simulatedModel(p, uint64(p))
}

// simulatedModel: a random DAG with about two parents per node and the
// correlation matrix its linear SEM implies (unit variances).
func simulatedModel(p int, seed uint64) (*mat.SymDense, [][]int, int) {
	r := rand.New(rand.NewPCG(seed, 3))
	parents := make([][]int, p)
	b := mat.NewDense(p, p, nil)
	for i := 1; i < p; i++ {
		for j := range i {
			if r.Float64() < 2/float64(i+1) {
				parents[i] = append(parents[i], j)
				b.Set(i, j, 0.2+0.3*r.Float64())
			}
		}
	}
	var a, ainv mat.Dense
	a.Sub(eye(p), b)
	if err := ainv.Inverse(&a); err != nil {
		panic(err)
	}
	var cov mat.Dense
	cov.Mul(&ainv, ainv.T())
	s := mat.NewSymDense(p, nil)
	for i := range p {
		for j := range p {
			s.SetSym(i, j, cov.At(i, j)/sqrt(cov.At(i, i)*cov.At(j, j)))
		}
	}
	return s, parents, 1000
}

func eye(p int) *mat.Dense {
	m := mat.NewDense(p, p, nil)
	for i := range p {
		m.Set(i, i, 1)
	}
	return m
}

func BenchmarkFitDAG(b *testing.B) {
	for _, p := range []int{10, 30, 100} {
		s, parents, n := loadOrMakeModel(b, p)
		b.Run(fmt.Sprintf("p=%d", p), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := FitDAG(context.Background(), s, n, parents); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
