package mediation

import (
	"errors"
	"fmt"
	"slices"

	"gonum.org/v1/gonum/mat"
)

// Model is a linear recursive model over nodes 0..n−1: each node is a
// linear function of its parents plus an error, the errors of different
// equations independent,
//
//	v_j = Σ_{i ∈ Parents[j]} B[i,j]·v_i + α_j + e_j.
type Model struct {
	// B[i,j] is the coefficient of i in j's equation (the arc i → j), zero
	// where there is no arc.
	B *mat.Dense
	// Parents[j] lists the arcs into j: the free coefficients of j's
	// equation, in the order of Cov[j].
	Parents [][]int
	// Cov[j] is the covariance matrix of j's coefficients B[Parents[j][k], j];
	// nil for a node without parents, and may be nil throughout when no
	// standard error or Monte Carlo interval is wanted. Coefficients of
	// different equations are independent in a recursive model (the
	// likelihood factors into one term per equation), so the blocks make up
	// the whole covariance. Which estimate of the error variance it rests on
	// is the caller's (FitModel's Divisor).
	Cov []*mat.SymDense
}

// Path names an effect: of From on To through every node of Through (the
// mediators, in any order); Through empty means the total indirect effect,
// the total effect minus the direct one.
type Path struct {
	From, To int
	Through  []int
}

// ErrNotRecursive is returned for parents that form a directed cycle.
var ErrNotRecursive = errors.New("mediation: the parents form a directed cycle")

// topoOrder returns the nodes ordered so that every parent comes before
// its children (Kahn 1962), or ErrNotRecursive. It also checks the indices.
func topoOrder(parents [][]int) ([]int, error) {
	n := len(parents)
	indeg := make([]int, n)
	children := make([][]int, n)
	for j, pa := range parents {
		for k, i := range pa {
			if i < 0 || i >= n || i == j || slices.Contains(pa[:k], i) {
				return nil, fmt.Errorf("mediation: node %d: bad parent %d", j, i)
			}
			indeg[j]++
			children[i] = append(children[i], j)
		}
	}
	var order []int
	for v := range n {
		if indeg[v] == 0 {
			order = append(order, v)
		}
	}
	for k := 0; k < len(order); k++ {
		for _, c := range children[order[k]] {
			if indeg[c]--; indeg[c] == 0 {
				order = append(order, c)
			}
		}
	}
	if len(order) < n {
		return nil, ErrNotRecursive
	}
	return order, nil
}

// Validate checks the model's shapes: B is n × n with n = len(Parents),
// the parents are acyclic, B is zero off the arcs, and each Cov block (if
// any) matches its equation.
func (m *Model) Validate() error {
	n := len(m.Parents)
	if r, c := m.B.Dims(); r != n || c != n {
		return fmt.Errorf("mediation: B is %d × %d for %d nodes", r, c, n)
	}
	if _, err := topoOrder(m.Parents); err != nil {
		return err
	}
	for j, pa := range m.Parents {
		for i := range n {
			if m.B.At(i, j) != 0 && !slices.Contains(pa, i) {
				return fmt.Errorf("mediation: B[%d,%d] = %g but %d is not a parent of %d", i, j, m.B.At(i, j), i, j)
			}
		}
		if m.Cov == nil {
			continue
		}
		if len(m.Cov) != n {
			return fmt.Errorf("mediation: %d covariance blocks for %d nodes", len(m.Cov), n)
		}
		if k := len(pa); k > 0 && (m.Cov[j] == nil || m.Cov[j].SymmetricDim() != k) {
			return fmt.Errorf("mediation: node %d: covariance block does not match its %d coefficients", j, k)
		}
	}
	return nil
}

// chain is a path's structure in one graph: the nodes the effect runs
// through in graph order (From, the mediators, To), and whether a directed
// path passes through them all.
type chain struct {
	nodes     []int
	connected bool
	order     []int // a topological order of the whole graph
}

