package dag

// neighbours returns every node adjacent to u, in increasing order. The
// slice is shared with the graph and must not be modified.
func (g *PDAG) neighbours(u int) []int { return g.adj[u] }
