package nearby_test

import (
	"context"
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
	"gonum.org/v1/gonum/mat"

	"github.com/pathvet/pathvet/checks/dag"
	"github.com/pathvet/pathvet/checks/linmod"
	"github.com/pathvet/pathvet/checks/nearby"
	"github.com/pathvet/pathvet/checks/sem"
)

// randomParents is a random DAG on n nodes with arrow probability density.
func randomParents(r *rand.Rand, n int, density float64) [][]int {
	perm := r.Perm(n)
	pa := make([][]int, n)
	for i := range n {
		for j := i + 1; j < n; j++ {
			if r.Float64() < density {
				pa[perm[j]] = append(pa[perm[j]], perm[i])
			}
		}
	}
	for v := range pa {
		slices.Sort(pa[v])
	}
	return pa
}

// randomCorrelation is the correlation matrix of a random linear SEM on
// its own random DAG (so the declared graph is usually wrong somewhere).
func randomCorrelation(r *rand.Rand, n int) *mat.SymDense {
	pa := randomParents(r, n, 0.5)
	b := mat.NewDense(n, n, nil) // I − B
	for v := range n {
		b.Set(v, v, 1)
		for _, u := range pa[v] {
			b.Set(v, u, -(r.Float64()*1.2 - 0.6))
		}
	}
	var inv, cov mat.Dense
	if err := inv.Inverse(b); err != nil {
		panic(err)
	}
	cov.Mul(&inv, inv.T())
	s := mat.NewSymDense(n, nil)
	for i := range n {
		for j := 0; j <= i; j++ {
			s.SetSym(i, j, cov.At(i, j)/math.Sqrt(cov.At(i, i)*cov.At(j, j)))
		}
	}
	return s
}

func wholeBIC(t *testing.T, s mat.Symmetric, n int, pa [][]int) float64 {
	t.Helper()
	f, err := sem.FitDAG(context.Background(), s, n, pa)
	if err != nil {
		t.Fatal(err)
	}
	return f.BIC
}

// oracleNeighbour is one one-edit neighbour found by brute force.
type oracleNeighbour struct {
	e     nearby.Edit
	pa    [][]int
	delta float64 // from whole-model fits by sem.FitDAG
	key   string  // CPDAG key (dag.CPDAG)
}

// oracle enumerates every pair and op, builds the graph, keeps it when
// dag.FindCycle finds no cycle and the knowledge holds, and fits the whole
// model: no code of package nearby but Apply is used.
func oracle(t *testing.T, s mat.Symmetric, n int, pa [][]int, k nearby.Knowledge) []oracleNeighbour {
	p := len(pa)
	base := wholeBIC(t, s, n, pa)
	var out []oracleNeighbour
	for u := range p {
		for v := range p {
			if u == v {
				continue
			}
			for _, op := range []nearby.Op{nearby.Add, nearby.Remove, nearby.Reverse} {
				e := nearby.Edit{Op: op, From: u, To: v}
				has := slices.Contains(pa[v], u)
				adj := has || slices.Contains(pa[u], v)
				if (op == nearby.Add && adj) || (op != nearby.Add && !has) {
					continue
				}
				npa := nearby.Apply(pa, e)
				g := toPDAG(npa)
				if dag.FindCycle(g) != nil || !respects(npa, pa, k) {
					continue
				}
				delta := wholeBIC(t, s, n, npa) - base
				out = append(out, oracleNeighbour{e: e, pa: npa, delta: delta, key: dag.CPDAG(g).Key()})
			}
		}
	}
	return out
}

func respects(npa, pa [][]int, k nearby.Knowledge) bool {
	for v, ps := range npa {
		if len(ps) > 0 && k.Exogenous != nil && k.Exogenous[v] && len(pa[v]) == 0 {
			return false
		}
	}
	for _, f := range k.Fixed {
		if !slices.Contains(npa[f[1]], f[0]) {
			return false
		}
	}
	for v, ps := range npa {
		for _, u := range ps {
			if k.Tier != nil && k.Tier[u] >= 0 && k.Tier[v] >= 0 && k.Tier[u] > k.Tier[v] {
				return false
			}
		}
	}
	return true
}

func toPDAG(pa [][]int) *dag.PDAG {
	var arcs []dag.Edge
	for v, ps := range pa {
		for _, u := range ps {
			arcs = append(arcs, dag.Edge{From: u, To: v})
		}
	}
	return dag.FromArcs(len(pa), arcs)
}

func randomKnowledge(r *rand.Rand, pa [][]int) nearby.Knowledge {
	var k nearby.Knowledge
	if r.IntN(2) == 0 {
		k.Exogenous = make([]bool, len(pa))
		for v := range pa {
			if len(pa[v]) == 0 && r.IntN(2) == 0 {
				k.Exogenous[v] = true
			}
		}
	}
	for v, ps := range pa {
		for _, u := range ps {
			if r.IntN(5) == 0 {
				k.Fixed = append(k.Fixed, [2]int{u, v})
			}
		}
	}
	if r.IntN(2) == 0 { // three tiers along a topological order, a node left out now and then
		order, _ := dag.TopoOrder(toPDAG(pa))
		k.Tier = make([]int, len(pa))
		for rank, v := range order {
			k.Tier[v] = rank * 3 / len(pa)
			if r.IntN(4) == 0 {
				k.Tier[v] = -1
			}
		}
	}
	return k
}