// newChain orders p's mediators along the graph. A directed path through
// every mediator visits them in an order every topological order agrees
// with, so sorting them by one such order gives the only candidate chain.
func newChain(parents [][]int, p Path) (*chain, error) {
	n := len(parents)
	order, err := topoOrder(parents)
	if err != nil {
		return nil, err
	}
	seen := map[int]bool{}
	for _, v := range append([]int{p.From, p.To}, p.Through...) {
		if v < 0 || v >= n || seen[v] {
			return nil, fmt.Errorf("mediation: path %d → %d through %v: node %d repeated or out of range",
				p.From, p.To, p.Through, v)
		}
		seen[v] = true
	}
	pos := make([]int, n)
	for k, v := range order {
		pos[v] = k
	}
	mids := slices.Clone(p.Through)
	slices.SortFunc(mids, func(a, b int) int { return pos[a] - pos[b] })
	c := &chain{nodes: append(append([]int{p.From}, mids...), p.To), connected: true, order: order}
	reach := reachability(parents, order)
	for s := 0; s+1 < len(c.nodes); s++ {
		c.connected = c.connected && reach[c.nodes[s]][c.nodes[s+1]]
	}
	if len(mids) == 0 { // the total indirect effect needs a path of two arcs or more
		c.connected = hasLongPath(parents, reach, p.From, p.To)
	}
	return c, nil
}

// reachability returns reach[u][v]: a directed path leads from u to v
// (u ≠ v).
func reachability(parents [][]int, order []int) [][]bool {
	n := len(parents)
	reach := make([][]bool, n)
	for i := range reach {
		reach[i] = make([]bool, n)
	}
	for _, v := range order { // every parent's ancestors are known before v
		for _, i := range parents[v] {
			reach[i][v] = true
			for u := range n {
				reach[u][v] = reach[u][v] || reach[u][i]
			}
		}
	}
	return reach
}

// hasLongPath reports whether a directed path of two arcs or more leads
// from x to y: some parent of y other than x is reachable from x.
func hasLongPath(parents [][]int, reach [][]bool, x, y int) bool {
	return slices.ContainsFunc(parents[y], func(i int) bool { return i != x && reach[x][i] })
}

// HasPath reports whether the graph given by parents has a directed path
// from p.From to p.To through every mediator (for Through empty: a path
// of two arcs or more, so that an indirect effect exists). Where it has
// none, the effect is zero in that graph.
func HasPath(parents [][]int, p Path) (bool, error) {
	c, err := newChain(parents, p)
	if err != nil {
		return false, err
	}
	return c.connected, nil
}

// TotalEffects returns the total-effect matrix of B,
//
//	T = (I − B)⁻¹ = I + B + B² + …,
//
// whose entry T[u,v] is the sum over the directed paths from u to v of the
// products of their coefficients (the series ends since B is nilpotent in
// a recursive model; Wright 1934, Bollen 1987).
func TotalEffects(b *mat.Dense) (*mat.Dense, error) {
	n, _ := b.Dims()
	a := mat.NewDense(n, n, nil)
	for i := range n {
		a.Set(i, i, 1)
	}
	a.Sub(a, b)
	var t mat.Dense
	if err := t.Inverse(a); err != nil {
		return nil, fmt.Errorf("mediation: I − B: %w", err)
	}
	return &t, nil
}

// ImpliedCov returns the covariance matrix of the nodes that the model
// implies when psi is the covariance matrix of the errors e (for an
// exogenous node, its own variance, and covariances among exogenous
// nodes): with the nodes as a row vector v = vB + e,
//
//	Σ = Tᵀ Ψ T,  T = (I − B)⁻¹.
func ImpliedCov(b *mat.Dense, psi mat.Symmetric) (*mat.SymDense, error) {
	t, err := TotalEffects(b)
	if err != nil {
		return nil, err
	}
	n, _ := b.Dims()
	var pt mat.Dense
	pt.Mul(psi, t)
	var s mat.Dense
	s.Mul(t.T(), &pt)
	out := mat.NewSymDense(n, nil)
	for i := range n {
		for j := i; j < n; j++ {
			out.SetSym(i, j, (s.At(i, j)+s.At(j, i))/2)
		}
	}
	return out, nil
}
