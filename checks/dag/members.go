package dag

import (
	"errors"
	"sort"
)

// Members lists the DAGs of the class of the CPDAG c that contain every
// required arc, at most max of them, and reports whether there were more.
// The order is fixed: chain components in order of their smallest node,
// and within a component the source of the orientation in increasing node
// order, then recursively the components that choice leaves (the
// root-picking decomposition of He, Jia & Yu 2015: every acyclic moral orientation of a
// connected chordal graph has exactly one source). Branches that lead to
// no member are cut by the exact count, so the work grows with the output.
func Members(c *PDAG, required []Edge, max int) (members []*PDAG, truncated bool, err error) {
	req, ok, err := requiredLines(c, required)
	if err != nil || !ok {
		return nil, false, err
	}
	e := &enumerator{counter: newCounter(c, req), max: max}
	_, err = e.walk(c.Clone(), ChainComponents(c))
	return e.out, e.truncated, err
}

type enumerator struct {
	*counter
	max       int
	out       []*PDAG
	truncated bool
}

// walk orients the components in pending one after another; it returns
// false once the cap is reached.
func (e *enumerator) walk(g *PDAG, pending [][]int) (bool, error) {
	if len(pending) == 0 {
		if len(e.out) == e.max {
			e.truncated = true
			return false, nil
		}
		e.out = append(e.out, g)
		return true, nil
	}
	vs, rest := pending[0], pending[1:]
	l := e.local(vs)
	for v := range vs {
		comps, arcs, ok := e.split(vs, l, []int{v})
		if !ok {
			continue
		}
		if live, err := e.allCountable(comps); err != nil || !live {
			if err != nil {
				return false, err
			}
			continue
		}
		h := g.Clone()
		for _, a := range arcs {
			h.Orient(a.From, a.To)
		}
		next := append(append([][]int(nil), rest...), comps...)
		if more, err := e.walk(h, next); !more || err != nil {
			return false, err
		}
	}
	return true, nil
}

func (e *enumerator) allCountable(comps [][]int) (bool, error) {
	for _, h := range comps {
		n, err := e.count(h)
		if err != nil || n.Sign() == 0 {
			return false, err
		}
	}
	return true, nil
}

// MaxParentSets bounds the locally valid parent sets that
// LocalParentSets lists for one node.
const MaxParentSets = 4096

// ErrTooManyParentSets is returned when a node has more than
// MaxParentSets locally valid parent sets.
var ErrTooManyParentSets = errors.New("dag: too many locally valid parent sets to list")

// LocalParentSets returns the parent sets that x can have across the
// class of the CPDAG c, by the local criterion of IDA (Maathuis, Kalisch &
// Bühlmann 2009): the arcs into x plus any subset S of x's undirected
// neighbours that is a clique, since only then does orienting S → x create
// no new v-structure at x. The cliques are grown one neighbour at a time,
// so the work follows the number of sets, not 2^(neighbours); they are
// counted first, without being built, so that a node with more than
// MaxParentSets (ErrTooManyParentSets) costs at most that many steps. Each
// set is sorted; the sets come in lexicographic order of the neighbours
// chosen.
func LocalParentSets(c *PDAG, x int) ([][]int, error) {
	pa, sib := c.Parents(x), c.Siblings(x)
	if tooManyCliques(c, sib) {
		return nil, ErrTooManyParentSets
	}
	var out [][]int
	var slab []int // the sets are cut from shared blocks: one allocation per block, not per set
	var grow func(start int, chosen []int)
	grow = func(start int, chosen []int) {
		n := len(pa) + len(chosen)
		if len(slab) < n {
			slab = make([]int, max(n, 1<<14))
		}
		set := append(append(slab[:0:n], pa...), chosen...)
		slab = slab[n:]
		sortInts(set)
		out = append(out, set)
		for i := start; i < len(sib); i++ {
			if adjacentToAll(c, sib[i], chosen) {
				grow(i+1, append(chosen, sib[i]))
			}
		}
	}
	grow(0, nil)
	return out, nil
}

// tooManyCliques reports whether the neighbours sib have more than
// MaxParentSets cliques (the empty one included). A clique of m of them
// found greedily has 2^m subsets, all cliques, which settles a dense
// neighbourhood at once; otherwise they are counted up to the cap.
func tooManyCliques(c *PDAG, sib []int) bool {
	var greedy []int
	for _, v := range sib {
		if adjacentToAll(c, v, greedy) {
			if greedy = append(greedy, v); 1<<len(greedy) > MaxParentSets {
				return true
			}
		}
	}
	return countCliques(c, sib, 0, nil, MaxParentSets+1) > MaxParentSets
}

// countCliques counts the cliques of sib[start:] that extend chosen (the
// empty one included), stopping once the count reaches limit.
func countCliques(c *PDAG, sib []int, start int, chosen []int, limit int) int {
	n := 1
	for i := start; i < len(sib) && n < limit; i++ {
		if adjacentToAll(c, sib[i], chosen) {
			n += countCliques(c, sib, i+1, append(chosen, sib[i]), limit-n)
		}
	}
	return n
}

func adjacentToAll(c *PDAG, v int, set []int) bool {
	for _, u := range set {
		if !c.Adjacent(u, v) {
			return false
		}
	}
	return true
}

// PlausibleParentSets returns the parent sets that x has across the
// members of the class of the CPDAG c that contain every required arc
// (background knowledge: exogenous variables, fixed edges, TierArcs). The
// local criterion alone is not enough once knowledge has oriented arcs
// (Perković, Kalisch & Maathuis 2017), so each locally valid set S is
// kept only when some such member gives x exactly the parents S: when the
// required arcs, plus s → x for s in S and x → v for x's other undirected
// neighbours v, leave a positive PlausibleSize. The sets come in the order
// of LocalParentSets.
func PlausibleParentSets(c *PDAG, required []Edge, x int) ([][]int, error) {
	sets, err := LocalParentSets(c, x)
	if err != nil {
		return nil, err
	}
	var out [][]int
	for _, set := range sets {
		req := append([]Edge(nil), required...)
		for _, v := range c.Siblings(x) {
			if containsSorted(set, v) {
				req = append(req, Edge{v, x})
			} else {
				req = append(req, Edge{x, v})
			}
		}
		n, err := PlausibleSize(c, req)
		if err != nil {
			return nil, err
		}
		if n.Sign() > 0 {
			out = append(out, set)
		}
	}
	return out, nil
}

func containsSorted(a []int, v int) bool {
	k := sort.SearchInts(a, v)
	return k < len(a) && a[k] == v
}
