package nearby

import "context"

// knowledge is Knowledge as quick lookups.
type knowledge struct {
	exo   []bool
	fixed map[[2]int]bool
}

func newKnowledge(n int, k Knowledge) *knowledge {
	kn := &knowledge{exo: make([]bool, n), fixed: map[[2]int]bool{}}
	copy(kn.exo, k.Exogenous)
	for _, f := range k.Fixed {
		kn.fixed[f] = true
	}
	return kn
}

// eachEdit calls fn for every edit of g that leaves an acyclic graph
// respecting the knowledge: an arrow added between non-adjacent nodes of
// the graph (not into an exogenous node, not closing a cycle), an arrow
// that is not fixed removed, or reversed (not into an exogenous node, not
// when another directed path joins its ends). Edits come in a fixed order:
// by the first node, then the second, the ops in the order add, remove,
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
			switch {
			case g.isPa[v].has(u):
				if kn.fixed[[2]int{u, v}] {
					continue
				}
				fn(Edit{Op: Remove, From: u, To: v})
				if !kn.exo[u] && !g.otherPath(u, v) {
					fn(Edit{Op: Reverse, From: u, To: v})
				}
			case !g.isPa[u].has(v) && !kn.exo[v] && !g.reach[v].has(u):
				fn(Edit{Op: Add, From: u, To: v})
			}
		}
	}
	return nil
}
