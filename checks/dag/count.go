package dag

import (
	"encoding/binary"
	"errors"
	"fmt"
	"math/big"
	"sort"
)

// MaxOrderStates bounds the work of counting the orders of one clique
// that respect background knowledge: the states of orderCount's dynamic
// programme, Π (m_c + 1) over the classes of interchangeable constrained
// nodes (2^k for k constrained nodes that are all different; far fewer for
// tiers, whose members are interchangeable).
const MaxOrderStates = 1 << 20

// ErrTooConstrained is returned when the orders of one clique that respect
// background knowledge would take more than MaxOrderStates states, or
// exceed 2^64 before the factorials of the classes, to count exactly.
var ErrTooConstrained = errors.New(
	"dag: background knowledge constrains too many nodes of one clique to count exactly")

// ClassSize returns the number of DAGs in the Markov equivalence class
// whose CPDAG is c: the product over the chain components of c of the
// number of acyclic moral orientations of each component (Andersson,
// Madigan & Perlman 1997; He, Jia & Yu 2015). Each component is counted by
// the clique-picking recursion of Wienöbst, Bannach & Liśkiewicz (2023),
// which takes polynomial time:
//
//	#O(G) = Σ_{cliques K of a clique tree of G} φ(K, FP(K)) · Π_{H ∈ C(G,K)} #O(H)
//
// where C(G,K) are the undirected components left once K is put first
// (every edge leaving K oriented away from it, then Meek's rules applied),
// FP(K) are the separators (intersections of neighbouring cliques) on the
// tree path from the root to K that lie inside K, and φ(S, R) counts the
// orders of S that begin with none of the sets in R: an order of K that
// begins with such a separator describes an orientation already counted at
// a clique nearer the root.
func ClassSize(c *PDAG) *big.Int {
	n, err := newCounter(c, nil).classSize()
	if err != nil {
		panic(err) // cannot happen without constraints
	}
	return n
}

// PlausibleSize returns the number of members of the class of the CPDAG c
// that contain every arc in required (background knowledge: fixed arrows,
// and arrows out of exogenous variables). A required arc that c orients the
// other way gives 0. Every required arc must join adjacent nodes of c.
//
// Members of a class are independent choices of an orientation per chain
// component, and each required arc lies in one component, so the count is
// the product over components of the orientations that respect the arcs inside
// them; these are counted by the same clique-picking recursion, keeping
// only the orders of each clique that respect the constraints.
func PlausibleSize(c *PDAG, required []Edge) (*big.Int, error) {
	req, ok, err := requiredLines(c, required)
	if err != nil || !ok {
		return new(big.Int), err
	}
	return newCounter(c, req).classSize()
}

// requiredLines keeps the required arcs that fall on lines of c; ok is
// false when c orients one of them the other way.
func requiredLines(c *PDAG, required []Edge) (map[Edge]bool, bool, error) {
	req := map[Edge]bool{}
	for _, e := range required {
		switch c.state(e.From, e.To) {
		case absent:
			return nil, false, fmt.Errorf("dag: required arc %d→%d joins non-adjacent nodes", e.From, e.To)
		case arcIn:
			return nil, false, nil
		case line:
			req[e] = true
		}
	}
	return req, true, nil
}

// ExogenousArcs returns the arcs x → v for every node v adjacent to x in g:
// what it means that nothing in the model causes x.
func ExogenousArcs(g *PDAG, x int) []Edge {
	var out []Edge
	for _, v := range g.adj[x] {
		out = append(out, Edge{x, v})
	}
	return out
}

type counter struct {
	g    *PDAG
	req  map[Edge]bool // required arcs on lines of g
	memo map[string]*big.Int
	pos  []int // global → local index scratch, -1 when unused
}

func newCounter(g *PDAG, req map[Edge]bool) *counter {
	pos := make([]int, g.N())
	for i := range pos {
		pos[i] = -1
	}
	return &counter{g: g, req: req, memo: map[string]*big.Int{}, pos: pos}
}

func (c *counter) classSize() (*big.Int, error) {
	total := big.NewInt(1)
	for _, comp := range ChainComponents(c.g) {
		k, err := c.count(comp)
		if err != nil {
			return nil, err
		}
		total.Mul(total, k)
	}
	return total, nil
}

func setKey(vs []int) string {
	b := make([]byte, 0, 2*len(vs))
	for _, v := range vs {
		b = binary.AppendUvarint(b, uint64(v))
	}
	return string(b)
}

