package checks_test

import (
	"cmp"
	"context"
	"encoding/json"
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
	"gonum.org/v1/gonum/mat"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/dag"
	"github.com/pathvet/pathvet/checks/linmod"
	"github.com/pathvet/pathvet/checks/load"
	"github.com/pathvet/pathvet/checks/sem"
)

// oracleStudy is a random package: a DAG on p connected variables, a
// correlation matrix from another random linear SEM, a direct-effect claim
// per arrow and one total effect.
type oracleStudy struct {
	p, n   int
	arcs   []dag.Edge
	exo    int // -1: none
	s      *mat.SymDense
	claims []checks.Claim
}

func randomOracleStudy(r *rand.Rand) (*oracleStudy, bool) {
	o := &oracleStudy{p: 4 + r.IntN(2), n: 60 + r.IntN(300), exo: -1}
	perm := r.Perm(o.p)
	seen := make([]bool, o.p)
	for i := range o.p {
		for j := i + 1; j < o.p; j++ {
			if r.Float64() < 0.45 {
				o.arcs = append(o.arcs, dag.Edge{From: perm[i], To: perm[j]})
				seen[perm[i]], seen[perm[j]] = true, true
			}
		}
	}
	if slices.Contains(seen, false) || len(o.arcs) < 2 {
		return nil, false
	}
	if r.IntN(2) == 0 {
		o.exo = perm[0]
	}
	o.s = oracleCorrelation(r, o.p)
	for k, e := range o.arcs {
		o.claims = append(o.claims, checks.Claim{ID: fmt.Sprintf("D%d", k), Text: "d", Kind: checks.KindDirect,
			From: fmt.Sprint("v", e.From), To: fmt.Sprint("v", e.To)})
	}
	e := o.arcs[0]
	o.claims = append(
		o.claims,
		checks.Claim{
			ID:       "T0",
			Text:     "t",
			Kind:     checks.KindTotal,
			From:     fmt.Sprint("v", e.From),
			To:       fmt.Sprint("v", e.To),
			Headline: true,
		},
	)
	return o, true
}

func oracleCorrelation(r *rand.Rand, p int) *mat.SymDense {
	b := mat.NewDense(p, p, nil)
	for v := range p {
		b.Set(v, v, 1)
		for u := range v {
			if r.Float64() < 0.6 {
				b.Set(v, u, -(r.Float64()*0.8 - 0.4))
			}
		}
	}
	var inv, cov mat.Dense
	if err := inv.Inverse(b); err != nil {
		panic(err)
	}
	cov.Mul(&inv, inv.T())
	s := mat.NewSymDense(p, nil)
	for i := range p {
		for j := 0; j <= i; j++ {
			s.SetSym(i, j, cov.At(i, j)/math.Sqrt(cov.At(i, i)*cov.At(j, j)))
		}
	}
	return s
}

func (o *oracleStudy) document(t *testing.T) []byte {
	vars := make([]map[string]any, o.p)
	names := make([]string, o.p)
	cor := make([][]float64, o.p)
	for v := range o.p {
		names[v] = fmt.Sprint("v", v)
		vars[v] = map[string]any{"name": names[v], "scale": "continuous", "exogenous": v == o.exo}
		for u := 0; u <= v; u++ {
			cor[v] = append(cor[v], o.s.At(v, u))
		}
	}
	edges := []map[string]string{}
	for _, e := range o.arcs {
		edges = append(edges, map[string]string{"from": names[e.From], "to": names[e.To]})
	}
	doc, err := json.Marshal(map[string]any{"format_version": 1, "title": "oracle", "design": "observational",
		"variables": vars, "graph": map[string]any{"edges": edges}, "claims": o.claims,
		"data": map[string]any{"kind": "summary", "n": o.n, "variables": names, "correlations": cor}})
	if err != nil {
		t.Fatal(err)
	}
	return doc
}

// oracleClass is one class of one-edit neighbours found by brute force.
type oracleClass struct {
	key   string
	delta float64 // whole-model BIC difference, sem.FitDAG
	cpdag *dag.PDAG
}

