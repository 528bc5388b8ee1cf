package dag

import "slices"

// VStructure is a collider a → c ← b with a and b non-adjacent, a < b.
type VStructure struct{ A, C, B int }

// VStructures returns the v-structures of the DAG g, sorted by (C, A, B).
func VStructures(g *PDAG) []VStructure {
	var out []VStructure
	for c := range g.N() {
		pa := g.Parents(c)
		for i, a := range pa {
			for _, b := range pa[i+1:] {
				if !g.Adjacent(a, b) {
					out = append(out, VStructure{a, c, b})
				}
			}
		}
	}
	return out
}

// Skeleton returns the undirected graph of g: every adjacency as a line.
func Skeleton(g *PDAG) *PDAG {
	var lines [][2]int
	for u := range g.N() {
		for _, v := range g.adj[u] {
			if u < v {
				lines = append(lines, [2]int{u, v})
			}
		}
	}
	return New(g.N(), nil, lines)
}

// CPDAG returns the completed partially directed acyclic graph of the DAG
// g: the graph that every member of g's Markov equivalence class shares.
// Two DAGs are Markov equivalent exactly when they have the same skeleton
// and the same v-structures (Verma & Pearl 1990); the CPDAG keeps as arcs
// the edges that all members orient alike (compelled) and as lines the
// others (reversible). The edges are labelled by Chickering's (1995)
// Find-Compelled, which visits them in a fixed order (by their head in a
// topological order, then by their tail, latest first) and decides each
// from the labels of the edges before it:
//
//	for the first unlabelled x → y:
//	  for every compelled w → x: if w is not a parent of y, every edge into y
//	    is compelled (done with y); else w → y is compelled
//	  if some z → y has z ≠ x and z not a parent of x, x → y and the other
//	    unlabelled edges into y are compelled; else they are reversible
//
// Its cost is linear in the edges with constant-time adjacency, where
// closing the skeleton under Meek's rules revisits each line once per arc
// made near it.
func CPDAG(g *PDAG) *PDAG {
	order, ok := TopoOrder(g)
	if !ok {
		panic("dag: CPDAG of a graph with a cycle")
	}
	rank := make([]int, g.N())
	for i, v := range order {
		rank[v] = i
	}
	compelled := make([][]bool, g.N()) // by the place of the tail in adj[head]
	var arcs []Edge
	var lines [][2]int
	for _, y := range order {
		compelled[y] = make([]bool, len(g.adj[y]))
		pa := g.Parents(y)
		if len(pa) == 0 {
			continue
		}
		labelInto(g, y, pa, rank, compelled)
		for _, x := range pa {
			if compelled[y][g.index(y, x)] {
				arcs = append(arcs, Edge{x, y})
			} else {
				lines = append(lines, [2]int{x, y})
			}
		}
	}
	return New(g.N(), arcs, lines)
}

// labelInto labels the edges into y (its parents pa) for CPDAG, the edges
// into earlier nodes labelled already.
func labelInto(g *PDAG, y int, pa, rank []int, compelled [][]bool) {
	x := pa[0]
	for _, p := range pa[1:] {
		if rank[p] > rank[x] {
			x = p
		}
	}
	all := func() {
		for _, p := range pa {
			compelled[y][g.index(y, p)] = true
		}
	}
	for k, w := range g.adj[x] {
		if g.mark[x][k] != arcIn || !compelled[x][k] {
			continue
		}
		if !g.HasArc(w, y) {
			all()
			return
		}
		compelled[y][g.index(y, w)] = true
	}
	for _, z := range pa {
		if z != x && !g.HasArc(z, x) {
			all()
			return
		}
	}
}

// ChainComponents returns the connected components of g's lines that have
// at least two nodes, each sorted, in order of their smallest node.
func ChainComponents(g *PDAG) [][]int {
	seen := make([]bool, g.N())
	var out [][]int
	for s := range g.N() {
		if seen[s] || !slices.Contains(g.mark[s], line) {
			continue
		}
		comp := []int{s}
		seen[s] = true
		for i := 0; i < len(comp); i++ {
			u := comp[i]
			for k, v := range g.adj[u] {
				if g.mark[u][k] == line && !seen[v] {
					seen[v] = true
					comp = append(comp, v)
				}
			}
		}
		sortInts(comp)
		out = append(out, comp)
	}
	return out
}
