package nearby

import (
	"fmt"
	"slices"
)

// Op is the kind of an edit.
type Op string

// The three edits of a DAG.
const (
	Add     Op = "add"     // put the arrow From → To in
	Remove  Op = "remove"  // take the arrow From → To out
	Reverse Op = "reverse" // turn the arrow From → To into To → From
)

// Edit is one change of a DAG; From → To is the arrow added, removed or
// reversed (for a reversal, its direction before the edit).
type Edit struct {
	Op       Op
	From, To int
}

// Knowledge is the background knowledge every graph must respect.
type Knowledge struct {
	// Exogenous marks nodes no arrow may point into (nil: none).
	Exogenous []bool
	// Fixed are arrows that may be neither removed nor reversed.
	Fixed [][2]int
	// Tier is each node's tier in a time order, earliest first (nil, or a
	// negative entry: not in one): no arrow may point from a later tier to
	// an earlier one.
	Tier []int
}

// graph is a DAG held for quick edits: sorted parent and child lists, the
// parents as bit sets, and which nodes each node reaches.
type graph struct {
	n      int
	pa, ch [][]int
	isPa   []bitset // isPa[v].has(u): u → v
	reach  []bitset // reach[u].has(v): a directed path u ⇝ v of length ≥ 1
}

// newGraph copies parents into a graph; it fails on an index out of
// range, a self-loop, a repeated parent or a cycle.
func newGraph(parents [][]int) (*graph, error) {
	n := len(parents)
	g := &graph{n: n, pa: make([][]int, n), ch: make([][]int, n), isPa: make([]bitset, n), reach: make([]bitset, n)}
	for v := range n {
		g.isPa[v], g.reach[v] = newBitset(n), newBitset(n)
	}
	for v, ps := range parents {
		for _, u := range ps {
			if u < 0 || u >= n || u == v || g.isPa[v].has(u) {
				return nil, fmt.Errorf("nearby: bad parent %d of node %d", u, v)
			}
			g.link(u, v)
		}
	}
	if !g.updateReach() {
		return nil, fmt.Errorf("nearby: the graph has a cycle")
	}
	return g, nil
}

func (g *graph) adjacent(u, v int) bool { return g.isPa[v].has(u) || g.isPa[u].has(v) }

func (g *graph) link(u, v int) {
	g.isPa[v].set(u)
	g.pa[v] = insertSorted(g.pa[v], u)
	g.ch[u] = insertSorted(g.ch[u], v)
}

func (g *graph) unlink(u, v int) {
	g.isPa[v].clear(u)
	g.pa[v] = deleteSorted(g.pa[v], u)
	g.ch[u] = deleteSorted(g.ch[u], v)
}

func insertSorted(s []int, x int) []int {
	i, _ := slices.BinarySearch(s, x)
	return slices.Insert(s, i, x)
}

func deleteSorted(s []int, x int) []int {
	i, ok := slices.BinarySearch(s, x)
	if !ok {
		return s
	}
	return slices.Delete(s, i, i+1)
}

// apply makes the edit; undo(e) reverts it. Neither updates reach.
func (g *graph) apply(e Edit) {
	switch e.Op {
	case Add:
		g.link(e.From, e.To)
	case Remove:
		g.unlink(e.From, e.To)
	case Reverse:
		g.unlink(e.From, e.To)
		g.link(e.To, e.From)
	}
}

func (g *graph) undo(e Edit) { g.apply(e.inverse()) }

// inverse is the edit that takes e back: an added arc removed, a removed
// one added, a reversed one reversed again.
func (e Edit) inverse() Edit {
	switch e.Op {
	case Add:
		return Edit{Op: Remove, From: e.From, To: e.To}
	case Remove:
		return Edit{Op: Add, From: e.From, To: e.To}
	}
	return Edit{Op: Reverse, From: e.To, To: e.From}
}

// updateReach recomputes which nodes each node reaches, in reverse
// topological order (Kahn's algorithm); false when there is a cycle.
func (g *graph) updateReach() bool {
	indeg := make([]int, g.n)
	var order []int
	for v := range g.n {
		if indeg[v] = len(g.pa[v]); indeg[v] == 0 {
			order = append(order, v)
		}
	}
	for i := 0; i < len(order); i++ {
		for _, c := range g.ch[order[i]] {
			if indeg[c]--; indeg[c] == 0 {
				order = append(order, c)
			}
		}
	}
	if len(order) < g.n {
		return false
	}
	for i := len(order) - 1; i >= 0; i-- {
		u := order[i]
		g.reach[u].reset()
		for _, c := range g.ch[u] {
			g.reach[u].set(c)
			g.reach[u].or(g.reach[c])
		}
	}
	return true
}

// otherPath reports whether u reaches v other than by the arrow u → v.
func (g *graph) otherPath(u, v int) bool {
	for _, c := range g.ch[u] {
		if c != v && g.reach[c].has(v) {
			return true
		}
	}
	return false
}

// parents returns a copy of the parent lists.
func (g *graph) parents() [][]int {
	out := make([][]int, g.n)
	for v, ps := range g.pa {
		out[v] = slices.Clone(ps)
	}
	return out
}

// Apply returns a copy of parents with the edit made.
func Apply(parents [][]int, e Edit) [][]int {
	out := make([][]int, len(parents))
	for v, ps := range parents {
		out[v] = slices.Clone(ps)
	}
	switch e.Op {
	case Add:
		out[e.To] = insertSorted(out[e.To], e.From)
	case Remove:
		out[e.To] = slices.DeleteFunc(out[e.To], func(u int) bool { return u == e.From })
	case Reverse:
		out[e.To] = slices.DeleteFunc(out[e.To], func(u int) bool { return u == e.From })
		out[e.From] = insertSorted(out[e.From], e.To)
	}
	return out
}
