package linmod

import (
	"errors"
	"math"
	"slices"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/lapack/lapack64"
	"gonum.org/v1/gonum/mat"
)

// Bordered fits, from one covariance (or correlation) matrix of n cases,
// the regressions of y on base ∪ S for many small sets S drawn from
// extra, as FromMoments would fit each one, but sharing the work on base:
// on the correlation scale of the predictors, with R_BB = L Lᵀ,
//
//	Z = L⁻¹ R_BE,  z = L⁻¹ r_By,  G = R_EE − ZᵀZ,  g = r_Ey − Zᵀz
//
// once; then for each S (block elimination of the normal equations, G_SS
// the predictors S given base)
//
//	b_S = G_SS⁻¹ g_S,  bᵀr = zᵀz + g_Sᵀ b_S
//	b_j = q_jᵀz − (Z_Sᵀq_j)ᵀ b_S,  (R⁻¹)_jj = q_jᵀq_j + (Z_Sᵀq_j)ᵀ G_SS⁻¹ (Z_Sᵀq_j),  q_j = L⁻¹e_j  (j in base)
//	(R⁻¹)_ss = (G_SS⁻¹)_ss  (s in S)
//
// which costs O(|S|³ + |S|·|base|) a set instead of O((|base| + |S|)³).
// The standard errors and t inference are FromMoments'. Bordered does not
// estimate each design's condition number: the caller guarantees it with
// WellConditioned.
type Bordered struct {
	n, y   int
	level  float64
	syy    float64
	base   []int
	extra  map[int]int // node → place in extra
	sd     map[int]float64
	l      *mat.Cholesky // of R_BB; nil for an empty base
	lt     mat.TriDense  // its factor L
	z      *mat.Dense    // L⁻¹ R_BE
	zy     []float64     // L⁻¹ r_By
	g      *mat.SymDense // R_EE − ZᵀZ
	gy     []float64     // r_Ey − Zᵀ zy
	zz     float64       // zyᵀzy
	focals map[int]*baseFocal
	ti     map[int]tInference // by residual df
}

// baseFocal is what a predictor of base needs: q = L⁻¹e_j through its
// products qᵀz, qᵀq and Zᵀq.
type baseFocal struct {
	qz, qq float64
	zq     []float64
}

// ErrBorderedInput is returned when base and extra overlap or contain y.
var ErrBorderedInput = errors.New("linmod: base and extra must be disjoint and leave out the outcome")

// NewBordered prepares the fits of y on base ∪ S, S ⊆ extra, for n cases
// of the covariance matrix cov, at the interval level level.
func NewBordered(cov mat.Symmetric, n, y int, base, extra []int, level float64) (*Bordered, error) {
	if slices.Contains(base, y) || slices.Contains(extra, y) {
		return nil, ErrBorderedInput
	}
	b := &Bordered{n: n, y: y, level: level, syy: cov.At(y, y), base: base, extra: map[int]int{},
		sd: map[int]float64{}, focals: map[int]*baseFocal{}, ti: map[int]tInference{}}
	for _, v := range append(append([]int(nil), base...), extra...) {
		if _, dup := b.sd[v]; dup {
			return nil, ErrBorderedInput
		}
		b.sd[v] = math.Sqrt(cov.At(v, v))
	}
	for i, v := range extra {
		b.extra[v] = i
	}
	r := func(u, v int) float64 { return cov.At(u, v) / (b.sd[u] * b.sd[v]) }
	ry := func(u int) float64 { return cov.At(u, y) / b.sd[u] }
	if err := b.factorBase(r, ry); err != nil {
		return nil, err
	}
	b.schur(extra, r, ry)
	return b, nil
}

// factorBase computes L, Z and z, or leaves them empty for an empty base.
func (b *Bordered) factorBase(r func(u, v int) float64, ry func(int) float64) error {
	k := len(b.base)
	b.zy = make([]float64, k)
	if k == 0 {
		return nil
	}
	rbb := mat.NewSymDense(k, nil)
	rby := mat.NewVecDense(k, nil)
	for i, u := range b.base {
		for j, v := range b.base[:i+1] {
			rbb.SetSym(i, j, r(u, v))
		}
		rby.SetVec(i, ry(u))
	}
	b.l = &mat.Cholesky{}
	if !b.l.Factorize(rbb) {
		return &SingularError{Condition: math.Inf(1)}
	}
	b.l.LTo(&b.lt)
	zy := mat.NewVecDense(k, b.zy)
	if err := zy.SolveVec(&b.lt, rby); err != nil {
		return &SingularError{Condition: math.Inf(1)}
	}
	b.zz = mat.Dot(zy, zy)
	return nil
}

// schur computes Z = L⁻¹ R_BE, G and g.
func (b *Bordered) schur(extra []int, r func(u, v int) float64, ry func(int) float64) {
	e, k := len(extra), len(b.base)
	b.g, b.gy = mat.NewSymDense(max(e, 1), nil), make([]float64, e)
	if e == 0 {
		return
	}
	if k > 0 {
		rbe := mat.NewDense(k, e, nil)
		for i, u := range b.base {
			for j, v := range extra {
				rbe.Set(i, j, r(u, v))
			}
		}
		b.z = mat.NewDense(k, e, nil)
		if err := b.z.Solve(&b.lt, rbe); err != nil {
			b.z = nil // L is triangular and non-singular: cannot happen
		}
	}
	for i, u := range extra {
		for j, v := range extra[:i+1] {
			b.g.SetSym(i, j, r(u, v)-b.zCol(i, j))
		}
		b.gy[i] = ry(u) - b.zDotY(i)
	}
}