// classes enumerates every pair and op, keeps acyclic graphs with no arrow
// into the exogenous variable, fits each whole model and groups by CPDAG.
func (o *oracleStudy) classes(t *testing.T) []oracleClass {
	base := o.bic(t, o.arcs)
	declared := dag.CPDAG(dag.FromArcs(o.p, o.arcs)).Key()
	byKey := map[string]*oracleClass{}
	for u := range o.p {
		for v := range o.p {
			for op := range 3 {
				arcs, ok := o.edit(u, v, op)
				g := dag.FromArcs(o.p, arcs)
				if !ok || dag.FindCycle(g) != nil || (o.exo >= 0 && len(g.Parents(o.exo)) > 0) {
					continue
				}
				c := dag.CPDAG(g)
				if key := c.Key(); key != declared && byKey[key] == nil {
					byKey[key] = &oracleClass{key: key, delta: o.bic(t, arcs) - base, cpdag: c}
				}
			}
		}
	}
	var out []oracleClass
	for _, c := range byKey {
		out = append(out, *c)
	}
	slices.SortFunc(out, func(a, b oracleClass) int { return cmp.Compare(a.delta, b.delta) })
	return out
}

// edit applies op 0 (add u → v), 1 (remove u → v) or 2 (reverse u → v).
func (o *oracleStudy) edit(u, v, op int) ([]dag.Edge, bool) {
	if u == v {
		return nil, false
	}
	i := slices.Index(o.arcs, dag.Edge{From: u, To: v})
	j := slices.Index(o.arcs, dag.Edge{From: v, To: u})
	out := slices.Clone(o.arcs)
	switch {
	case op == 0 && i < 0 && j < 0:
		return append(out, dag.Edge{From: u, To: v}), true
	case op == 1 && i >= 0:
		return slices.Delete(out, i, i+1), true
	case op == 2 && i >= 0:
		out[i] = dag.Edge{From: v, To: u}
		return out, true
	}
	return nil, false
}

func (o *oracleStudy) bic(t *testing.T, arcs []dag.Edge) float64 {
	pa := make([][]int, o.p)
	for _, e := range arcs {
		pa[e.To] = append(pa[e.To], e.From)
	}
	f, err := sem.FitDAG(context.Background(), o.s, o.n, pa)
	if err != nil {
		t.Fatal(err)
	}
	return f.BIC
}

// members lists by brute force every orientation of the class's skeleton
// with its CPDAG and no arrow into the exogenous variable.
func (o *oracleStudy) members(c *dag.PDAG) []*dag.PDAG {
	var pairs [][2]int
	for u := range o.p {
		for v := u + 1; v < o.p; v++ {
			if c.Adjacent(u, v) {
				pairs = append(pairs, [2]int{u, v})
			}
		}
	}
	var out []*dag.PDAG
	for mask := range 1 << len(pairs) {
		var arcs []dag.Edge
		for k, pr := range pairs {
			if mask&(1<<k) != 0 {
				pr[0], pr[1] = pr[1], pr[0]
			}
			arcs = append(arcs, dag.Edge{From: pr[0], To: pr[1]})
		}
		g := dag.FromArcs(o.p, arcs)
		if dag.FindCycle(g) == nil && dag.CPDAG(g).Key() == c.Key() && (o.exo < 0 || len(g.Parents(o.exo)) == 0) {
			out = append(out, g)
		}
	}
	return out
}

