package dag

import (
	"fmt"
	"slices"
)

// Tiers is a time order over some of the nodes: an ordered partition of
// them, earliest first (waves of a panel, or before, during and after an
// exposure). Nodes in no tier are not ordered by it. Tiers are background
// knowledge: nothing measured later causes anything measured earlier, so
// every edge between two tiers points from the earlier to the later one,
// and edges within a tier are left to the data.
type Tiers [][]int

// NoTier is the tier of a node that is in none.
const NoTier = -1

// TierError reports tiers that are not an ordered partition of nodes of
// the graph: a node out of range, a node in two tiers, or an empty tier.
type TierError struct {
	Tier, Pos int // the offending entry: tier Tier, position Pos (Pos −1 for an empty tier)
	Reason    string
}

func (e *TierError) Error() string {
	if e.Pos < 0 {
		return fmt.Sprintf("dag: tier %d: %s", e.Tier, e.Reason)
	}
	return fmt.Sprintf("dag: tier %d, entry %d: %s", e.Tier, e.Pos, e.Reason)
}

// Index returns the tier of each of n nodes, NoTier for a node in none.
func (t Tiers) Index(n int) ([]int, error) {
	of := make([]int, n)
	for i := range of {
		of[i] = NoTier
	}
	for k, tier := range t {
		if len(tier) == 0 {
			return nil, &TierError{Tier: k, Pos: -1, Reason: "empty"}
		}
		for p, v := range tier {
			switch {
			case v < 0 || v >= n:
				return nil, &TierError{Tier: k, Pos: p, Reason: fmt.Sprintf("node %d out of range 0..%d", v, n-1)}
			case of[v] != NoTier:
				return nil, &TierError{Tier: k, Pos: p, Reason: fmt.Sprintf("node %d is also in tier %d", v, of[v])}
			}
			of[v] = k
		}
	}
	return of, nil
}

// TierViolation is an arc from a later tier to an earlier one.
type TierViolation struct {
	Arc              Edge
	FromTier, ToTier int // the tiers of Arc.From and Arc.To; FromTier > ToTier
}

// TierViolations returns every arc of g that points from a later tier to
// an earlier one, in the order of g.Arcs (sorted by From, To); none when g
// respects the tiers. The error reports tiers that are not a partition.
func TierViolations(g *PDAG, t Tiers) ([]TierViolation, error) {
	of, err := t.Index(g.N())
	if err != nil {
		return nil, err
	}
	var out []TierViolation
	for _, e := range g.Arcs() {
		if a, b := of[e.From], of[e.To]; a != NoTier && b != NoTier && a > b {
			out = append(out, TierViolation{Arc: e, FromTier: a, ToTier: b})
		}
	}
	return out, nil
}

// TierArcs returns the orientations the tiers require of the graph c (a
// CPDAG, or any PDAG with the skeleton of the class): every adjacent pair
// whose ends lie in different tiers, oriented from the earlier tier to the
// later one, sorted by (From, To). They are required arcs like those of
// ExogenousArcs and fixed edges, and combine with them by concatenation:
// PlausibleSize, Members, PlausibleParentSets and MaximallyOriented then
// count, list and orient only the members that respect all of them.
func TierArcs(c *PDAG, t Tiers) ([]Edge, error) {
	of, err := t.Index(c.N())
	if err != nil {
		return nil, err
	}
	var out []Edge
	for u := range c.N() {
		for _, v := range c.adj[u] {
			if of[u] != NoTier && of[v] != NoTier && of[u] < of[v] {
				out = append(out, Edge{u, v})
			}
		}
	}
	slices.SortFunc(out, func(a, b Edge) int {
		if a.From != b.From {
			return a.From - b.From
		}
		return a.To - b.To
	})
	return out, nil
}

// MaximallyOriented returns the CPDAG c with every required arc oriented
// and the result closed under Meek's (1995) rules R1–R4: the maximally
// oriented graph, whose arcs are exactly those that every member of the
// class containing the required arcs shares and whose lines are oriented
// both ways among those members (Meek 1995, theorem 4; checked against
// brute force in tiers_test.go). ok is false when the knowledge
// contradicts the class: a required arc that c, or an arc the rules force
// from the others, orients the other way. A required arc must join
// adjacent nodes of c.
func MaximallyOriented(c *PDAG, required []Edge) (m *PDAG, ok bool, err error) {
	m = c.Clone()
	for _, e := range required {
		switch m.state(e.From, e.To) {
		case absent:
			return nil, false, fmt.Errorf("dag: required arc %d→%d joins non-adjacent nodes", e.From, e.To)
		case arcIn:
			return nil, false, nil
		case line:
			m.Orient(e.From, e.To)
			m.CloseUnderMeek()
		}
	}
	return m, true, nil
}

// OpenLine is an edge that the data and the background knowledge leave
// undirected, with where it lies: within tier Tier, or touching a node in
// no tier (Tier is then NoTier).
type OpenLine struct {
	U, V int // U < V
	Tier int
}

// OpenLines returns the lines of m, the maximally oriented graph of a
// class under tiered background knowledge (MaximallyOriented with TierArcs
// among the required arcs), each with its tier. Every line lies within a
// tier or touches an untiered node, since the tiers orient every edge
// between tiers; a line between two tiers means m was not oriented by t
// and is an error.
func OpenLines(m *PDAG, t Tiers) ([]OpenLine, error) {
	of, err := t.Index(m.N())
	if err != nil {
		return nil, err
	}
	var out []OpenLine
	for _, l := range m.Lines() {
		a, b := of[l[0]], of[l[1]]
		switch {
		case a == NoTier || b == NoTier:
			out = append(out, OpenLine{U: l[0], V: l[1], Tier: NoTier})
		case a == b:
			out = append(out, OpenLine{U: l[0], V: l[1], Tier: a})
		default:
			return nil, fmt.Errorf("dag: line %d−%d joins tiers %d and %d: the graph was not oriented by the tiers",
				l[0], l[1], a, b)
		}
	}
	return out, nil
}
