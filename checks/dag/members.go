package dag

import (
	"errors"
	"math/bits"
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

// MaxSiblings bounds the undirected neighbours of one node for which
// LocalParentSets lists subsets.
const MaxSiblings = 24

// ErrTooManySiblings is returned when a node has more than MaxSiblings
// undirected neighbours.
var ErrTooManySiblings = errors.New("dag: too many undirected neighbours to list parent sets")

// LocalParentSets returns the parent sets that x can have across the
// class of the CPDAG c, by the local criterion of IDA (Maathuis, Kalisch &
// Bühlmann 2009): the arcs into x plus any subset S of x's undirected
// neighbours that is a clique, since only then does orienting S → x create
// no new v-structure at x. Each set is sorted; the sets come in order of
// the subsets' bit masks over the sorted neighbours.
func LocalParentSets(c *PDAG, x int) ([][]int, error) {
	pa, sib := c.Parents(x), c.Siblings(x)
	if len(sib) > MaxSiblings {
		return nil, ErrTooManySiblings
	}
	var out [][]int
	for mask := uint32(0); mask < 1<<len(sib); mask++ {
		if !cliqueMask(c, sib, mask) {
			continue
		}
		set := make([]int, 0, len(pa)+bits.OnesCount32(mask))
		set = append(set, pa...)
		for i, s := range sib {
			if mask&(1<<i) != 0 {
				set = append(set, s)
			}
		}
		sortInts(set)
		out = append(out, set)
	}
	return out, nil
}

func cliqueMask(c *PDAG, nodes []int, mask uint32) bool {
	for i := range nodes {
		for j := i + 1; j < len(nodes); j++ {
			if mask&(1<<i) != 0 && mask&(1<<j) != 0 && !c.Adjacent(nodes[i], nodes[j]) {
				return false
			}
		}
	}
	return true
}
