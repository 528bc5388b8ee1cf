package nearby

import (
	"errors"
	"math"

	"gonum.org/v1/gonum/mat"
)

// ErrNotPositiveDefinite is returned when a node's parents (with the node)
// have a singular covariance matrix, so a ΔBIC cannot be computed.
var ErrNotPositiveDefinite = errors.New("nearby: a covariance submatrix is not positive definite")

// Model is what the graphs are scored on: the covariance or correlation
// matrix S of N cases, and the nodes of the graph (In; nil means every
// node). Arrows are only ever added between nodes of the graph.
type Model struct {
	S  mat.Symmetric
	N  int
	In []bool
}

func (m Model) in(v int) bool { return m.In == nil || m.In[v] }

// rows holds, for every node v, the ΔBIC of adding each u to its parents
// (add[v][u]) and of removing each parent u (rem[v][u]); NaN elsewhere.
type rows struct {
	m        Model
	lnN, n1  float64
	add, rem [][]float64
}

func newRows(m Model, g *graph) (*rows, error) {
	p := m.S.SymmetricDim()
	r := &rows{m: m, lnN: math.Log(float64(m.N)), n1: float64(m.N - 1)}
	r.add, r.rem = make([][]float64, p), make([][]float64, p)
	for v := range p {
		r.add[v], r.rem[v] = make([]float64, p), make([]float64, p)
		if !m.in(v) {
			fill(r.add[v], math.NaN())
			fill(r.rem[v], math.NaN())
			continue
		}
		if err := r.update(v, g.pa[v]); err != nil {
			return nil, err
		}
	}
	return r, nil
}

func fill(s []float64, x float64) {
	for i := range s {
		s[i] = x
	}
}

// update recomputes node v's row for the parents pa. With W = S_pa,pa⁻¹
// S_pa,·, the covariance of v and u given pa is s_vu − s_v,pa W_·u; the
// partial correlation of v and a parent u given the other parents is
// −P_vu / sqrt(P_vv P_uu), P the inverse of S over {v} ∪ pa.
func (r *rows) update(v int, pa []int) error {
	fill(r.add[v], math.NaN())
	fill(r.rem[v], math.NaN())
	if err := r.additions(v, pa); err != nil {
		return err
	}
	return r.removals(v, pa)
}

// onParents returns W = S_pa,pa⁻¹ S_pa,· , the coefficients of every
// variable regressed on pa (one row per parent; a zero row for no parents).
func onParents(s mat.Symmetric, pa []int) (*mat.Dense, error) {
	p := s.SymmetricDim()
	w := mat.NewDense(max(len(pa), 1), p, nil)
	if len(pa) == 0 {
		return w, nil
	}
	var ch mat.Cholesky
	if !ch.Factorize(sub(s, pa)) {
		return nil, ErrNotPositiveDefinite
	}
	b := mat.NewDense(len(pa), p, nil)
	for j, u := range pa {
		for k := range p {
			b.Set(j, k, s.At(u, k))
		}
	}
	if err := ch.SolveTo(w, b); err != nil {
		return nil, ErrNotPositiveDefinite
	}
	return w, nil
}

// additions fills r.add[v] with the ΔBIC of adding each allowed u → v to
// the parents pa, from the partial correlation of v and u given pa.
func (r *rows) additions(v int, pa []int) error {
	s, p := r.m.S, r.m.S.SymmetricDim()
	w, err := onParents(s, pa)
	if err != nil {
		return err
	}
	given := func(a, u int) float64 { // covariance of a and u given pa
		c := s.At(a, u)
		for j, q := range pa {
			c -= s.At(a, q) * w.At(j, u)
		}
		return c
	}
	cvv := given(v, v)
	for u := range p {
		if u == v || !r.m.in(u) || isIn(pa, u) {
			continue
		}
		cvu, cuu := given(v, u), given(u, u)
		if !(cvv > 0 && cuu > 0) {
			return ErrNotPositiveDefinite
		}
		r2 := cvu * cvu / (cvv * cuu)
		if !(r2 < 1) {
			return ErrNotPositiveDefinite
		}
		r.add[v][u] = r.n1*math.Log1p(-r2) + r.lnN
	}
	return nil
}

func (r *rows) removals(v int, pa []int) error {
	if len(pa) == 0 {
		return nil
	}
	idx := append([]int{v}, pa...)
	var ch mat.Cholesky
	if !ch.Factorize(sub(r.m.S, idx)) {
		return ErrNotPositiveDefinite
	}
	var inv mat.SymDense
	if err := ch.InverseTo(&inv); err != nil {
		return ErrNotPositiveDefinite
	}
	for j, u := range pa {
		pvu := inv.At(0, j+1)
		r2 := pvu * pvu / (inv.At(0, 0) * inv.At(j+1, j+1))
		if !(r2 < 1) {
			return ErrNotPositiveDefinite
		}
		r.rem[v][u] = -r.n1*math.Log1p(-r2) - r.lnN
	}
	return nil
}

func sub(s mat.Symmetric, idx []int) *mat.SymDense {
	out := mat.NewSymDense(len(idx), nil)
	for i, a := range idx {
		for j, b := range idx[:i+1] {
			out.SetSym(i, j, s.At(a, b))
		}
	}
	return out
}

func isIn(s []int, x int) bool {
	for _, y := range s {
		if y == x {
			return true
		}
	}
	return false
}

// delta is the ΔBIC of an edit of g.
func (r *rows) delta(e Edit) float64 {
	switch e.Op {
	case Add:
		return r.add[e.To][e.From]
	case Remove:
		return r.rem[e.To][e.From]
	}
	return r.rem[e.To][e.From] + r.add[e.From][e.To]
}

// Evidence names the band of Raftery (1995, Table 6) that |ΔBIC| falls
// in: below 2 the data do not tell the two graphs apart ("weak", not worth
// more than a bare mention), 2–6 positive, 6–10 strong, above 10 very
// strong. (The bands are recalled from Raftery's table, which takes them
// from Jeffreys' scale on the 2 ln B scale of Kass & Raftery 1995.)
func Evidence(delta float64) string {
	switch d := math.Abs(delta); {
	case math.IsNaN(d):
		return ""
	case d < 2:
		return "indistinguishable"
	case d < 6:
		return "positive"
	case d <= 10:
		return "strong"
	}
	return "very_strong"
}
