package latent

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"github.com/pathvet/pathvet/checks/dag"
)

// structuralDAG returns the structural part of spec as a DAG over
// 0..len(nodes)−1 and the node of each index.
func structuralDAG(spec Spec) (*dag.PDAG, []int) {
	r, err := spec.validate()
	if err != nil {
		panic(err)
	}
	var nodes []int
	for v, ok := range r.structural {
		if ok {
			nodes = append(nodes, v)
		}
	}
	var arcs []dag.Edge
	for i, v := range nodes {
		for _, u := range spec.parentsOf(v) {
			arcs = append(arcs, dag.Edge{From: slices.Index(nodes, u), To: i})
		}
	}
	return dag.FromArcs(len(nodes), arcs), nodes
}

// withDAG returns spec with its structural arrows replaced by g's.
func withDAG(spec Spec, g *dag.PDAG, nodes []int) Spec {
	out := spec
	out.Parents = make([][]int, spec.Nodes())
	for _, e := range g.Arcs() {
		out.Parents[nodes[e.To]] = append(out.Parents[nodes[e.To]], nodes[e.From])
	}
	return out
}

// coveredEdge finds an arc x → y with pa(y) = pa(x) ∪ {x}: reversing it
// gives a Markov-equivalent DAG (Chickering 1995, UAI, Lemma 1).
func coveredEdge(g *dag.PDAG) (dag.Edge, bool) {
	for _, e := range g.Arcs() {
		want := append(slices.Clone(g.Parents(e.From)), e.From)
		slices.Sort(want)
		if slices.Equal(g.Parents(e.To), want) {
			return e, true
		}
	}
	return dag.Edge{}, false
}

func reversed(g *dag.PDAG, rev dag.Edge) *dag.PDAG {
	var arcs []dag.Edge
	for _, e := range g.Arcs() {
		if e == rev {
			e = dag.Edge{From: rev.To, To: rev.From}
		}
		arcs = append(arcs, e)
	}
	return dag.FromArcs(g.N(), arcs)
}

// equivTol: Markov-equivalent structural graphs imply the same set of
// covariance matrices (Verma & Pearl 1990, for DAGs with independent
// sources; the measurement part is shared), so the minima agree up to
// the optimizer's tolerance.
const equivTol = 1e-8

// Random measurement models, random structural DAGs, a covered edge
// reversed, both fitted from the composite-correlation start.
func TestEquivalence_CoveredEdgeReversed(t *testing.T) {
	r := rand.New(rand.NewPCG(19, 5))
	tried := 0
	for trial := 0; tried < 25 && trial < 500; trial++ {
		spec := randomSpec(r, 3+r.IntN(3), 0.6, trial%2 == 0)
		spec.IndependentSources = true
		g, nodes := structuralDAG(spec)
		e, ok := coveredEdge(g)
		if !ok {
			continue
		}
		tried++
		s := randomCovariance(spec, r, 400)
		a, err := Fit(bg, s, 400, spec, nil)
		if err != nil {
			t.Fatalf("trial %d: %v", trial, err)
		}
		b, err := Fit(bg, s, 400, withDAG(spec, reversed(g, e), nodes), nil)
		if err != nil {
			t.Fatalf("trial %d reversed: %v", trial, err)
		}
		if a.Fit.DF != b.Fit.DF || math.Abs(a.Fit.ChiSquare-b.Fit.ChiSquare) > equivTol {
			t.Errorf("trial %d: χ² %.12f on %d vs %.12f on %d", trial, a.Fit.ChiSquare, a.Fit.DF,
				b.Fit.ChiSquare, b.Fit.DF)
		}
	}
	if tried < 25 {
		t.Fatalf("only %d models had a covered edge", tried)
	}
}

// Every member of a structural class (checks/dag's enumeration of the
// CPDAG), refitted warm from the declared fit, has the declared χ²; a
// cold fit of each agrees with its warm fit.
func TestEquivalence_ClassMembersWarm(t *testing.T) {
	r := rand.New(rand.NewPCG(19, 6))
	checked := 0
	for trial := 0; checked < 6 && trial < 200; trial++ {
		spec := randomSpec(r, 4+r.IntN(2), 0.7, trial%2 == 1)
		spec.IndependentSources = true
		g, nodes := structuralDAG(spec)
		members, _, err := dag.Members(dag.CPDAG(g), nil, 30)
		if err != nil || len(members) < 3 {
			continue
		}
		checked++
		s := randomCovariance(spec, r, 300)
		declared, err := Fit(bg, s, 300, spec, nil)
		if err != nil {
			t.Fatal(err)
		}
		for i, m := range members {
			ms := withDAG(spec, m, nodes)
			warm, err := Fit(bg, s, 300, ms, &Options{Warm: declared})
			if err != nil {
				t.Fatalf("trial %d member %d: %v", trial, i, err)
			}
			cold, err := Fit(bg, s, 300, ms, nil)
			if err != nil {
				t.Fatalf("trial %d member %d cold: %v", trial, i, err)
			}
			for _, got := range []float64{warm.Fit.ChiSquare, cold.Fit.ChiSquare} {
				if math.Abs(got-declared.Fit.ChiSquare) > equivTol {
					t.Errorf("trial %d member %d: χ² %.12f, declared %.12f", trial, i, got, declared.Fit.ChiSquare)
				}
			}
			if warm.Iterations > 3 {
				t.Errorf("trial %d member %d: %d iterations from the warm start", trial, i, warm.Iterations)
			}
		}
	}
	if checked < 6 {
		t.Fatalf("only %d classes with 3 or more members", checked)
	}
}