// count returns the number of acyclic moral orientations of the undirected component on vs (a
// sorted node set, connected by lines of c.g) that respect c.req.
func (c *counter) count(vs []int) (*big.Int, error) {
	if len(vs) == 1 {
		return big.NewInt(1), nil
	}
	key := setKey(vs)
	if n, ok := c.memo[key]; ok {
		return n, nil
	}
	if c.clique(vs) { // one maximal clique, put first: φ(K, ∅), the orders of K that respect c.req
		n, err := c.linearExtensions(vs)
		if err == nil {
			c.memo[key] = n
		}
		return n, err
	}
	l := c.local(vs)
	cliques, parent := cliqueTree(l)
	sum := new(big.Int)
	for i, k := range cliques {
		term, err := c.cliqueTerm(vs, l, cliques, parent, i, k)
		if err != nil {
			return nil, err
		}
		sum.Add(sum, term)
	}
	c.memo[key] = sum
	return sum, nil
}

// cliqueTerm is φ(K, FP(K)) · Π #O(H) for clique number i of the tree.
func (c *counter) cliqueTerm(vs []int, l *PDAG, cliques [][]int, parent []int, i int, k []int) (*big.Int, error) {
	var fp [][]int
	for a := i; parent[a] >= 0; a = parent[a] {
		if s := intersectSorted(cliques[a], cliques[parent[a]]); subsetSorted(s, k) {
			fp = append(fp, s)
		}
	}
	kg := globalIDs(vs, k)
	phi, err := c.phi(kg, globalSets(vs, fp))
	if err != nil || phi.Sign() == 0 {
		return new(big.Int), err
	}
	comps, _, ok := c.split(vs, l, k)
	if !ok {
		return new(big.Int), nil
	}
	for _, h := range comps {
		n, err := c.count(h)
		if err != nil {
			return nil, err
		}
		phi.Mul(phi, n)
	}
	return phi, nil
}

// local builds the undirected graph induced by the lines of c.g on vs,
// with local indices 0..len(vs)-1. vs being sorted, the local neighbour
// lists come out sorted, so it is laid out directly, without New.
func (c *counter) local(vs []int) *PDAG {
	for i, v := range vs {
		c.pos[v] = i
	}
	l := &PDAG{adj: make([][]int, len(vs)), mark: make([][]int8, len(vs))}
	for i, v := range vs {
		for k, w := range c.g.adj[v] {
			if j := c.pos[w]; j >= 0 && c.g.mark[v][k] == line {
				l.adj[i] = append(l.adj[i], j)
			}
		}
		l.mark[i] = make([]int8, len(l.adj[i])) // all lines
	}
	for _, v := range vs {
		c.pos[v] = -1
	}
	l.at = lookupTables(l.adj)
	return l
}

// split puts the clique k (local indices) first in the component vs: it
// orients every edge leaving k away from it, closes under Meek's rules and
// returns the undirected components left, as sorted global node sets. ok
// is false when an arc this forces contradicts c.req. arcs are the arcs it
// made outside k, in global ids.
func (c *counter) split(vs []int, l *PDAG, k []int) (comps [][]int, arcs []Edge, ok bool) {
	w := l.Clone()
	inK := make([]bool, len(vs))
	for _, u := range k {
		inK[u] = true
	}
	var seeds [][2]int
	for _, u := range k {
		for _, v := range w.Siblings(u) {
			if inK[v] {
				if u < v {
					w.Orient(u, v) // any order inside k: the rest does not depend on it
				}
				continue
			}
			w.Orient(u, v)
			seeds = append(seeds, [2]int{u, v})
			arcs = append(arcs, Edge{vs[u], vs[v]})
			if c.req[Edge{vs[v], vs[u]}] {
				return nil, nil, false
			}
		}
	}
	if isComplete(l) { // no rule orients a line among nodes that are all adjacent
		if rest := len(vs) - len(k); rest >= 2 {
			comps = [][]int{restOf(vs, inK)}
		}
		return comps, arcs, true
	}
	var pending [][2]int
	for _, s := range seeds {
		for _, x := range w.Siblings(s[1]) {
			pending = append(pending, [2]int{s[1], x})
		}
	}
	for _, e := range w.closeUnderMeek(pending, false) {
		if c.req[Edge{vs[e.To], vs[e.From]}] {
			return nil, nil, false
		}
		arcs = append(arcs, Edge{vs[e.From], vs[e.To]})
	}
	for _, comp := range ChainComponents(w) {
		comps = append(comps, globalIDs(vs, comp))
	}
	return comps, arcs, true
}

func globalIDs(vs, local []int) []int {
	out := make([]int, len(local))
	for i, u := range local {
		out[i] = vs[u]
	}
	sortInts(out)
	return out
}

func globalSets(vs []int, sets [][]int) [][]int {
	out := make([][]int, len(sets))
	for i, s := range sets {
		out[i] = globalIDs(vs, s)
	}
	return out
}

func distinctBySize(r [][]int) [][]int {
	sort.SliceStable(r, func(i, j int) bool { return len(r[i]) < len(r[j]) })
	var out [][]int
	seen := map[string]bool{}
	for _, s := range r {
		if k := setKey(s); !seen[k] {
			seen[k] = true
			out = append(out, s)
		}
	}
	return out
}

func sortInts(a []int) { sort.Ints(a) }
