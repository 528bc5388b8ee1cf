package nearby

import "context"

// knowledge is Knowledge as quick lookups.
type knowledge struct {
	exo   []bool
	fixed map[[2]int]bool
	tier  []int
}

func newKnowledge(n int, k Knowledge) *knowledge {
	kn := &knowledge{exo: make([]bool, n), fixed: map[[2]int]bool{}, tier: make([]int, n)}
	copy(kn.exo, k.Exogenous)
	for v := range kn.tier {
		kn.tier[v] = -1
		if v < len(k.Tier) {
			kn.tier[v] = k.Tier[v]
		}
	}
	for _, f := range k.Fixed {
		kn.fixed[f] = true
	}
	return kn
}

// eachEdit calls fn for every edit of g that leaves an acyclic graph
// respecting the knowledge (see allowed). Edits come in a fixed order: by
// the first node, then the second, the ops in the order add, remove,
// reverse.
func eachEdit(ctx context.Context, m Model, g *graph, kn *knowledge, fn func(Edit)) error {
	for u := range g.n {
		if !m.in(u) {
			continue
		}
		if err := ctx.Err(); err != nil {
			return err
		}
		for v := range g.n {
			if v == u || !m.in(v) {
				continue
			}
			for _, op := range ops(g, u, v) {
				if e := (Edit{Op: op, From: u, To: v}); kn.allowed(g, e) {
					fn(e)
				}
			}
		}
	}
	return nil
}

var (
	arrowOps = []Op{Remove, Reverse}
	addOps   = []Op{Add}
)

// ops are the edits that make sense for the ordered pair u, v of g.
func ops(g *graph, u, v int) []Op {
	switch {
	case g.isPa[v].has(u):
		return arrowOps
	case g.isPa[u].has(v):
		return nil
	}
	return addOps
}

// allowed reports whether the edit keeps g acyclic and respects the
// knowledge: an arrow added between non-adjacent nodes (not into an
// exogenous node, not from a later tier to an earlier one, not closing a
// cycle), an arrow that is not fixed removed, or reversed (not into an
// exogenous node, not to point from a later tier to an earlier one, not
// when another directed path joins its ends).
func (kn *knowledge) allowed(g *graph, e Edit) bool {
	u, v := e.From, e.To
	switch e.Op {
	case Add:
		return !g.adjacent(u, v) && !kn.exo[v] && !kn.backward(u, v) && !g.reach[v].has(u)
	case Remove:
		return g.isPa[v].has(u) && !kn.fixed[[2]int{u, v}]
	}
	return g.isPa[v].has(u) && !kn.fixed[[2]int{u, v}] && !kn.exo[u] && !kn.backward(v, u) && !g.otherPath(u, v)
}

// backward reports whether an arrow u → v would point from a later tier
// to an earlier one.
func (kn *knowledge) backward(u, v int) bool {
	return kn.tier[u] >= 0 && kn.tier[v] >= 0 && kn.tier[u] > kn.tier[v]
}
