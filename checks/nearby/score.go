package nearby

import (
	"errors"
	"math"
	"slices"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/lapack/lapack64"
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
	s        []float64 // m.S in full, row-major, read in the updates' inner loops
	lnN, n1  float64
	add, rem [][]float64
	scratch  whitened // reused by every update
}

func newRows(m Model, g *graph) (*rows, error) {
	p := m.S.SymmetricDim()
	r := &rows{m: m, s: make([]float64, p*p), lnN: math.Log(float64(m.N)), n1: float64(m.N - 1)}
	for i := range p {
		for j := range p {
			r.s[i*p+j] = m.S.At(i, j)
		}
	}
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

// update recomputes node v's row for the parents pa, from one Cholesky
// factorization S_pa,pa = L Lᵀ and Z = L⁻¹ S_pa,u for the nodes u outside
// pa (their covariances with pa, whitened; v among them). The covariance
// of a and u given pa is
//
//	s_au − s_a,pa S_pa,pa⁻¹ S_pa,u = s_au − Z_·aᵀ Z_·u
//
// and the squared partial correlation of v and a parent u given the other
// parents, from the regression b = S_pa,pa⁻¹ s_pa,v = L⁻ᵀ Z_·v with
// residual variance σ² = s_vv − Z_·vᵀ Z_·v (P being the inverse of S over
// {v} ∪ pa, by the block inverse),
//
//	r² = P_vu² / (P_vv P_uu) = b_u² / (b_u² + σ² (S_pa,pa⁻¹)_uu)
func (r *rows) update(v int, pa []int) error {
	fill(r.add[v], math.NaN())
	fill(r.rem[v], math.NaN())
	w, err := r.scratch.whiten(r.s, len(r.add), pa)
	if err != nil {
		return err
	}
	if err := r.additions(v, pa, w); err != nil {
		return err
	}
	return r.removals(v, pa, w)
}

// whitened is S_pa,pa = L Lᵀ (L lower triangular, k × k, row-major) and
// Z = L⁻¹ S_pa,cols (k × len(cols), cols the nodes outside pa, at[u] the
// column of node u, −1 for a parent); L and Z are empty for no parents.
type whitened struct {
	k    int
	l, z []float64
	cols []int
	at   []int
}

// whiten factors S_pa,pa into w's buffers (grown as needed) without
// estimating its condition number: a factorization that fails, or a
// variance it leaves at zero or below (in additions and removals), is
// ErrNotPositiveDefinite.
func (w *whitened) whiten(s []float64, p int, pa []int) (*whitened, error) {
	k := len(pa)
	w.k, w.cols = k, w.cols[:0]
	w.at = slices.Grow(w.at[:0], p)[:p]
	for u := range w.at {
		w.at[u] = 0
	}
	for _, u := range pa {
		w.at[u] = -1
	}
	for u := range p {
		if w.at[u] == 0 {
			w.at[u] = len(w.cols)
			w.cols = append(w.cols, u)
		}
	}
	m := len(w.cols)
	w.l, w.z = grow(w.l, k*k), grow(w.z, k*m)
	if k == 0 {
		return w, nil
	}
	for i, a := range pa {
		for j, b := range pa[:i+1] {
			w.l[i*k+j] = s[a*p+b]
		}
		for c, u := range w.cols {
			w.z[i*m+c] = s[a*p+u]
		}
	}
	l := blas64.Triangular{Uplo: blas.Lower, Diag: blas.NonUnit, N: k, Stride: k, Data: w.l}
	if _, ok := lapack64.Potrf(blas64.Symmetric{Uplo: blas.Lower, N: k, Stride: k, Data: w.l}); !ok {
		return nil, ErrNotPositiveDefinite
	}
	blas64.Trsm(blas.Left, blas.NoTrans, 1, l, blas64.General{Rows: k, Cols: m, Stride: m, Data: w.z})
	return w, nil
}

// grow returns buf resized to n, zeroed.
func grow(buf []float64, n int) []float64 {
	if cap(buf) < n {
		return make([]float64, n)
	}
	buf = buf[:n]
	clear(buf)
	return buf
}

// col is Z_·aᵀ Z_·u, for nodes a and u outside pa.
func (w *whitened) col(a, u int) float64 {
	m, ca, cu := len(w.cols), w.at[a], w.at[u]
	c := 0.0
	for j := range w.k {
		c += w.z[j*m+ca] * w.z[j*m+cu]
	}
	return c
}

// additions fills r.add[v] with the ΔBIC of adding each allowed u → v to
// the parents pa, from the partial correlation of v and u given pa.
func (r *rows) additions(v int, pa []int, w *whitened) error {
	s, p := r.s, len(r.add)
	cvv := s[v*p+v] - w.col(v, v)
	for u := range p {
		if u == v || !r.m.in(u) || isIn(pa, u) {
			continue
		}
		cvu, cuu := s[v*p+u]-w.col(v, u), s[u*p+u]-w.col(u, u)
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

func (r *rows) removals(v int, pa []int, w *whitened) error {
	k := len(pa)
	if k == 0 {
		return nil
	}
	sigma2 := r.s[v*len(r.add)+v] - w.col(v, v)
	if !(sigma2 > 0) {
		return ErrNotPositiveDefinite
	}
	b := make([]float64, k) // L⁻ᵀ Z_·v
	for j := range k {
		b[j] = w.z[j*len(w.cols)+w.at[v]]
	}
	l := blas64.Triangular{Uplo: blas.Lower, Diag: blas.NonUnit, N: k, Stride: k, Data: w.l}
	blas64.Trsv(blas.Trans, l, blas64.Vector{N: k, Inc: 1, Data: b})
	if !lapack64.Trtri(l) { // L⁻¹ in place; (S_pa,pa⁻¹)_uu is the squared norm of its column u
		return ErrNotPositiveDefinite
	}
	for j, u := range pa {
		inv := 0.0
		for i := j; i < k; i++ {
			inv += w.l[i*k+j] * w.l[i*k+j]
		}
		r2 := b[j] * b[j] / (b[j]*b[j] + sigma2*inv)
		if !(r2 < 1) {
			return ErrNotPositiveDefinite
		}
		r.rem[v][u] = -r.n1*math.Log1p(-r2) - r.lnN
	}
	return nil
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
