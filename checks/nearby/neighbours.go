package nearby

import (
	"cmp"
	"context"
	"fmt"
	"math"
	"slices"
	"strings"
)

// Class is one Markov equivalence class of one-edit neighbours.
type Class struct {
	// Edits are the edits of the declared graph that lead into the class,
	// in enumeration order; the first is its representative.
	Edits []Edit
	// DeltaBIC is the class's BIC minus the declared graph's (negative:
	// the neighbour fits better).
	DeltaBIC float64
}

// Neighbourhood is every DAG one edit from the declared graph.
type Neighbourhood struct {
	// DAGs counts the acyclic neighbours that respect the knowledge.
	DAGs int
	// Equivalent counts those in the declared graph's own class (a covered
	// arrow reversed); they are not among Classes.
	Equivalent int
	// Classes are the other classes, best (lowest ΔBIC) first.
	Classes []Class
}

// candidate is one neighbour before grouping.
type candidate struct {
	e     Edit
	delta float64
	order int  // place in enumeration order
	self  bool // the declared graph itself, a sentinel for its class
}

// Neighbours scores every DAG one edit from the DAG given by parents
// (indices into m.S) and groups them by equivalence class. It watches ctx.
func Neighbours(ctx context.Context, m Model, parents [][]int, k Knowledge) (*Neighbourhood, error) {
	g, r, kn, err := setUp(m, parents, k)
	if err != nil {
		return nil, err
	}
	cands := make([]candidate, 1, 1+g.n*g.n) // at most one edit per ordered pair, two per arrow
	cands[0].self = true
	err = eachEdit(ctx, m, g, kn, func(e Edit) {
		cands = append(cands, candidate{e: e, delta: r.delta(e), order: len(cands)})
	})
	if err != nil {
		return nil, err
	}
	for _, c := range cands {
		if math.IsNaN(c.delta) {
			return nil, fmt.Errorf("nearby: the ΔBIC of %s %d→%d is not a number", c.e.Op, c.e.From, c.e.To)
		}
	}
	nb := &Neighbourhood{DAGs: len(cands) - 1, Classes: make([]Class, 0, len(cands))}
	adds := newBitset(g.n * g.n)
	slices.SortFunc(cands, func(a, b candidate) int {
		return cmp.Or(cmp.Compare(a.delta, b.delta), cmp.Compare(a.order, b.order))
	})
	for i := 0; i < len(cands); {
		j := i + 1
		for j < len(cands) && tied(cands[j-1].delta, cands[j].delta) {
			j++
		}
		slices.SortFunc(cands[i:j], func(a, b candidate) int { return cmp.Compare(a.order, b.order) })
		nb.group(g, cands[i:j], adds)
		i = j
		if err := ctx.Err(); err != nil {
			return nil, err
		}
	}
	return nb, nil
}

// parentListCount reports parent lists that do not match the matrix.
const parentListCount = "nearby: %d parent lists for a matrix of %d variables"

func setUp(m Model, parents [][]int, k Knowledge) (*graph, *rows, *knowledge, error) {
	if m.S == nil || len(parents) != m.S.SymmetricDim() {
		return nil, nil, nil, fmt.Errorf(parentListCount, len(parents), dim(m))
	}
	g, err := newGraph(parents)
	if err != nil {
		return nil, nil, nil, err
	}
	r, err := newRows(m, g)
	if err != nil {
		return nil, nil, nil, err
	}
	return g, r, newKnowledge(g.n, k), nil
}

func dim(m Model) int {
	if m.S == nil {
		return 0
	}
	return m.S.SymmetricDim()
}

// tied: equivalent DAGs have equal BIC; their ΔBICs, computed by different
// regressions, agree to rounding.
func tied(a, b float64) bool { return math.Abs(a-b) <= 1e-7+1e-9*math.Abs(b) }

// group splits candidates of equal ΔBIC into classes by their exact key.
// A removal is alone in its class (only a reversal shares its pair, and
// keeps the skeleton), and so is an addition unless the opposite addition
// is among the candidates; only those and reversals need a key. adds is
// scratch space of n² bits, left clear.
func (nb *Neighbourhood) group(g *graph, cs []candidate, adds bitset) {
	for _, c := range cs {
		if c.e.Op == Add && !c.self {
			adds.set(c.e.From*g.n + c.e.To)
		}
	}
	self := reversalKey(nil, nil)
	index := map[string]int{}
	for _, c := range cs {
		alone := c.e.Op == Remove || c.e.Op == Add && !adds.has(c.e.To*g.n+c.e.From)
		switch {
		case c.self:
			continue
		case alone:
			nb.Classes = append(nb.Classes, Class{Edits: []Edit{c.e}, DeltaBIC: c.delta})
			continue
		}
		key := classKey(g, c.e)
		if i, ok := index[key]; ok {
			nb.Classes[i].Edits = append(nb.Classes[i].Edits, c.e)
		} else if key == self {
			nb.Equivalent++
		} else {
			index[key] = len(nb.Classes)
			nb.Classes = append(nb.Classes, Class{Edits: []Edit{c.e}, DeltaBIC: c.delta})
		}
	}
	for _, c := range cs {
		if c.e.Op == Add && !c.self {
			adds.clear(c.e.From*g.n + c.e.To)
		}
	}
}

// classKey names the class of the neighbour g+e among g's neighbours: the
// pair whose adjacency it changes, and the v-structures it destroys and
// creates (all of which involve the edited pair).
func classKey(g *graph, e Edit) string {
	before := vstructures(g, e.From, e.To)
	g.apply(e)
	after := vstructures(g, e.From, e.To)
	g.undo(e)
	gone := difference(before, after)
	made := difference(after, before)
	a, b := min(e.From, e.To), max(e.From, e.To)
	switch e.Op {
	case Add:
		return fmt.Sprintf("+%d,%d|%s", a, b, vsKey(gone, made))
	case Remove:
		return fmt.Sprintf("-%d,%d|%s", a, b, vsKey(gone, made))
	}
	return reversalKey(gone, made)
}

func reversalKey(gone, made [][3]int) string { return "~|" + vsKey(gone, made) }

func vsKey(gone, made [][3]int) string {
	var b strings.Builder
	for _, v := range gone {
		fmt.Fprintf(&b, "%d>%d<%d,", v[0], v[1], v[2])
	}
	b.WriteString("|")
	for _, v := range made {
		fmt.Fprintf(&b, "%d>%d<%d,", v[0], v[1], v[2])
	}
	return b.String()
}

// vstructures lists g's v-structures x → m ← y (x < y, x and y not
// adjacent) in which the pair {a, b} is an arrow or the non-adjacent pair.
func vstructures(g *graph, a, b int) [][3]int {
	var out [][3]int
	atCollider := func(m, x int) {
		for _, y := range g.pa[m] {
			if y != x && !g.adjacent(x, y) {
				out = append(out, [3]int{min(x, y), m, max(x, y)})
			}
		}
	}
	switch {
	case g.isPa[b].has(a):
		atCollider(b, a)
	case g.isPa[a].has(b):
		atCollider(a, b)
	default:
		for _, m := range g.ch[a] {
			if g.isPa[m].has(b) {
				out = append(out, [3]int{min(a, b), m, max(a, b)})
			}
		}
	}
	slices.SortFunc(out, func(p, q [3]int) int { return slices.Compare(p[:], q[:]) })
	return slices.Compact(out)
}

func difference(a, b [][3]int) [][3]int {
	var out [][3]int
	for _, v := range a {
		if !slices.Contains(b, v) {
			out = append(out, v)
		}
	}
	return out
}
