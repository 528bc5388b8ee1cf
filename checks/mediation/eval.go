package mediation

// evaluator computes an effect from the coefficients of the arcs it can
// depend on, for the many draws of MonteCarlo and Bootstrap: the nodes on
// some directed path between consecutive nodes of the chain (the relevant
// nodes) in topological order, and one slot per arc between them. Each
// factor T[u,v] is found by forward substitution from u, the row of
// (I − B)⁻¹ that TotalEffects would give, in time linear in the arcs.
type evaluator struct {
	chain  *chain
	nodes  []int   // relevant nodes, global ids, topological order
	pa     [][]int // pa[l]: local indices of node l's relevant parents
	slot   [][]int // slot[l][k]: the coefficient slot of arc pa[l][k] → l
	arcs   [][2]int
	starts []int // local indices of the chain's nodes
	direct int   // the slot of the arc From → To, or −1 (total indirect only)
}

// newEvaluator compiles the effect along c in the graph of parents.
func newEvaluator(parents [][]int, c *chain) *evaluator {
	n := len(parents)
	reach := reachability(parents, c.order)
	on := make([]bool, n)
	for s := 0; s+1 < len(c.nodes); s++ {
		u, v := c.nodes[s], c.nodes[s+1]
		on[u], on[v] = true, true
		for w := range n {
			on[w] = on[w] || reach[u][w] && reach[w][v]
		}
	}
	e := &evaluator{chain: c, direct: -1}
	loc := make([]int, n)
	for _, v := range c.order {
		loc[v] = -1
		if on[v] {
			loc[v] = len(e.nodes)
			e.nodes = append(e.nodes, v)
		}
	}
	for _, v := range e.nodes {
		var pa, slot []int
		for _, i := range parents[v] {
			if loc[i] >= 0 {
				pa, slot = append(pa, loc[i]), append(slot, len(e.arcs))
				e.arcs = append(e.arcs, [2]int{i, v})
			}
		}
		e.pa, e.slot = append(e.pa, pa), append(e.slot, slot)
	}
	for _, u := range c.nodes {
		e.starts = append(e.starts, loc[u])
	}
	if len(c.nodes) == 2 {
		for k, a := range e.arcs {
			if a == [2]int{c.nodes[0], c.nodes[1]} {
				e.direct = k
			}
		}
	}
	return e
}

// slots returns, for node j's equation, the positions k in parents[j] of
// its relevant coefficients and their slots; none for a node outside.
func (e *evaluator) slots(parents [][]int, j int) (pos, slot []int) {
	for k, i := range parents[j] {
		for s, a := range e.arcs {
			if a == [2]int{i, j} {
				pos, slot = append(pos, k), append(slot, s)
			}
		}
	}
	return pos, slot
}

// eval returns the effect for the coefficients beta (one per slot); t is
// scratch of len(e.nodes).
func (e *evaluator) eval(beta, t []float64) float64 {
	if !e.chain.connected {
		return 0
	}
	v := 1.0
	for s := 0; s+1 < len(e.starts); s++ {
		v *= e.factor(beta, t, e.starts[s], e.starts[s+1])
	}
	if e.direct >= 0 {
		v -= beta[e.direct]
	}
	return v
}

// factor is T[u,w] by forward substitution over the nodes from u to w.
func (e *evaluator) factor(beta, t []float64, u, w int) float64 {
	clear(t[u:w])
	t[u] = 1
	for l := u + 1; l <= w; l++ {
		sum := 0.0
		for k, p := range e.pa[l] {
			if p >= u {
				sum += t[p] * beta[e.slot[l][k]]
			}
		}
		t[l] = sum
	}
	return t[w]
}
