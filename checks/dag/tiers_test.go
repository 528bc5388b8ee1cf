package dag

import (
	"errors"
	"fmt"
	"math/big"
	"math/rand/v2"
	"slices"
	"sort"
	"testing"
)

// randomTiered is a random DAG on n nodes with a time order it respects:
// each node is in one of up to three tiers or (one time in five) in none,
// and the arcs follow an order of the nodes that puts every tier before
// the next.
func randomTiered(r *rand.Rand, n int) (*PDAG, Tiers) {
	k := 1 + r.IntN(3)
	tier, key := make([]int, n), make([]float64, n)
	for v := range n {
		tier[v], key[v] = r.IntN(k), float64(k)*r.Float64()
		if r.IntN(5) == 0 {
			tier[v] = NoTier
		} else {
			key[v] = float64(tier[v]) + r.Float64()
		}
	}
	order := r.Perm(n)
	sort.Slice(order, func(i, j int) bool { return key[order[i]] < key[order[j]] })
	density := 0.2 + 0.7*r.Float64()
	var arcs []Edge
	for i := range n {
		for j := i + 1; j < n; j++ {
			if r.Float64() < density {
				arcs = append(arcs, Edge{order[i], order[j]})
			}
		}
	}
	var t Tiers
	for s := range k {
		var members []int
		for v := range n {
			if tier[v] == s {
				members = append(members, v)
			}
		}
		if members != nil {
			t = append(t, members)
		}
	}
	return FromArcs(n, arcs), t
}

// respectsTiers is the oracle's own reading of a time order: no arc from a
// node of a later tier to one of an earlier tier.
func respectsTiers(g *PDAG, t Tiers) bool {
	of := map[int]int{}
	for k, tier := range t {
		for _, v := range tier {
			of[v] = k
		}
	}
	for _, e := range g.Arcs() {
		a, okA := of[e.From]
		b, okB := of[e.To]
		if okA && okB && a > b {
			return false
		}
	}
	return true
}

// The tiers as background knowledge against brute force, on 1,500 random
// tiered DAGs with 2 to 8 nodes, half of them with further knowledge
// (an exogenous node, a fixed arrow kept or reversed): the members of the
// class that respect the tiers and the knowledge, enumerated without
// Meek's rules or the counter (bruteMembers), against the count, the
// listing, the maximally oriented graph, the lines it leaves open and the
// parent sets of every node.
func TestTiers_RandomAgainstBruteForce(t *testing.T) {
	r := rand.New(rand.NewPCG(18, 1))
	for i := range 1500 {
		g, tiers := randomTiered(r, 2+r.IntN(7))
		c := CPDAG(g)
		req, err := TierArcs(c, tiers)
		if err != nil {
			t.Fatal(err)
		}
		if r.IntN(2) == 0 {
			req = append(req, randomBackground(r, g)...)
		}
		plausible := map[string]*PDAG{}
		for k, m := range bruteMembers(c, nil) {
			if respectsTiers(m, tiers) && hasAll(m, req) {
				plausible[k] = m
			}
		}
		name := fmt.Sprintf("graph %d (%s, tiers %v, required %v)", i, g.Key(), tiers, req)
		checkCount(t, name, c, req, plausible)
		checkOrientation(t, name, c, req, tiers, plausible)
		checkParentSets(t, name, c, req, plausible)
	}
}

func checkCount(t *testing.T, name string, c *PDAG, req []Edge, plausible map[string]*PDAG) {
	t.Helper()
	n, err := PlausibleSize(c, req)
	if err != nil || n.Int64() != int64(len(plausible)) {
		t.Fatalf("%s: counted %v (%v), brute force %d", name, n, err, len(plausible))
	}
	listed, truncated, err := Members(c, req, len(plausible)+1)
	if err != nil || truncated || len(listed) != len(plausible) {
		t.Fatalf("%s: listed %d (truncated %v, %v), want %d", name, len(listed), truncated, err, len(plausible))
	}
	for _, m := range listed {
		if plausible[m.Key()] == nil {
			t.Fatalf("%s: listed %s, not a plausible member", name, m.Key())
		}
	}
}

func checkOrientation(t *testing.T, name string, c *PDAG, req []Edge, tiers Tiers, plausible map[string]*PDAG) {
	t.Helper()
	m, ok, err := MaximallyOriented(c, req)
	if err != nil || ok != (len(plausible) > 0) {
		t.Fatalf("%s: consistent %v (%v), brute force has %d members", name, ok, err, len(plausible))
	}
	if !ok {
		return
	}
	open, err := OpenLines(m, tiers)
	if err != nil {
		t.Fatalf("%s: %v", name, err)
	}
	var wantOpen [][2]int
	for u := range c.N() {
		for _, v := range c.neighbours(u) {
			forward, backward := false, false
			for _, p := range plausible {
				forward, backward = forward || p.HasArc(u, v), backward || p.HasArc(v, u)
			}
			if forward && !backward && !m.HasArc(u, v) || forward && backward && !m.HasLine(u, v) {
				t.Fatalf("%s: edge %d→%d: in some member %v, reversed in some %v; closure %s",
					name, u, v, forward, backward, m.Key())
			}
			if forward && backward && u < v {
				wantOpen = append(wantOpen, [2]int{u, v})
			}
		}
	}
	var gotOpen [][2]int
	for _, l := range open {
		gotOpen = append(gotOpen, [2]int{l.U, l.V})
	}
	if !slices.Equal(gotOpen, wantOpen) {
		t.Fatalf("%s: open lines %v, brute force %v", name, open, wantOpen)
	}
}

