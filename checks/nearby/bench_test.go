package nearby_test

import (
	"context"
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat"

	"github.com/pathvet/pathvet/checks/nearby"
)

// simulated is a random DAG with about 1.5 arrows per node and the
// correlation matrix of 1,000 cases drawn from its linear SEM (a sample,
// so that the implied independences hold only up to noise, as in data).
func simulated(p int, seed uint64) (*mat.SymDense, [][]int) {
	r := rand.New(rand.NewPCG(seed, 7))
	pa := randomParents(r, p, math.Min(1, 3/float64(p)))
	coef := make([][]float64, p)
	for v := range p {
		for range pa[v] {
			coef[v] = append(coef[v], 0.2+0.3*r.Float64())
		}
	}
	order := topological(pa)
	x := mat.NewDense(1000, p, nil)
	for i := range 1000 {
		for _, v := range order {
			y := r.NormFloat64()
			for k, u := range pa[v] {
				y += coef[v][k] * x.At(i, u)
			}
			x.Set(i, v, y)
		}
	}
	s := mat.NewSymDense(p, nil)
	stat.CorrelationMatrix(s, x, nil)
	return s, pa
}

func topological(pa [][]int) []int {
	done := make([]bool, len(pa))
	var order []int
	var visit func(v int)
	visit = func(v int) {
		if done[v] {
			return
		}
		done[v] = true
		for _, u := range pa[v] {
			visit(u)
		}
		order = append(order, v)
	}
	for v := range pa {
		visit(v)
	}
	return order
}

func BenchmarkNeighbours(b *testing.B) {
	for _, p := range []int{10, 30, 100, 500} {
		s, pa := simulated(p, 1)
		b.Run(fmt.Sprint(p), func(b *testing.B) {
			for b.Loop() {
				m := nearby.Model{S: s, N: 1000}
				_, err := nearby.Neighbours(context.Background(), m, pa, nearby.Knowledge{})
				if err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

func BenchmarkSearch(b *testing.B) {
	for _, p := range []int{10, 30, 100, 500} {
		s, pa := simulated(p, 1)
		b.Run(fmt.Sprint(p), func(b *testing.B) {
			for b.Loop() {
				m := nearby.Model{S: s, N: 1000}
				_, err := nearby.Search(context.Background(), m, pa, nearby.Knowledge{})
				if err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
