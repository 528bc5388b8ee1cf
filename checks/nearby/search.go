package nearby

import (
	"context"
	"fmt"
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
	pool := newPool(g, r, kn)
	for res.Steps < MaxSearchSteps {
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		best, ok := pool.best()
		if !ok {
			break
		}
		d := r.delta(best)
		if err := step(g, r, best); err != nil {
			return nil, err
		}
		pool.refresh(best)
		res.DeltaBIC += d
		res.Steps++
	}
	res.Stopped = res.Steps == MaxSearchSteps
	res.Parents = g.parents()
	res.Edits = Diff(parents, res.Parents)
	return res, nil
}

// opRank orders the ops of one pair as eachEdit does.
func opRank(op Op) int {
	switch op {
	case Add:
		return 0
	case Remove:
		return 1
	}
	return 2
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
