package latent

import (
	"math"

	"gonum.org/v1/gonum/mat"
)

// state is the model at one parameter vector θ, in the reticular action
// form (McArdle & McDonald 1984): with A the m × m coefficients (loadings
// and paths, A[to][from]), P the covariances of the exogenous terms
// (residuals, disturbances, sources) and F the selection of the observed
// nodes,
//
//	E = (I − A)⁻¹,  C = E P Eᵀ,  Σ(θ) = F C Fᵀ.
type state struct {
	a, e  *mat.Dense
	pm, c *mat.SymDense
	sigma *mat.SymDense
	w     *mat.SymDense // Σ⁻¹
	chol  mat.Cholesky
	pd    bool    // Σ(θ) is positive definite
	f     float64 // F_ML, +Inf when Σ(θ) is not positive definite
	u, v  *mat.Dense
	omega *mat.Dense // Σ⁻¹ (Σ − S) Σ⁻¹ (omegaOf)
}

// fill sets A and P from θ: markers at 1, the free entries from theta.
func (l *layout) fill(theta []float64, a *mat.Dense, pm *mat.SymDense) {
	a.Zero()
	pm.Zero()
	for j := range l.spec.Indicators {
		a.Set(l.marker(j), l.spec.Latent(j), 1)
	}
	for i, par := range l.params {
		if par.inA() {
			a.Set(par.To, par.From, theta[i])
		} else {
			pm.SetSym(par.To, par.From, theta[i])
		}
	}
}

// newState computes E, C, Σ(θ), its inverse and F_ML against the sample
// s (whose log-determinant is logDetS). I − A is invertible for every θ
// because the arrows form a DAG: it is unit triangular in a topological
// order.
func (l *layout) newState(theta []float64, s *mat.SymDense, logDetS float64) *state {
	st := &state{a: mat.NewDense(l.m, l.m, nil), pm: mat.NewSymDense(l.m, nil), f: math.Inf(1)}
	l.fill(theta, st.a, st.pm)
	if !l.implied(st) {
		return st
	}
	if st.pd = st.chol.Factorize(st.sigma); !st.pd {
		return st
	}
	st.w = mat.NewSymDense(l.p, nil)
	if st.chol.InverseTo(st.w) != nil {
		st.pd = false
		return st
	}
	st.f = fml(s, st.w, st.chol.LogDet(), logDetS)
	return st
}

// implied computes E, C and Σ(θ); false if I − A is singular.
func (l *layout) implied(st *state) bool {
	var ia, ep, c mat.Dense
	ia.Sub(eye(l.m), st.a)
	st.e = &mat.Dense{}
	if st.e.Inverse(&ia) != nil {
		return false
	}
	ep.Mul(st.e, st.pm)
	c.Mul(&ep, st.e.T())
	st.c = symmetrize(&c)
	st.sigma = mat.NewSymDense(l.p, nil)
	st.sigma.CopySym(st.c.SliceSym(0, l.p))
	return true
}

// fml is the maximum likelihood discrepancy (Jöreskog 1967)
//
//	F_ML = ln|Σ| − ln|S| + tr(S Σ⁻¹) − p.
func fml(s, w *mat.SymDense, logDetSigma, logDetS float64) float64 {
	p := s.SymmetricDim()
	trace := 0.0
	for i := range p {
		for j := range p {
			trace += s.At(i, j) * w.At(i, j)
		}
	}
	return logDetSigma - logDetS + trace - float64(p)
}

// directions builds U and V (p × q): the derivative of Σ(θ) in parameter
// a is Δ_a = u_a v_aᵀ + v_a u_aᵀ, with, for a path or loading to ← from,
// u = (F E)[:, to] and v = (F C)[:, from] (since ∂E = E ∂A E); for a
// variance of node i, u = (F E)[:, i] and v = u/2; for a covariance of
// nodes i and j, u = (F E)[:, i] and v = (F E)[:, j].
func (l *layout) directions(st *state) {
	q := len(l.params)
	st.u, st.v = mat.NewDense(l.p, q, nil), mat.NewDense(l.p, q, nil)
	for k, par := range l.params {
		for r := range l.p {
			u := st.e.At(r, par.To)
			var v float64
			switch {
			case par.inA():
				v = st.c.At(r, par.From)
			case par.To == par.From:
				v = u / 2
			default:
				v = st.e.At(r, par.From)
			}
			st.u.Set(r, k, u)
			st.v.Set(r, k, v)
		}
	}
}

// gradient is ∂F_ML/∂θ_a = tr(Ω Δ_a) = 2 v_aᵀ Ω u_a with
// Ω = Σ⁻¹ (Σ − S) Σ⁻¹ (e.g. Bollen 1989, ch. 4, appendix 4B).
func (l *layout) gradient(st *state, s *mat.SymDense, grad []float64) {
	if st.u == nil {
		l.directions(st)
	}
	var ou mat.Dense
	ou.Mul(st.omegaOf(s), st.u)
	for k := range grad {
		grad[k] = 2 * mat.Dot(st.v.ColView(k), ou.ColView(k))
	}
}

// omegaOf returns Ω = Σ⁻¹ (Σ − S) Σ⁻¹, computed once per state.
func (st *state) omegaOf(s *mat.SymDense) *mat.Dense {
	if st.omega == nil {
		var d, wd mat.Dense
		d.Sub(st.sigma, s)
		wd.Mul(st.w, &d)
		st.omega = &mat.Dense{}
		st.omega.Mul(&wd, st.w)
	}
	return st.omega
}

// information is the expected second derivative of F_ML,
//
//	H_ab = tr(Σ⁻¹ Δ_a Σ⁻¹ Δ_b) = 2 [(v_aᵀ Σ⁻¹ u_b)(v_bᵀ Σ⁻¹ u_a) + (u_aᵀ Σ⁻¹ u_b)(v_aᵀ Σ⁻¹ v_b)],
//
// the Fisher information of one case times 2 (Browne 1974; Bollen 1989,
// ch. 4): Cov(θ̂) ≈ 2 H⁻¹ / n*.
func (l *layout) information(st *state, h *mat.SymDense) {
	if st.u == nil {
		l.directions(st)
	}
	muu, mvv, mvu := st.bilinear(st.w)
	for a := range len(l.params) {
		for b := 0; b <= a; b++ {
			h.SetSym(a, b, 2*(mvu.At(a, b)*mvu.At(b, a)+muu.At(a, b)*mvv.At(a, b)))
		}
	}
}

// bilinear returns Uᵀ X U, Vᵀ X V and Vᵀ X U (q × q).
func (st *state) bilinear(x mat.Matrix) (muu, mvv, mvu *mat.Dense) {
	var xu, xv mat.Dense
	xu.Mul(x, st.u)
	xv.Mul(x, st.v)
	muu, mvv, mvu = &mat.Dense{}, &mat.Dense{}, &mat.Dense{}
	muu.Mul(st.u.T(), &xu)
	mvv.Mul(st.v.T(), &xv)
	mvu.Mul(st.v.T(), &xu)
	return muu, mvv, mvu
}

func eye(n int) *mat.Dense {
	m := mat.NewDense(n, n, nil)
	for i := range n {
		m.Set(i, i, 1)
	}
	return m
}

func symmetrize(m *mat.Dense) *mat.SymDense {
	n, _ := m.Dims()
	out := mat.NewSymDense(n, nil)
	for i := range n {
		for j := 0; j <= i; j++ {
			out.SetSym(i, j, (m.At(i, j)+m.At(j, i))/2)
		}
	}
	return out
}