// zCol is column i of Z dotted with column j; 0 without a base.
func (b *Bordered) zCol(i, j int) float64 {
	if b.z == nil {
		return 0
	}
	return mat.Dot(b.z.ColView(i), b.z.ColView(j))
}

func (b *Bordered) zDotY(i int) float64 {
	if b.z == nil {
		return 0
	}
	return mat.Dot(b.z.ColView(i), mat.NewVecDense(len(b.zy), b.zy))
}

// ErrNotAPredictor is returned when the focal predictor is in neither
// base nor the set.
var ErrNotAPredictor = errors.New("linmod: the focal variable is not among the predictors")

// Coef fits y on base ∪ set (set ⊆ extra) and returns the coefficient of
// focal, a node of base or of set, with FromMoments' t inference, and the
// residual degrees of freedom.
func (b *Bordered) Coef(set []int, focal int) (Coef, int, error) {
	df := b.n - len(b.base) - len(set) - 1
	if df < 1 {
		return Coef{}, 0, ErrTooFewCases
	}
	ch, gs, err := b.onSet(set)
	if err != nil {
		return Coef{}, 0, err
	}
	bs := ch.solve(slices.Clone(gs))
	explained := b.zz + dot(gs, bs)
	resid := b.syy - explained
	if resid <= 1e-12*b.syy {
		return Coef{}, 0, ErrPerfectFit
	}
	est, inv, err := b.focal(set, focal, ch, bs)
	if err != nil {
		return Coef{}, 0, err
	}
	sigma2 := resid * float64(b.n-1) / float64(df)
	se := math.Sqrt(sigma2*inv/float64(b.n-1)) / b.sd[focal]
	ti, ok := b.ti[df]
	if !ok {
		ti = newTInference(df, b.level)
		b.ti[df] = ti
	}
	return ti.coef(est/b.sd[focal], se), df, nil
}

// onSet factors G_SS, picked out of G, and picks g_S out of g.
func (b *Bordered) onSet(set []int) (smallCholesky, []float64, error) {
	s := len(set)
	ch, gs := smallCholesky{n: s, l: make([]float64, s*s)}, make([]float64, s)
	for i, u := range set {
		pu, ok := b.extra[u]
		if !ok {
			return ch, nil, ErrBorderedInput
		}
		for j, v := range set[:i+1] {
			ch.l[i*s+j] = b.g.At(pu, b.extra[v])
		}
		gs[i] = b.gy[pu]
	}
	if s > 0 {
		if _, ok := lapack64.Potrf(blas64.Symmetric{Uplo: blas.Lower, N: s, Stride: s, Data: ch.l}); !ok {
			return ch, nil, &SingularError{Condition: math.Inf(1)}
		}
	}
	return ch, gs, nil
}

// smallCholesky is G_SS = L Lᵀ, L lower triangular and row-major.
type smallCholesky struct {
	n int
	l []float64
}

// solve overwrites x with G_SS⁻¹ x and returns it.
func (c smallCholesky) solve(x []float64) []float64 {
	if c.n == 0 {
		return x
	}
	l := blas64.Triangular{Uplo: blas.Lower, Diag: blas.NonUnit, N: c.n, Stride: c.n, Data: c.l}
	v := blas64.Vector{N: c.n, Inc: 1, Data: x}
	blas64.Trsv(blas.NoTrans, l, v)
	blas64.Trsv(blas.Trans, l, v)
	return x
}

func dot(x, y []float64) float64 {
	s := 0.0
	for i := range x {
		s += x[i] * y[i]
	}
	return s
}

// focal returns the standardized coefficient of focal and the diagonal
// element of the inverse of the predictors' correlation matrix at it; ch
// factors G_SS and bs is b_S.
func (b *Bordered) focal(set []int, focal int, ch smallCholesky, bs []float64) (float64, float64, error) {
	if t := slices.Index(set, focal); t >= 0 {
		e := make([]float64, len(set))
		e[t] = 1
		return bs[t], ch.solve(e)[t], nil
	}
	f, err := b.baseFocal(focal)
	if err != nil {
		return 0, 0, err
	}
	v := make([]float64, len(set))
	for i, u := range set {
		v[i] = f.zq[b.extra[u]]
	}
	est := f.qz - dot(v, bs)
	return est, f.qq + dot(v, ch.solve(slices.Clone(v))), nil
}

// baseFocal computes, once per predictor of base, q = L⁻¹e_j and its
// products.
func (b *Bordered) baseFocal(focal int) (*baseFocal, error) {
	if f, ok := b.focals[focal]; ok {
		return f, nil
	}
	j := slices.Index(b.base, focal)
	if j < 0 {
		return nil, ErrNotAPredictor
	}
	k := len(b.base)
	e := mat.NewVecDense(k, nil)
	e.SetVec(j, 1)
	var q mat.VecDense
	if err := q.SolveVec(&b.lt, e); err != nil {
		return nil, &SingularError{Condition: math.Inf(1)}
	}
	f := &baseFocal{qz: mat.Dot(&q, mat.NewVecDense(k, b.zy)), qq: mat.Dot(&q, &q)}
	if b.z != nil {
		_, e := b.z.Dims()
		f.zq = make([]float64, e)
		mat.NewVecDense(e, f.zq).MulVec(b.z.T(), &q)
	}
	b.focals[focal] = f
	return f, nil
}
