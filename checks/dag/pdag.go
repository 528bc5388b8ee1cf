package dag

import (
	"fmt"
	"sort"
	"strconv"
)

// Edge is a directed pair of node indices: From → To.
type Edge struct{ From, To int }

// Mark values: the state of an adjacency seen from one end.
const (
	line    int8 = 0  // undirected u − v
	arcOut  int8 = 1  // u → v
	arcIn   int8 = -1 // v → u
	absent  int8 = 2  // used only as a return value: no adjacency
	noIndex      = -1
)

// PDAG is a partially directed graph over nodes 0..N()-1: every adjacent
// pair is joined either by an arc (directed edge) or by a line (undirected
// edge). A DAG is a PDAG without lines. The skeleton is fixed when the
// graph is made; only lines can later be oriented.
type PDAG struct {
	adj  [][]int  // sorted neighbour lists (the skeleton)
	mark [][]int8 // mark[u][k] is the state of u and adj[u][k], seen from u
	// at[u], for a node of degree denseDegree or more, maps every node v
	// to the place of v in adj[u] (noIndex when not adjacent), so that
	// lookups at dense nodes take constant time; nil for the others, which
	// are searched. Part of the skeleton: shared by clones.
	at [][]int32
}

// denseDegree is the degree from which a node's adjacencies are looked up
// in a table of N entries rather than by binary search.
const denseDegree = 16

// New returns a PDAG on n nodes with the given arcs and lines. It panics on
// a self-loop, an index out of range or a pair given twice: callers
// validate their input first.
func New(n int, arcs []Edge, lines [][2]int) *PDAG {
	type half struct {
		to   int
		mark int8
	}
	tmp := make([][]half, n)
	add := func(u, v int, m int8) {
		if u == v || u < 0 || v < 0 || u >= n || v >= n {
			panic(fmt.Sprintf("dag: bad pair %d,%d for %d nodes", u, v, n))
		}
		tmp[u] = append(tmp[u], half{v, m})
		tmp[v] = append(tmp[v], half{u, -m})
	}
	for _, e := range arcs {
		add(e.From, e.To, arcOut)
	}
	for _, l := range lines {
		add(l[0], l[1], line)
	}
	g := &PDAG{adj: make([][]int, n), mark: make([][]int8, n)}
	for u, hs := range tmp {
		sort.Slice(hs, func(i, j int) bool { return hs[i].to < hs[j].to })
		g.adj[u] = make([]int, len(hs))
		g.mark[u] = make([]int8, len(hs))
		for k, h := range hs {
			if k > 0 && hs[k-1].to == h.to {
				panic(fmt.Sprintf("dag: pair %d,%d given twice", u, h.to))
			}
			g.adj[u][k], g.mark[u][k] = h.to, h.mark
		}
	}
	g.at = lookupTables(g.adj)
	return g
}

// lookupTables builds PDAG.at for the nodes of degree denseDegree or more.
func lookupTables(adj [][]int) [][]int32 {
	at := make([][]int32, len(adj))
	for u, a := range adj {
		if len(a) < denseDegree {
			continue
		}
		at[u] = make([]int32, len(adj))
		for v := range at[u] {
			at[u][v] = noIndex
		}
		for k, v := range a {
			at[u][v] = int32(k)
		}
	}
	return at
}

// FromArcs returns the DAG (or directed graph) on n nodes with these arcs.
func FromArcs(n int, arcs []Edge) *PDAG { return New(n, arcs, nil) }

// N is the number of nodes.
func (g *PDAG) N() int { return len(g.adj) }

// Clone returns an independent copy.
func (g *PDAG) Clone() *PDAG {
	c := &PDAG{adj: g.adj, at: g.at, mark: make([][]int8, len(g.mark))} // the skeleton is shared: it never changes
	for u, m := range g.mark {
		c.mark[u] = append([]int8(nil), m...)
	}
	return c
}

func (g *PDAG) index(u, v int) int {
	if t := g.at[u]; t != nil {
		return int(t[v])
	}
	a := g.adj[u]
	k := sort.SearchInts(a, v)
	if k < len(a) && a[k] == v {
		return k
	}
	return noIndex
}

func (g *PDAG) state(u, v int) int8 {
	k := g.index(u, v)
	if k == noIndex {
		return absent
	}
	return g.mark[u][k]
}

// Adjacent reports whether u and v are joined by an arc or a line.
func (g *PDAG) Adjacent(u, v int) bool { return g.index(u, v) != noIndex }

// HasArc reports whether u → v.
func (g *PDAG) HasArc(u, v int) bool { return g.state(u, v) == arcOut }

// HasLine reports whether u − v.
func (g *PDAG) HasLine(u, v int) bool { return g.state(u, v) == line }

func (g *PDAG) collect(u int, m int8) []int {
	var out []int
	for k, v := range g.adj[u] {
		if g.mark[u][k] == m {
			out = append(out, v)
		}
	}
	return out
}

// Parents returns the nodes v with v → u, in increasing order.
func (g *PDAG) Parents(u int) []int { return g.collect(u, arcIn) }

// Children returns the nodes v with u → v, in increasing order.
func (g *PDAG) Children(u int) []int { return g.collect(u, arcOut) }

// Siblings returns the nodes v with u − v, in increasing order.
func (g *PDAG) Siblings(u int) []int { return g.collect(u, line) }

// Orient turns the line u − v into the arc u → v. It panics if u − v is
// not a line.
func (g *PDAG) Orient(u, v int) {
	ku, kv := g.index(u, v), g.index(v, u)
	if ku == noIndex || g.mark[u][ku] != line {
		panic(fmt.Sprintf("dag: %d−%d is not a line", u, v))
	}
	g.mark[u][ku], g.mark[v][kv] = arcOut, arcIn
}

// Arcs returns every arc, sorted by (From, To).
func (g *PDAG) Arcs() []Edge {
	var out []Edge
	for u := range g.adj {
		for _, v := range g.Children(u) {
			out = append(out, Edge{u, v})
		}
	}
	return out
}

// Lines returns every line as a pair (u, v) with u < v, sorted.
func (g *PDAG) Lines() [][2]int {
	var out [][2]int
	for u := range g.adj {
		for _, v := range g.Siblings(u) {
			if u < v {
				out = append(out, [2]int{u, v})
			}
		}
	}
	return out
}

// Key is a compact text form of the graph, equal for equal graphs; it
// serves as a map key in tests and deduplication.
func (g *PDAG) Key() string {
	b := make([]byte, 0, 8*len(g.adj))
	for u := range g.adj {
		for k, v := range g.adj[u] {
			sep := byte(0)
			switch {
			case g.mark[u][k] == arcOut:
				sep = '>'
			case g.mark[u][k] == line && u < v:
				sep = '-'
			}
			if sep != 0 { // "u>v," or "u-v,"
				b = append(strconv.AppendInt(append(strconv.AppendInt(b, int64(u), 10), sep), int64(v), 10), ',')
			}
		}
	}
	return string(b)
}
