package dag

// clique reports whether the nodes vs (sorted, a component of lines) are
// all joined to each other by lines.
func (c *counter) clique(vs []int) bool {
	for i, v := range vs {
		c.pos[v] = i
	}
	defer func() {
		for _, v := range vs {
			c.pos[v] = -1
		}
	}()
	for _, v := range vs {
		n := 0
		for k, w := range c.g.adj[v] {
			if c.g.mark[v][k] == line && c.pos[w] >= 0 {
				n++
			}
		}
		if n != len(vs)-1 {
			return false
		}
	}
	return true
}

// isComplete reports whether every two nodes of g are adjacent. Putting a
// clique first in a complete component then leaves the rest one complete
// component with every line still a line: R1 and R3 need two
// non-adjacent nodes, R2 an arc out of a node of the rest.
func isComplete(g *PDAG) bool {
	for _, a := range g.adj {
		if len(a) != len(g.adj)-1 {
			return false
		}
	}
	return true
}

// restOf returns the global ids of the nodes of vs outside the clique.
func restOf(vs []int, inK []bool) []int {
	var out []int
	for i, v := range vs {
		if !inK[i] {
			out = append(out, v)
		}
	}
	return out
}
