package render

// ranks gives every variable its row and says which arcs run upwards
// (rev). With tiers the row is the tier: an arc into an earlier tier runs
// upwards, one within a tier stays in its row. Without tiers, the arcs
// that close a cycle are reversed (the back arcs of a depth-first search
// in input order; Gansner et al. 1993, §2.1) and each variable's row is
// the longest path into it, a source then moved down to just above its
// highest child so that its arrows stay short.
func ranks(n int, arcs [][2]int, tierOf []int) (rank []int, rev []bool) {
	rev = make([]bool, len(arcs))
	if tierOf != nil {
		for k, a := range arcs {
			rev[k] = tierOf[a[0]] > tierOf[a[1]]
		}
		return tierOf, rev
	}
	rev = backArcs(n, arcs)
	down := orientedAdjacency(n, arcs, rev)
	rank = longestPath(n, down)
	pullSourcesDown(rank, down)
	return rank, rev
}

// orientedAdjacency lists, for each variable, the arcs leaving it once
// the back arcs are turned round: pairs of (arc, other end).
func orientedAdjacency(n int, arcs [][2]int, rev []bool) [][][2]int {
	down := make([][][2]int, n)
	for k, a := range arcs {
		u, v := a[0], a[1]
		if rev[k] {
			u, v = v, u
		}
		down[u] = append(down[u], [2]int{k, v})
	}
	return down
}

// backArcs marks the arcs that reach a variable still on the depth-first
// search's stack.
func backArcs(n int, arcs [][2]int) []bool {
	out := make([][][2]int, n)
	for k, a := range arcs {
		out[a[0]] = append(out[a[0]], [2]int{k, a[1]})
	}
	rev := make([]bool, len(arcs))
	state := make([]int8, n) // 0 new, 1 on the stack, 2 done
	var visit func(u int)
	visit = func(u int) {
		state[u] = 1
		for _, e := range out[u] {
			switch state[e[1]] {
			case 0:
				visit(e[1])
			case 1:
				rev[e[0]] = true
			}
		}
		state[u] = 2
	}
	for u := range n {
		if state[u] == 0 {
			visit(u)
		}
	}
	return rev
}

// longestPath is the number of arcs on the longest path into each
// variable of an acyclic graph (Kahn's order).
func longestPath(n int, down [][][2]int) []int {
	indeg := make([]int, n)
	for _, es := range down {
		for _, e := range es {
			indeg[e[1]]++
		}
	}
	var queue []int
	for v := range n {
		if indeg[v] == 0 {
			queue = append(queue, v)
		}
	}
	rank := make([]int, n)
	for len(queue) > 0 {
		u := queue[0]
		queue = queue[1:]
		for _, e := range down[u] {
			rank[e[1]] = max(rank[e[1]], rank[u]+1)
			if indeg[e[1]]--; indeg[e[1]] == 0 {
				queue = append(queue, e[1])
			}
		}
	}
	return rank
}

// pullSourcesDown puts each variable with no arc into it one row above
// its highest child.
func pullSourcesDown(rank []int, down [][][2]int) {
	in := make([]bool, len(rank))
	for _, es := range down {
		for _, e := range es {
			in[e[1]] = true
		}
	}
	for u, es := range down {
		if in[u] || len(es) == 0 {
			continue
		}
		lowest := rank[es[0][1]]
		for _, e := range es {
			lowest = min(lowest, rank[e[1]])
		}
		rank[u] = lowest - 1
	}
}