// estimate is claim c in graph g: the coefficient of from regressing to
// on pa(to) (direct) or on from and pa(from) (total), zero by the graph
// where the arrow or path cannot be.
func (o *oracleStudy) estimate(t *testing.T, c checks.Claim, g *dag.PDAG) (float64, float64) {
	var from, to int
	fmt.Sscanf(c.From, "v%d", &from)
	fmt.Sscanf(c.To, "v%d", &to)
	x := []int{from}
	switch c.Kind {
	case checks.KindDirect:
		if !slices.Contains(g.Parents(to), from) {
			return 0, 1
		}
		x = append(x, slices.DeleteFunc(g.Parents(to), func(v int) bool { return v == from })...)
	default:
		if slices.Contains(g.Parents(from), to) {
			return 0, 1
		}
		x = append(x, g.Parents(from)...)
	}
	f, err := linmod.FromMoments(o.s, nil, o.n, to, x, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	return f.Coefs[0].Estimate, f.Coefs[0].P
}

// The nearby-graphs report against the brute-force oracle on 40 random
// packages: the classes listed and their ΔBIC (whole-model fits), and, for
// those within 2, each causal claim's min, max and share significant with
// the declared sign over the class's plausible members, listed by brute
// force and estimated by plain regressions.
func TestNearbyGraphs_AgainstOracle(t *testing.T) {
	r := rand.New(rand.NewPCG(11, 12))
	compared := 0
	for trial := 0; trial < 40; {
		o, ok := randomOracleStudy(r)
		if !ok {
			continue
		}
		trial++
		s, err := load.Load(o.document(t), load.Options{})
		if err != nil {
			t.Fatal(err)
		}
		rep := mustRun(t, s)
		want := o.classes(t)
		listed := expectedListing(want)
		if len(rep.Graph.NearbyGraphs) != len(listed) {
			t.Fatalf("trial %d: %d classes listed, oracle %d", trial, len(rep.Graph.NearbyGraphs), len(listed))
		}
		for i, ng := range rep.Graph.NearbyGraphs {
			oc := o.classOf(t, ng, want)
			if !scalar.EqualWithinAbsOrRel(*ng.DeltaBIC, oc.delta, 1e-8, 1e-8) ||
				!scalar.EqualWithinAbsOrRel(*ng.DeltaBIC, listed[i].delta, 1e-8, 1e-8) {
				t.Fatalf(
					"trial %d: class %d ΔBIC %g, oracle %g (%d-th listed %g)",
					trial,
					i,
					*ng.DeltaBIC,
					oc.delta,
					i,
					listed[i].delta,
				)
			}
			if math.Abs(oc.delta) < 2 {
				compared += o.compareClaims(t, trial, rep, ng, oc)
			}
		}
	}
	if compared < 20 {
		t.Errorf("only %d claim ranges compared", compared)
	}
}

// expectedListing is README's rule: the classes within ΔBIC 2 (at most
// 20), the 5 best that fit better by 2 or more, and at least 3 in all,
// best first.
func expectedListing(sorted []oracleClass) []oracleClass {
	var out []oracleClass
	near, better := 0, 0
	for _, c := range sorted {
		switch {
		case math.Abs(c.delta) < 2:
			if near++; near <= 20 {
				out = append(out, c)
			}
		case c.delta <= -2:
			if better++; better <= 5 {
				out = append(out, c)
			}
		case len(out) < 3:
			out = append(out, c)
		}
	}
	return out
}

// classOf finds the oracle's class of a listed class by its edit.
func (o *oracleStudy) classOf(t *testing.T, ng checks.NearbyGraph, want []oracleClass) oracleClass {
	t.Helper()
	var u, v int
	fmt.Sscanf(ng.Edits[0].From, "v%d", &u)
	fmt.Sscanf(ng.Edits[0].To, "v%d", &v)
	arcs, ok := o.edit(u, v, map[string]int{"add": 0, "remove": 1, "reverse": 2}[ng.Edits[0].Op])
	if !ok {
		t.Fatalf("listed edit %+v is not an edit of the declared graph", ng.Edits[0])
	}
	key := dag.CPDAG(dag.FromArcs(o.p, arcs)).Key()
	for _, c := range want {
		if c.key == key {
			return c
		}
	}
	t.Fatalf("listed class %+v is not among the oracle's", ng.Edits)
	return oracleClass{}
}

func (o *oracleStudy) compareClaims(
	t *testing.T,
	trial int,
	rep *checks.Report,
	ng checks.NearbyGraph,
	oc oracleClass,
) int {
	t.Helper()
	ms := o.members(oc.cpdag)
	for i, c := range o.claims {
		got, ok := ng.Claims[c.ID]
		if !ok || got.Graphs != len(ms) {
			t.Fatalf("trial %d: %s over %d graphs (present %v), oracle %d", trial, c.ID, got.Graphs, ok, len(ms))
		}
		sign := math.Copysign(1, *rep.Claims[i].Declared.Estimate)
		lo, hi, same := math.Inf(1), math.Inf(-1), 0
		for _, m := range ms {
			v, p := o.estimate(t, c, m)
			lo, hi = math.Min(lo, v), math.Max(hi, v)
			if p < 0.05 && v*sign > 0 {
				same++
			}
		}
		share := float64(same) / float64(len(ms))
		if !scalar.EqualWithinAbsOrRel(*got.Min, lo, 1e-8, 1e-8) ||
			!scalar.EqualWithinAbsOrRel(*got.Max, hi, 1e-8, 1e-8) ||
			!scalar.EqualWithinAbsOrRel(*got.ShareSignificantSameSign, share, 1e-9, 1e-9) {
			t.Errorf(
				"trial %d: %s min %g max %g share %g, oracle %g %g %g",
				trial,
				c.ID,
				*got.Min,
				*got.Max,
				*got.ShareSignificantSameSign,
				lo,
				hi,
				share,
			)
		}
	}
	return len(o.claims)
}
