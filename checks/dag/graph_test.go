package dag

import (
	"fmt"
	"math/rand/v2"
	"slices"
	"testing"
)

// meekCPDAG builds the CPDAG the other way (Meek 1995, theorem 2): the
// skeleton with the v-structures oriented, closed under R1–R3.
func meekCPDAG(g *PDAG) *PDAG {
	c := Skeleton(g)
	for _, v := range VStructures(g) {
		if c.HasLine(v.A, v.C) {
			c.Orient(v.A, v.C)
		}
		if c.HasLine(v.B, v.C) {
			c.Orient(v.B, v.C)
		}
	}
	c.closeUnderMeek(c.Lines(), false)
	return c
}

// Chickering's edge labelling (CPDAG) and Meek's rules give the same CPDAG
// on random DAGs from sparse to complete, up to 40 nodes, and on the dense
// components where the rules revisit lines most.
func TestCPDAG_ChickeringAgreesWithMeek(t *testing.T) {
	r := rand.New(rand.NewPCG(9, 2))
	for trial := range 400 {
		n := 2 + r.IntN(39)
		g := randomDAG(r, n, r.Float64())
		if trial%50 == 0 {
			g = chordalDAG(n, uint64(trial))
		}
		if got, want := CPDAG(g).Key(), meekCPDAG(g).Key(); got != want {
			t.Fatalf("trial %d, %s:\nChickering %s\nMeek       %s", trial, g.Key(), got, want)
		}
	}
}

// Markov equivalence by its definition: two DAGs share a CPDAG exactly when
// they imply the same d-separations (Verma & Pearl 1990).
func TestCPDAG_MarkovEquivalence(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 4))
	same, differ := 0, 0
	for range 400 {
		n := 2 + r.IntN(5)
		g := randomDAG(r, n, 0.3+0.5*r.Float64())
		var h *PDAG
		if r.IntN(2) == 0 { // a member of the same class, or a DAG on the same skeleton
			members := bruteMembers(CPDAG(g), nil)
			keys := make([]string, 0, len(members))
			for k := range members {
				keys = append(keys, k)
			}
			slices.Sort(keys)
			h = members[keys[r.IntN(len(keys))]]
		} else {
			h = randomDAG(r, n, 0.3+0.5*r.Float64())
		}
		eqCPDAG := CPDAG(g).Key() == CPDAG(h).Key()
		eqDsep := dsepStatements(g) == dsepStatements(h)
		if eqCPDAG != eqDsep {
			t.Fatalf("%s vs %s: same CPDAG %v, same d-separations %v", g.Key(), h.Key(), eqCPDAG, eqDsep)
		}
		if eqCPDAG {
			same++
		} else {
			differ++
		}
	}
	if same < 100 || differ < 100 {
		t.Fatalf("too few cases of one kind: %d equivalent, %d not", same, differ)
	}
}

func TestDSeparated(t *testing.T) {
	// a → b → c, a → d ← c: collider at d.
	g := FromArcs(4, []Edge{{0, 1}, {1, 2}, {0, 3}, {2, 3}})
	cases := []struct {
		x, y int
		z    []int
		want bool
	}{
		{0, 2, nil, false},
		{0, 2, []int{1}, true},     // the chain is blocked at b; the collider d is closed
		{0, 2, []int{1, 3}, false}, // conditioning on the collider d opens a → d ← c
		{1, 3, []int{0, 2}, true},
	}
	for _, tc := range cases {
		if got := DSeparated(g, tc.x, tc.y, tc.z); got != tc.want {
			t.Errorf("%d ⊥ %d | %v: got %v", tc.x, tc.y, tc.z, got)
		}
	}
}

func TestFindCycle(t *testing.T) {
	g := FromArcs(5, []Edge{{0, 1}, {1, 2}, {2, 3}, {3, 1}, {3, 4}})
	if got := FindCycle(g); !slices.Equal(got, []int{1, 2, 3}) {
		t.Fatalf("cycle %v, want [1 2 3]", got)
	}
	if got := FindCycle(FromArcs(3, []Edge{{0, 1}, {1, 2}})); got != nil {
		t.Fatalf("acyclic graph gave cycle %v", got)
	}
	order, ok := TopoOrder(FromArcs(4, []Edge{{3, 0}, {2, 1}}))
	if !ok || !slices.Equal(order, []int{2, 1, 3, 0}) {
		t.Fatalf("order %v", order)
	}
}

// Local IDA parent sets, worked by hand from the definition (Maathuis,
// Kalisch & Bühlmann 2009: a parent set is locally valid when orienting it
// into X creates no new v-structure): the chain Z − X − Y gives {∅, {Z}, {Y}} (not both: Z and Y are
// non-adjacent); the triangle X − A − Y − X gives all four subsets.
func TestLocalParentSets(t *testing.T) {
	chain := undirected(3, [][2]int{{0, 1}, {1, 2}}) // Z=0, X=1, Y=2
	got, _ := LocalParentSets(chain, 1)
	if fmt.Sprint(got) != "[[] [0] [2]]" {
		t.Errorf("chain: %v", got)
	}
	tri := complete(3)
	got, _ = LocalParentSets(tri, 0)
	if len(got) != 4 {
		t.Errorf("triangle: %v", got)
	}
	// With an arc into x: p → x − s with p, s adjacent keeps p everywhere.
	g := New(3, []Edge{{0, 1}}, [][2]int{{1, 2}, {0, 2}})
	got, _ = LocalParentSets(g, 1)
	if fmt.Sprint(got) != "[[0] [0 2]]" {
		t.Errorf("with parent: %v", got)
	}
}

