package dag

import (
	"math/rand/v2"
	"slices"
	"testing"
)

// orderCount against every permutation, for random relations on up to 8
// nodes (arcs of a random DAG, so that some orders exist), some with
// twins, some without.
func TestOrderCount_AgainstPermutations(t *testing.T) {
	r := rand.New(rand.NewPCG(5, 18))
	for i := range 300 {
		n := 1 + r.IntN(8)
		g := randomDAG(r, n, 0.1+0.6*r.Float64())
		vs := make([]int, n)
		for j := range vs {
			vs[j] = j
		}
		got, err := orderCount(vs, g.HasArc)
		if err != nil {
			t.Fatal(err)
		}
		want, perm, rank := 0, slices.Clone(vs), make([]int, n)
		for {
			for k, v := range perm {
				rank[v] = k
			}
			if !slices.ContainsFunc(g.Arcs(), func(e Edge) bool { return rank[e.From] > rank[e.To] }) {
				want++
			}
			if !nextPermutation(perm) {
				break
			}
		}
		if got.Int64() != int64(want) {
			t.Fatalf("relation %d (%s): %v orders, permutations give %d", i, g.Key(), got, want)
		}
	}
}