// The neighbourhood against the brute-force oracle on 80 random graphs of
// 3 to 7 nodes, with and without background knowledge (exogenous nodes,
// fixed arrows, tiers of a time order): the same DAGs, the
// same classes (by dag.CPDAG), and each class's ΔBIC equal to the
// difference of whole-model BICs (sem.FitDAG) to 1e-10 — the BIC
// decomposition over nodes.
func TestNeighbours_AgainstOracle(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	for trial := range 80 {
		p := 3 + trial%5
		pa := randomParents(r, p, 0.4)
		s := randomCorrelation(r, p)
		k := randomKnowledge(r, pa)
		n := 50 + r.IntN(500)
		want := oracle(t, s, n, pa, k)
		got, err := nearby.Neighbours(context.Background(), nearby.Model{S: s, N: n}, pa, k)
		if err != nil {
			t.Fatal(err)
		}
		compareOracle(t, trial, pa, want, got)
	}
}

func compareOracle(t *testing.T, trial int, pa [][]int, want []oracleNeighbour, got *nearby.Neighbourhood) {
	t.Helper()
	if got.DAGs != len(want) {
		t.Fatalf("trial %d: %d neighbours, oracle %d", trial, got.DAGs, len(want))
	}
	declared := dag.CPDAG(toPDAG(pa)).Key()
	classes := map[string][]oracleNeighbour{}
	equivalent := 0
	for _, o := range want {
		if o.key == declared {
			equivalent++
			continue
		}
		classes[o.key] = append(classes[o.key], o)
	}
	if got.Equivalent != equivalent || len(got.Classes) != len(classes) {
		t.Fatalf("trial %d: %d classes and %d equivalent, oracle %d and %d",
			trial, len(got.Classes), got.Equivalent, len(classes), equivalent)
	}
	for i, c := range got.Classes {
		if i > 0 && c.DeltaBIC < got.Classes[i-1].DeltaBIC-1e-7 {
			t.Errorf("trial %d: classes not best first", trial)
		}
		members := classes[dag.CPDAG(toPDAG(nearby.Apply(pa, c.Edits[0]))).Key()]
		if len(members) != len(c.Edits) {
			t.Fatalf("trial %d: class of %v has %d edits, oracle %d",
				trial, c.Edits[0], len(c.Edits), len(members))
		}
		for j, o := range members {
			if o.e != c.Edits[j] {
				t.Errorf("trial %d: edit %d of the class is %v, oracle %v", trial, j, c.Edits[j], o.e)
			}
			if !scalar.EqualWithinAbsOrRel(c.DeltaBIC, o.delta, 1e-10, 1e-10) {
				t.Errorf("trial %d: %v ΔBIC %.12g, whole-model difference %.12g",
					trial, o.e, c.DeltaBIC, o.delta)
			}
		}
	}
}

// The closed form for one arrow: with r the partial correlation of v and
// u given v's other parents (linmod.PartialCorrelation, Anderson §2.5),
// removing u → v multiplies v's ML residual variance by 1/(1 − r²), so T
// rises by (N − 1)·(−ln(1 − r²)) — about −N ln(1 − r²), the likelihood
// ratio statistic of the nested regressions — and BIC by that minus ln N.
func TestNeighbours_ClosedFormRemoval(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 4))
	for range 50 {
		p, n := 6, 200+r.IntN(800)
		pa := randomParents(r, p, 0.5)
		s := randomCorrelation(r, p)
		nb, err := nearby.Neighbours(context.Background(), nearby.Model{S: s, N: n}, pa, nearby.Knowledge{})
		if err != nil {
			t.Fatal(err)
		}
		for _, c := range nb.Classes {
			for _, e := range c.Edits {
				if e.Op != nearby.Remove {
					continue
				}
				isFrom := func(u int) bool { return u == e.From }
				others := slices.DeleteFunc(slices.Clone(pa[e.To]), isFrom)
				pr, err := linmod.PartialCorrelation(s, e.To, e.From, others)
				if err != nil {
					t.Fatal(err)
				}
				exact := -float64(n-1)*math.Log(1-pr*pr) - math.Log(float64(n))
				if !scalar.EqualWithinAbsOrRel(c.DeltaBIC, exact, 1e-9, 1e-9) {
					t.Errorf("remove %v: ΔBIC %g, closed form %g", e, c.DeltaBIC, exact)
				}
				approx := -float64(n)*math.Log(1-pr*pr) - math.Log(float64(n))
				if math.Abs(c.DeltaBIC-approx) > -math.Log(1-pr*pr)+1e-9 {
					t.Errorf("remove %v: ΔBIC %g, −N ln(1 − r²) − ln N = %g", e, c.DeltaBIC, approx)
				}
			}
		}
	}
}

// Raftery (1995, Table 6): 0–2 weak, 2–6 positive, 6–10 strong, > 10 very
// strong, by |ΔBIC|.
func TestEvidence_RafteryBands(t *testing.T) {
	for _, tc := range []struct {
		d    float64
		want string
	}{
		{0, "indistinguishable"}, {1.99, "indistinguishable"}, {-1.99, "indistinguishable"},
		{2, "positive"}, {-5.9, "positive"}, {6, "strong"}, {-10, "strong"},
		{10.01, "very_strong"}, {-40, "very_strong"}, {math.NaN(), ""},
	} {
		if got := nearby.Evidence(tc.d); got != tc.want {
			t.Errorf("Evidence(%g) = %q, want %q", tc.d, got, tc.want)
		}
	}
}
