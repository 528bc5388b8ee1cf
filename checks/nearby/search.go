package nearby

import (
	"context"
	"fmt"
	"slices"
)

// MaxSearchSteps bounds the greedy search; each step lowers the BIC, so
// it ends on its own well before this on any graph within the limits.
const MaxSearchSteps = 20000

// improvement is the least decrease of BIC a search step must bring, so
// that rounding cannot make it step between graphs of equal score.
const improvement = 1e-9

// SearchResult is where the greedy search stopped.
type SearchResult struct {
	// Parents are the parent lists of the best graph found.
	Parents [][]int
	// Edits turn the declared graph into it (declared-arrow order: adds,
	// removals and reversals by their first node, then their second).
	Edits []Edit
	// DeltaBIC is its BIC minus the declared graph's (≤ 0).
	DeltaBIC float64
	Steps    int
	// Stopped is set when MaxSearchSteps was reached.
	Stopped bool
}

// Search starts at the DAG given by parents and repeatedly takes the edit
// (add, remove or reverse one arrow, knowledge respected, acyclic) that
// lowers BIC most, until none lowers it (a hill climb over DAGs with a
// decomposable score, Chickering 2002). Ties go to the first edit in
// eachEdit's order. It watches ctx.
func Search(ctx context.Context, m Model, parents [][]int, k Knowledge) (*SearchResult, error) {
	g, r, kn, err := setUp(m, parents, k)
	if err != nil {
		return nil, err
	}
	res := &SearchResult{}
	var pool []Edit // every edit, allowed or not, whose ΔBIC is negative
	for v := range g.n {
		pool = r.improving(pool, g, v)
	}
	for res.Steps < MaxSearchSteps {
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		best, ok := bestAllowed(pool, g, r, kn)
		if !ok {
			break
		}
		d := r.delta(best)
		if err := step(g, r, best); err != nil {
			return nil, err
		}
		pool = r.refresh(pool, g, best)
		res.DeltaBIC += d
		res.Steps++
	}
	res.Stopped = res.Steps == MaxSearchSteps
	res.Parents = g.parents()
	res.Edits = Diff(parents, res.Parents)
	return res, nil
}

// bestAllowed is the allowed edit of the pool that lowers BIC most, ties
// to the first in eachEdit's order.
func bestAllowed(pool []Edit, g *graph, r *rows, kn *knowledge) (Edit, bool) {
	var best Edit
	bestDelta, found := 0.0, false
	for _, e := range pool {
		d := r.delta(e)
		if !(d < -improvement) || !kn.allowed(g, e) {
			continue
		}
		if !found || d < bestDelta || d == bestDelta && before(e, best) {
			best, bestDelta, found = e, d, true
		}
	}
	return best, found
}

var opRank = map[Op]int{Add: 0, Remove: 1, Reverse: 2}

func before(a, b Edit) bool {
	if a.From != b.From {
		return a.From < b.From
	}
	if a.To != b.To {
		return a.To < b.To
	}
	return opRank[a.Op] < opRank[b.Op]
}

// improving appends the edits whose ΔBIC depends on node w's row and is
// negative: arrows into w added, removed or reversed, and w's own arrows
// reversed (which add to w's parents). Edits not allowed now are kept too:
// they may become allowed after later steps.
func (r *rows) improving(pool []Edit, g *graph, w int) []Edit {
	if !r.m.in(w) {
		return pool
	}
	keep := func(e Edit) {
		if r.delta(e) < -improvement {
			pool = append(pool, e)
		}
	}
	for u := range g.n {
		if u == w || !r.m.in(u) {
			continue
		}
		switch {
		case g.isPa[w].has(u):
			keep(Edit{Op: Remove, From: u, To: w})
			keep(Edit{Op: Reverse, From: u, To: w})
		case g.isPa[u].has(w): // not allowed while w → u stands, kept for after its removal
			keep(Edit{Op: Reverse, From: w, To: u})
			keep(Edit{Op: Add, From: u, To: w})
		default:
			keep(Edit{Op: Add, From: u, To: w})
		}
	}
	return pool
}

// refresh drops the pool's edits that depend on the rows the edit e
// changed and adds those rows' improving edits anew.
func (r *rows) refresh(pool []Edit, g *graph, e Edit) []Edit {
	changed := []int{e.To}
	if e.Op == Reverse {
		changed = append(changed, e.From)
	}
	pool = slices.DeleteFunc(pool, func(p Edit) bool {
		return slices.Contains(changed, p.To) || p.Op == Reverse && slices.Contains(changed, p.From)
	})
	for _, w := range changed {
		pool = r.improving(pool, g, w)
	}
	return pool
}

func step(g *graph, r *rows, e Edit) error {
	g.apply(e)
	if !g.updateReach() {
		return fmt.Errorf("nearby: the edit %s %d→%d made a cycle", e.Op, e.From, e.To)
	}
	if err := r.update(e.To, g.pa[e.To]); err != nil {
		return err
	}
	if e.Op == Reverse {
		return r.update(e.From, g.pa[e.From])
	}
	return nil
}

// Diff returns the edits that turn the DAG from into the DAG to: the
// arrows of from that to removes or reverses, then the arrows to adds,
// each group by its first node, then its second.
func Diff(from, to [][]int) []Edit {
	var out []Edit
	has := func(ps [][]int, u, v int) bool { return isIn(ps[v], u) }
	n := len(from)
	for u := range n {
		for v := range n {
			switch {
			case has(from, u, v) && has(to, v, u):
				out = append(out, Edit{Op: Reverse, From: u, To: v})
			case has(from, u, v) && !has(to, u, v):
				out = append(out, Edit{Op: Remove, From: u, To: v})
			}
		}
	}
	for u := range n {
		for v := range n {
			if has(to, u, v) && !has(from, u, v) && !has(from, v, u) {
				out = append(out, Edit{Op: Add, From: u, To: v})
			}
		}
	}
	return out
}
