package dag

import (
	"fmt"
	"math/rand/v2"
	"testing"
)

// sparseDAG is a random DAG on n nodes with about deg arcs per node.
func sparseDAG(n int, deg float64, seed uint64) *PDAG {
	return randomDAG(rand.New(rand.NewPCG(seed, 7)), n, deg/float64(n-1))
}

// chordalDAG is a DAG without v-structures whose skeleton is a dense
// chordal graph on n nodes: each node's parents are a clique, so its CPDAG
// is one undirected component.
func chordalDAG(n int, seed uint64) *PDAG {
	r := rand.New(rand.NewPCG(seed, 9))
	parents := make([][]int, n)
	var arcs []Edge
	for v := 1; v < n; v++ {
		u := r.IntN(v)
		pa := []int{u}
		for _, p := range parents[u] {
			if r.Float64() < 0.85 {
				pa = append(pa, p)
			}
		}
		parents[v] = pa
		for _, p := range pa {
			arcs = append(arcs, Edge{p, v})
		}
	}
	return FromArcs(n, arcs)
}

func BenchmarkCPDAGAndClassSize(b *testing.B) {
	cases := []struct {
		name string
		g    *PDAG
	}{
		{"sparse50", sparseDAG(50, 3, 1)},
		{"sparse200", sparseDAG(200, 3, 2)},
		{"sparse1000", sparseDAG(1000, 3, 3)},
		{"dense30component", chordalDAG(30, 4)},
	}
	for _, tc := range cases {
		c := CPDAG(tc.g)
		b.Run(tc.name+"/cpdag", func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				CPDAG(tc.g)
			}
		})
		b.Run(tc.name+"/classsize", func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				ClassSize(c)
			}
		})
	}
}

func BenchmarkPlausibleSize(b *testing.B) {
	g := chordalDAG(30, 4)
	c := CPDAG(g)
	req := append(ExogenousArcs(g, 0), g.Arcs()[len(g.Arcs())/2])
	b.ReportAllocs()
	for b.Loop() {
		if _, err := PlausibleSize(c, req); err != nil {
			b.Fatal(err)
		}
	}
}

func ExampleClassSize() {
	// a − b − c − a plus c − d: a triangle with a pendant node.
	c := New(4, nil, [][2]int{{0, 1}, {1, 2}, {0, 2}, {2, 3}})
	fmt.Println(ClassSize(c))
	// Output: 8
}

// BenchmarkPlausibleSizeTiered counts a complete 30-node component under
// three tiers of ten (10!³ members): every node is constrained, which the
// orders' classes of interchangeable nodes count in 11³ states.
func BenchmarkPlausibleSizeTiered(b *testing.B) {
	c := complete(30)
	var tiers Tiers
	for k := range 3 {
		var t []int
		for v := range 10 {
			t = append(t, 10*k+v)
		}
		tiers = append(tiers, t)
	}
	req, err := TierArcs(c, tiers)
	if err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		if _, err := PlausibleSize(c, req); err != nil {
			b.Fatal(err)
		}
	}
}
