package latent

import (
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"testing"

	"gonum.org/v1/gonum/mat"

	"github.com/pathvet/pathvet/checks/dag"
)

// bigSpec is the 10-construct × 4-item model of
// testdata/bench/latent_reference.R: items y1..y40 (nodes 0..39), L0..L9
// (nodes 40..49), the complete DAG over L0..L3 in that order, L5 ← L3,
// L4 and the chain L5 → L6 → … → L9, sources independent. Its structural
// class has 4! = 24 members (the orders of L0..L3).
func bigSpec() Spec {
	s := Spec{Observed: 40, Parents: make([][]int, 50), IndependentSources: true}
	for j := range 10 {
		s.Indicators = append(s.Indicators, []int{4 * j, 4*j + 1, 4*j + 2, 4*j + 3})
	}
	lat := func(j int) int { return 40 + j }
	s.Parents[lat(1)] = []int{lat(0)}
	s.Parents[lat(2)] = []int{lat(0), lat(1)}
	s.Parents[lat(3)] = []int{lat(0), lat(1), lat(2)}
	s.Parents[lat(5)] = []int{lat(3), lat(4)}
	for j := 6; j < 10; j++ {
		s.Parents[lat(j)] = []int{lat(j - 1)}
	}
	return s
}

// bigCovariance reads the data testdata/bench/latent.sh had the R
// script simulate (PATHVET_BENCH_DIR) or, without it, simulates its own.
func bigCovariance(tb testing.TB) (*mat.SymDense, int) {
	dir := os.Getenv("PATHVET_BENCH_DIR")
	if dir == "" {
		return randomCovariance(bigSpec(), rand.New(rand.NewPCG(19, 19)), 500), 500
	}
	names := make([]string, 40)
	for i := range names {
		names[i] = fmt.Sprintf("y%d", i+1)
	}
	path, err := filepath.Abs(filepath.Join(dir, "big.csv"))
	if err != nil {
		tb.Fatal(err)
	}
	return covariance(readColumns(tb, path, names), Wishart)
}

func BenchmarkLatentFit(b *testing.B) {
	ref := referenceModels["hs_cfa"]
	hs, n := covariance(readColumns(b, "hs.csv", ref.columns), Wishart)
	big, nBig := bigCovariance(b)
	for _, c := range []struct {
		name string
		s    *mat.SymDense
		n    int
		spec Spec
	}{{"hs_cfa", hs, n, ref.spec()}, {"big", big, nBig, bigSpec()}} {
		b.Run(c.name, func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := Fit(bg, c.s, c.n, c.spec, nil); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkLatentClass24 refits the 24 members of bigSpec's structural
// class (checks/dag's enumeration), each warm from the declared fit; one
// op is all 24.
func BenchmarkLatentClass24(b *testing.B) {
	s, n := bigCovariance(b)
	spec := bigSpec()
	declared, err := Fit(bg, s, n, spec, nil)
	if err != nil {
		b.Fatal(err)
	}
	g, nodes := structuralDAG(spec)
	members, _, err := dag.Members(dag.CPDAG(g), nil, 100)
	if err != nil || len(members) != 24 {
		b.Fatalf("%d members, %v", len(members), err)
	}
	specs := make([]Spec, len(members))
	for i, m := range members {
		specs[i] = withDAG(spec, m, nodes)
	}
	b.ReportAllocs()
	for b.Loop() {
		for _, ms := range specs {
			if _, err := Fit(bg, s, n, ms, &Options{Warm: declared}); err != nil {
				b.Fatal(err)
			}
		}
	}
}