func checkParentSets(t *testing.T, name string, c *PDAG, req []Edge, plausible map[string]*PDAG) {
	t.Helper()
	for x := range c.N() {
		want := map[string]bool{}
		for _, p := range plausible {
			want[fmt.Sprint(p.Parents(x))] = true
		}
		sets, err := PlausibleParentSets(c, req, x)
		if err != nil || len(sets) != len(want) {
			t.Fatalf("%s: node %d: parent sets %v (%v), brute force %v", name, x, sets, err, want)
		}
		for _, s := range sets {
			if !want[fmt.Sprint(s)] {
				t.Fatalf("%s: node %d: parent set %v in no plausible member", name, x, s)
			}
		}
	}
}

// A complete graph on p nodes has every order of its nodes as a member;
// tiers of sizes s_1..s_k over T of them keep those orders in which the
// tiered nodes come tier by tier: p!/T! · Π s_i! (the tiered nodes' T!
// relative orders, of which Π s_i! respect the tiers). Checked by brute
// force for p ≤ 7, and for p = 30, past the 2^20 states that counting
// thirty distinct constrained nodes would take.
func TestPlausibleSize_TieredCompleteGraph(t *testing.T) {
	cases := []struct {
		p     int
		sizes []int
	}{{4, []int{1, 2}}, {5, []int{2, 2}}, {6, []int{1, 1, 1}}, {7, []int{3, 2, 1}}, {7, []int{7}},
		{30, []int{10, 10, 10}}, {30, []int{8, 8, 8}}, {24, []int{6, 6, 6, 6}}}
	for _, tc := range cases {
		var tiers Tiers
		v, total := 0, 0
		want := new(big.Int).MulRange(1, int64(tc.p))
		for _, s := range tc.sizes {
			tiers = append(tiers, []int{})
			for range s {
				tiers[len(tiers)-1] = append(tiers[len(tiers)-1], v)
				v++
			}
			want.Mul(want, new(big.Int).MulRange(1, int64(s)))
			total += s
		}
		want.Div(want, new(big.Int).MulRange(1, int64(total)))
		c := complete(tc.p)
		req, err := TierArcs(c, tiers)
		if err != nil {
			t.Fatal(err)
		}
		got, err := PlausibleSize(c, req)
		if err != nil || got.Cmp(want) != 0 {
			t.Errorf("K%d tiers %v: %v (%v), want %v", tc.p, tc.sizes, got, err, want)
		}
		if tc.p <= 7 {
			bf := 0
			for _, m := range bruteMembers(c, nil) {
				if respectsTiers(m, tiers) {
					bf++
				}
			}
			if int64(bf) != want.Int64() {
				t.Errorf("K%d tiers %v: brute force %d, want %v", tc.p, tc.sizes, bf, want)
			}
		}
	}
}

// An arc from a later tier to an earlier one is named with both tiers;
// tiers that are not a partition are refused with the entry at fault.
func TestTierViolations(t *testing.T) {
	// 0 → 1 → 2, 3 → 1; tiers {0, 3} {1} {2} are respected.
	g := FromArcs(4, []Edge{{0, 1}, {1, 2}, {3, 1}})
	if v, err := TierViolations(g, Tiers{{0, 3}, {1}, {2}}); err != nil || v != nil {
		t.Fatalf("respected: %v, %v", v, err)
	}
	v, err := TierViolations(g, Tiers{{2}, {1, 3}, {0}})
	want := []TierViolation{{Edge{0, 1}, 2, 1}, {Edge{1, 2}, 1, 0}}
	if err != nil || !slices.Equal(v, want) {
		t.Fatalf("got %v, %v; want %v", v, err, want)
	}
	for _, bad := range []struct {
		tiers     Tiers
		tier, pos int
	}{{Tiers{{0}, {}}, 1, -1}, {Tiers{{0, 1}, {2, 1}}, 1, 1}, {Tiers{{4}}, 0, 0}, {Tiers{{-1}}, 0, 0}} {
		_, err := TierViolations(g, bad.tiers)
		var te *TierError
		if !errors.As(err, &te) || te.Tier != bad.tier || te.Pos != bad.pos {
			t.Errorf("tiers %v: %v, want tier %d entry %d", bad.tiers, err, bad.tier, bad.pos)
		}
	}
}

// A two-wave cross-lagged panel: x1 − y1 at wave 1, x2 − y2 at wave 2,
// and x1, y1 each pointing to x2 and y2. The skeleton is complete, so
// without the tiers every edge is undirected (4! = 24 members); with them
// the four edges between waves point forward and the two within-wave
// edges stay open, 2!·2! = 4 members (worked by hand).
func TestTierArcs_Waves(t *testing.T) {
	// x1=0 y1=1 x2=2 y2=3
	g := FromArcs(4, []Edge{{0, 1}, {0, 2}, {0, 3}, {1, 2}, {1, 3}, {2, 3}})
	c := CPDAG(g)
	tiers := Tiers{{0, 1}, {2, 3}}
	req, err := TierArcs(c, tiers)
	if err != nil || !slices.Equal(req, []Edge{{0, 2}, {0, 3}, {1, 2}, {1, 3}}) {
		t.Fatalf("tier arcs %v, %v", req, err)
	}
	m, ok, err := MaximallyOriented(c, req)
	if err != nil || !ok {
		t.Fatalf("%v %v", ok, err)
	}
	open, err := OpenLines(m, tiers)
	if err != nil || !slices.Equal(open, []OpenLine{{0, 1, 0}, {2, 3, 1}}) {
		t.Fatalf("open %v, %v (%s)", open, err, m.Key())
	}
	if n, _ := PlausibleSize(c, req); n.Int64() != 4 {
		t.Fatalf("plausible %v, want 4", n)
	}
	if n := ClassSize(c); n.Int64() != 24 {
		t.Fatalf("class %v, want 24", n)
	}
}
