package dag

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
// the edges that all members orient alike. Built from the skeleton and the
// v-structures by Meek's (1995) rules R1–R3.
func CPDAG(g *PDAG) *PDAG {
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

// ChainComponents returns the connected components of g's lines that have
// at least two nodes, each sorted, in order of their smallest node.
func ChainComponents(g *PDAG) [][]int {
	seen := make([]bool, g.N())
	var out [][]int
	for s := range g.N() {
		if seen[s] || len(g.Siblings(s)) == 0 {
			continue
		}
		comp := []int{s}
		seen[s] = true
		for i := 0; i < len(comp); i++ {
			for _, v := range g.Siblings(comp[i]) {
				if !seen[v] {
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