func TestBasisSet(t *testing.T) {
	// X → M → Y: the one implication X ⊥ Y | M.
	g := FromArcs(3, []Edge{{0, 1}, {1, 2}})
	got := BasisSet(g, nil)
	if len(got) != 1 || got[0].X != 0 || got[0].Y != 2 || !slices.Equal(got[0].Given, []int{1}) {
		t.Fatalf("basis set %+v", got)
	}
}

// Parent sets grow with the cliques among the neighbours, not with
// 2^(neighbours): a star of 30 lines has 31 (the empty set and each
// neighbour alone); a complete neighbourhood of 13 has 2^13 > the cap.
func TestLocalParentSets_Size(t *testing.T) {
	var lines [][2]int
	for v := 1; v <= 30; v++ {
		lines = append(lines, [2]int{0, v})
	}
	sets, err := LocalParentSets(undirected(31, lines), 0)
	if err != nil || len(sets) != 31 {
		t.Fatalf("star: %d sets, %v", len(sets), err)
	}
	if _, err := LocalParentSets(complete(14), 0); err != ErrTooManyParentSets {
		t.Fatalf("K14: %v", err)
	}
	// The cocktail-party graph on 24 neighbours (all adjacent but the pairs
	// 2i+1, 2i+2): its largest clique has 12, so 2^12 subsets settle
	// nothing, but it has 3^12 = 531,441 cliques (each pair gives none,
	// one or the other), past the cap.
	var party [][2]int
	for u := 1; u <= 24; u++ {
		party = append(party, [2]int{0, u})
		for v := u + 1; v <= 24; v++ {
			if !(u%2 == 1 && v == u+1) {
				party = append(party, [2]int{u, v})
			}
		}
	}
	if _, err := LocalParentSets(undirected(25, party), 0); err != ErrTooManyParentSets {
		t.Fatalf("cocktail party: %v", err)
	}
	// At the cap: 12 neighbours, all adjacent, give 2^12 = 4,096 sets, listed.
	if sets, err := LocalParentSets(complete(13), 0); err != nil || len(sets) != MaxParentSets {
		t.Fatalf("K13: %d sets, %v", len(sets), err)
	}
	// Against the definition on K5 minus an edge: every subset of the
	// other four nodes that is a clique.
	g := complete(5, [2]int{1, 2})
	sets, _ = LocalParentSets(g, 0)
	want := 0
	for mask := range 1 << 4 {
		if mask&0b11 != 0b11 { // nodes 1 and 2 (bits 0 and 1) are not adjacent
			want++
		}
	}
	if len(sets) != want {
		t.Fatalf("K5 − e: %d sets, want %d", len(sets), want)
	}
}

// Meek's R4 (reference-values.md): a − b, a adjacent to c and d, d → c →
// b, b and d non-adjacent ⇒ a → b.
func TestCloseUnderMeek_R4(t *testing.T) {
	// a=0 b=1 c=2 d=3.
	g := New(4, []Edge{{3, 2}, {2, 1}}, [][2]int{{0, 1}, {0, 2}, {0, 3}})
	g.CloseUnderMeek()
	if !g.HasArc(0, 1) {
		t.Fatalf("R4 did not orient a → b: %s", g.Key())
	}
}

// With background knowledge, closing the CPDAG under R1–R4 orients exactly
// the edges that every plausible member orients alike (Meek 1995,
// theorem 4): checked against brute force on random DAGs whose own arcs
// supply the knowledge.
func TestCloseUnderMeek_BackgroundKnowledge(t *testing.T) {
	r := rand.New(rand.NewPCG(21, 22))
	for i := range 400 {
		n := 3 + r.IntN(5)
		g := randomDAG(r, n, 0.3+0.5*r.Float64())
		arcs := g.Arcs()
		if len(arcs) == 0 {
			continue
		}
		c := CPDAG(g)
		req := []Edge{arcs[r.IntN(len(arcs))]}
		m := c.Clone()
		for _, e := range req {
			if m.HasLine(e.From, e.To) {
				m.Orient(e.From, e.To)
			}
		}
		m.CloseUnderMeek()
		plausible := bruteMembers(c, req)
		for u := range n {
			for _, v := range c.neighbours(u) {
				always := true
				for _, p := range plausible {
					if !p.HasArc(u, v) {
						always = false
					}
				}
				if always != m.HasArc(u, v) {
					const format = "graph %d (%s) with %v: edge %d→%d is in every plausible " +
						"member %v, closure says %v (%s)"
					t.Fatalf(format, i, g.Key(), req, u, v, always, m.HasArc(u, v), m.Key())
				}
			}
		}
	}
}
