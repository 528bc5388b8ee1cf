package dag

import (
	"fmt"
	"math/big"
	"math/rand/v2"
	"slices"
)

// allDAGs calls fn with every labelled DAG on n nodes: each unordered pair
// is absent, u → v or v → u, and the acyclic assignments are kept.
func allDAGs(n int, fn func(*PDAG)) {
	var pairs [][2]int
	for u := range n {
		for v := u + 1; v < n; v++ {
			pairs = append(pairs, [2]int{u, v})
		}
	}
	total := 1
	for range pairs {
		total *= 3
	}
	for code := range total {
		var arcs []Edge
		c := code
		for _, p := range pairs {
			switch c % 3 {
			case 1:
				arcs = append(arcs, Edge{p[0], p[1]})
			case 2:
				arcs = append(arcs, Edge{p[1], p[0]})
			}
			c /= 3
		}
		g := FromArcs(n, arcs)
		if _, ok := TopoOrder(g); ok {
			fn(g)
		}
	}
}

func undirected(n int, edges [][2]int) *PDAG { return New(n, nil, edges) }

func complete(p int, drop ...[2]int) *PDAG {
	var edges [][2]int
	for u := range p {
		for v := u + 1; v < p; v++ {
			if !slices.Contains(drop, [2]int{u, v}) {
				edges = append(edges, [2]int{u, v})
			}
		}
	}
	return undirected(p, edges)
}

func factorial(n int) int64 { return new(big.Int).MulRange(1, int64(n)).Int64() }

// bruteMembers is the test oracle: every orientation of the skeleton of c
// by a permutation of the nodes (so every acyclic one) that keeps exactly
// the arcs of c and has no v-structure c lacks, deduplicated, and keeping
// the required arcs. It does not use Meek's rules or the counter.
func bruteMembers(c *PDAG, required []Edge) map[string]*PDAG {
	n := c.N()
	var edges [][2]int
	adj := make([]uint16, n)
	for u := range n {
		for _, v := range c.neighbours(u) {
			adj[u] |= 1 << v
			if u < v {
				edges = append(edges, [2]int{u, v})
			}
		}
	}
	var must, mustVal uint64 // edges that c orients, and how
	for i, e := range edges {
		if c.HasArc(e[1], e[0]) {
			must, mustVal = must|1<<i, mustVal|1<<i
		} else if c.HasArc(e[0], e[1]) {
			must |= 1 << i
		}
	}
	perm := make([]int, n)
	for i := range perm {
		perm[i] = i
	}
	rank := make([]int, n)
	want := colliders(n, adj, edges, mustVal, must)
	seen := map[uint64]bool{}
	out := map[string]*PDAG{}
	for {
		for i, v := range perm {
			rank[v] = i
		}
		var mask uint64
		for i, e := range edges {
			if rank[e[1]] < rank[e[0]] {
				mask |= 1 << i
			}
		}
		if !seen[mask] && mask&must == mustVal {
			seen[mask] = true
			if colliders(n, adj, edges, mask, ^uint64(0)) == want {
				if g := orientByMask(n, edges, mask); hasAll(g, required) {
					out[g.Key()] = g
				}
			}
		}
		if !nextPermutation(perm) {
			return out
		}
	}
}

// colliders encodes the v-structures of the orientation mask of edges
// (bit i set: edges[i] points from its second node to its first), counting
// only the edges in use.
func colliders(n int, adj []uint16, edges [][2]int, mask, use uint64) string {
	parents := make([]uint16, n)
	for i, e := range edges {
		if use&(1<<i) == 0 {
			continue
		}
		if mask&(1<<i) != 0 {
			parents[e[0]] |= 1 << e[1]
		} else {
			parents[e[1]] |= 1 << e[0]
		}
	}
	b := make([]byte, 0, 16)
	for v, pa := range parents {
		for a := range n {
			later := pa &^ adj[a] &^ (1<<(a+1) - 1) // parents after a and not adjacent to it
			if pa&(1<<a) != 0 && later != 0 {
				b = fmt.Appendf(b, "%d:%d:%d;", v, a, later)
			}
		}
	}
	return string(b)
}

func orientByMask(n int, edges [][2]int, mask uint64) *PDAG {
	arcs := make([]Edge, len(edges))
	for i, e := range edges {
		arcs[i] = Edge{e[0], e[1]}
		if mask&(1<<i) != 0 {
			arcs[i] = Edge{e[1], e[0]}
		}
	}
	return FromArcs(n, arcs)
}

func hasAll(g *PDAG, arcs []Edge) bool {
	for _, a := range arcs {
		if !g.HasArc(a.From, a.To) {
			return false
		}
	}
	return true
}

func nextPermutation(p []int) bool {
	i := len(p) - 2
	for i >= 0 && p[i] >= p[i+1] {
		i--
	}
	if i < 0 {
		return false
	}
	j := len(p) - 1
	for p[j] <= p[i] {
		j--
	}
	p[i], p[j] = p[j], p[i]
	slices.Reverse(p[i+1:])
	return true
}

func randomDAG(r *rand.Rand, n int, density float64) *PDAG {
	perm := r.Perm(n)
	var arcs []Edge
	for i := range n {
		for j := i + 1; j < n; j++ {
			if r.Float64() < density {
				arcs = append(arcs, Edge{perm[i], perm[j]})
			}
		}
	}
	return FromArcs(n, arcs)
}

// randomBackground picks background knowledge for tests: sometimes a
// node's arrows all pointing out, sometimes one arrow of g (kept or
// reversed).
func randomBackground(r *rand.Rand, g *PDAG) []Edge {
	var req []Edge
	if r.IntN(2) == 0 {
		x := r.IntN(g.N())
		req = append(req, ExogenousArcs(g, x)...)
	}
	if arcs := g.Arcs(); len(arcs) > 0 && r.IntN(2) == 0 {
		a := arcs[r.IntN(len(arcs))]
		if r.IntN(4) == 0 {
			a = Edge{a.To, a.From}
		}
		req = append(req, a)
	}
	return req
}

// dsepStatements lists every statement x ⊥ y | Z that the DAG implies.
func dsepStatements(g *PDAG) string {
	n := g.N()
	var b []byte
	for x := range n {
		for y := x + 1; y < n; y++ {
			for mask := range 1 << n {
				if mask&(1<<x) != 0 || mask&(1<<y) != 0 {
					continue
				}
				var z []int
				for v := range n {
					if mask&(1<<v) != 0 {
						z = append(z, v)
					}
				}
				if DSeparated(g, x, y, z) {
					b = fmt.Appendf(b, "%d,%d|%d;", x, y, mask)
				}
			}
		}
	}
	return string(b)
}

// neighbours returns every node adjacent to u, in increasing order. The
// slice is shared with the graph and must not be modified.
func (g *PDAG) neighbours(u int) []int { return g.adj[u] }
