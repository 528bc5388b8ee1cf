package nearby_test

import (
	"context"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/pathvet/pathvet/checks/dag"
	"github.com/pathvet/pathvet/checks/nearby"
)

// The greedy search on 60 random graphs: its ΔBIC is the whole-model
// difference (sem.FitDAG), its graph is acyclic and respects the
// knowledge, its edits lead there from the declared graph, and no single
// edit of it lowers BIC any further (checked by brute force).
func TestSearch_LocalOptimum(t *testing.T) {
	r := rand.New(rand.NewPCG(5, 6))
	for trial := range 60 {
		p := 3 + trial%5
		pa := randomParents(r, p, 0.3)
		s := randomCorrelation(r, p)
		k := randomKnowledge(r, pa)
		n := 100 + r.IntN(900)
		res, err := nearby.Search(context.Background(), nearby.Model{S: s, N: n}, pa, k)
		if err != nil {
			t.Fatal(err)
		}
		whole := wholeBIC(t, s, n, res.Parents) - wholeBIC(t, s, n, pa)
		if !scalar.EqualWithinAbsOrRel(res.DeltaBIC, whole, 1e-9, 1e-9) || res.DeltaBIC > 0 {
			t.Errorf("trial %d: search ΔBIC %g, whole-model %g", trial, res.DeltaBIC, whole)
		}
		if dag.FindCycle(toPDAG(res.Parents)) != nil || !respects(res.Parents, pa, k) {
			t.Errorf("trial %d: the search left the allowed DAGs", trial)
		}
		g := pa
		for _, e := range res.Edits {
			g = nearby.Apply(g, e)
		}
		if dag.CPDAG(toPDAG(g)).Key() != dag.CPDAG(toPDAG(res.Parents)).Key() {
			t.Errorf("trial %d: the edits do not lead to the graph found", trial)
		}
		for _, o := range oracle(t, s, n, res.Parents, k) {
			if o.delta < -1e-6 {
				t.Errorf("trial %d: the edit %v of the search's graph still lowers BIC by %g",
					trial, o.e, -o.delta)
			}
		}
	}
}

// A cancelled context stops both the neighbourhood and the search with
// the context's error.
func TestNearby_Cancelled(t *testing.T) {
	s, pa := simulated(30, 2)
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	m := nearby.Model{S: s, N: 1000}
	if _, err := nearby.Neighbours(ctx, m, pa, nearby.Knowledge{}); err != context.Canceled {
		t.Errorf("Neighbours: %v", err)
	}
	if _, err := nearby.Search(ctx, m, pa, nearby.Knowledge{}); err != context.Canceled {
		t.Errorf("Search: %v", err)
	}
}

// Bad input is an error, not a panic: a cycle, a parent out of range, a
// matrix of another size.
func TestNearby_BadInput(t *testing.T) {
	s, _ := simulated(3, 3)
	m := nearby.Model{S: s, N: 100}
	for _, pa := range [][][]int{{{2}, {0}, {1}}, {{5}, nil, nil}, {nil, nil}} {
		if _, err := nearby.Neighbours(context.Background(), m, pa, nearby.Knowledge{}); err == nil {
			t.Errorf("parents %v: no error", pa)
		}
	}
}
