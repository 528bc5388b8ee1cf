package latent

import (
	"errors"
	"math"
	"slices"

	"gonum.org/v1/gonum/mat"
)

// ErrWarmMismatch is returned when Options.Warm was fitted with another
// measurement model (other observed variables, indicators or residual
// covariances) than the Spec being fitted.
var ErrWarmMismatch = errors.New("latent: the warm-start fit has another measurement model")

// defaultStart is the composite-correlation rule. For latent j with
// marker m: the latent's variance ψ⁰ = s_mm/2, a loading
// λ⁰_i = s_im/ψ⁰ (so λ⁰_i ψ⁰ reproduces the covariance with the marker),
// every indicator's residual variance s_ii/2, residual covariances 0.
// Each latent's composite weights its items by λ⁰_i/Σλ⁰²; the
// structural nodes' covariance is taken as Φ⁰ = D^½ R D^½, R the
// composites' correlations (an observed structural node is its own
// composite) and D the variances ψ⁰ and s_vv; the structural part then
// comes from Φ⁰ (structuralStart). Σ(θ⁰) is positive definite.
func (l *layout) defaultStart(s *mat.SymDense) []float64 {
	a, pm := mat.NewDense(l.m, l.m, nil), mat.NewSymDense(l.m, nil)
	psi0 := l.measurementStart(s, a, pm)
	l.structuralStart(l.compositeCovariance(s, a, psi0), a, pm)
	return l.extract(a, pm)
}

// measurementStart sets the loadings and residual variances of the
// composite-correlation rule and returns the latents' start variances
// (and each observed structural node's variance) by node.
func (l *layout) measurementStart(s *mat.SymDense, a *mat.Dense, pm *mat.SymDense) []float64 {
	d := make([]float64, l.m)
	for j, items := range l.spec.Indicators {
		mk, lat := items[0], l.spec.Latent(j)
		d[lat] = s.At(mk, mk) / 2
		for _, v := range items {
			a.Set(v, lat, s.At(v, mk)/d[lat])
			pm.SetSym(v, v, s.At(v, v)/2)
		}
	}
	for v := range l.p {
		if l.roles.structural[v] {
			d[v] = s.At(v, v)
		}
	}
	return d
}

// compositeCovariance returns Φ⁰ = D^½ R D^½ over the structural nodes
// (m × m, other entries zero).
func (l *layout) compositeCovariance(s *mat.SymDense, a *mat.Dense, d []float64) *mat.SymDense {
	wt := l.compositeWeights(a)
	var sw, k mat.Dense
	sw.Mul(s, wt)
	k.Mul(wt.T(), &sw)
	phi := mat.NewSymDense(l.m, nil)
	for u := range l.m {
		for v := 0; v <= u; v++ {
			if l.roles.structural[u] && l.roles.structural[v] {
				r := k.At(u, v) / math.Sqrt(k.At(u, u)*k.At(v, v))
				phi.SetSym(u, v, r*math.Sqrt(d[u]*d[v]))
			}
		}
	}
	return phi
}

// compositeWeights is p × m: a latent's column weights its items by
// λ⁰_i/Σλ⁰², an observed structural node's column picks it.
func (l *layout) compositeWeights(a *mat.Dense) *mat.Dense {
	wt := mat.NewDense(l.p, l.m, nil)
	for j, items := range l.spec.Indicators {
		lat, ss := l.spec.Latent(j), 0.0
		for _, v := range items {
			ss += a.At(v, lat) * a.At(v, lat)
		}
		for _, v := range items {
			wt.Set(v, lat, a.At(v, lat)/ss)
		}
	}
	for v := range l.p {
		if l.roles.structural[v] {
			wt.Set(v, v, 1)
		}
	}
	return wt
}

// structuralStart sets the structural part from a covariance Φ of the
// structural nodes: each endogenous node's paths are its regression on
// its parents, b = Φ_PP⁻¹ Φ_Pv, its disturbance Φ_vv − bᵀ Φ_Pv (at least
// Φ_vv/100), and the sources' variances and covariances are Φ's. For a
// warm start Φ is the implied covariance of the warm fit, which a
// Markov-equivalent DAG reproduces exactly with these values.
func (l *layout) structuralStart(phi *mat.SymDense, a *mat.Dense, pm *mat.SymDense) {
	for v := range l.m {
		if !l.roles.structural[v] {
			continue
		}
		pa := l.spec.parentsOf(v)
		b, explained := regress(phi, v, pa)
		for k, u := range pa {
			a.Set(v, u, b[k])
		}
		pm.SetSym(v, v, math.Max(phi.At(v, v)-explained, phi.At(v, v)/100))
	}
	for i, u := range l.sources {
		for _, w := range l.sources[i+1:] {
			pm.SetSym(u, w, phi.At(u, w))
		}
	}
}

// regress returns the coefficients of v on pa under the covariance phi
// and the variance they explain; zeros when Φ_PP is singular.
func regress(phi *mat.SymDense, v int, pa []int) ([]float64, float64) {
	b := make([]float64, len(pa))
	if len(pa) == 0 {
		return b, 0
	}
	spp := mat.NewSymDense(len(pa), nil)
	spv := mat.NewVecDense(len(pa), nil)
	for i, u := range pa {
		spv.SetVec(i, phi.At(u, v))
		for k := 0; k <= i; k++ {
			spp.SetSym(i, k, phi.At(u, pa[k]))
		}
	}
	var ch mat.Cholesky
	bv := mat.NewVecDense(len(pa), b)
	if !ch.Factorize(spp) || ch.SolveVecTo(bv, spv) != nil {
		return make([]float64, len(pa)), 0
	}
	return b, mat.Dot(bv, spv)
}

// extract reads θ from A and P, the inverse of fill.
func (l *layout) extract(a *mat.Dense, pm *mat.SymDense) []float64 {
	theta := make([]float64, len(l.params))
	for i, par := range l.params {
		if par.inA() {
			theta[i] = a.At(par.To, par.From)
		} else {
			theta[i] = pm.At(par.To, par.From)
		}
	}
	return theta
}

// warmStart copies the measurement part of w and sets the structural
// part from w's implied covariance of the structural nodes.
func (l *layout) warmStart(w *Result) ([]float64, error) {
	ws := w.Spec
	if ws.Observed != l.spec.Observed || !slices.EqualFunc(ws.Indicators, l.spec.Indicators, slices.Equal) ||
		!sameResidualCovariances(ws.ResidualCovariances, l.spec.ResidualCovariances) {
		return nil, ErrWarmMismatch
	}
	a := mat.DenseCopyOf(w.Coef)
	pm := mat.NewSymDense(l.m, nil)
	pm.CopySym(w.Cov)
	l.structuralStart(w.ImpliedAll, a, pm)
	return l.extract(a, pm), nil
}

func sameResidualCovariances(x, y [][2]int) bool {
	key := func(pr [2]int) [2]int { return [2]int{min(pr[0], pr[1]), max(pr[0], pr[1])} }
	set := map[[2]int]bool{}
	for _, pr := range x {
		set[key(pr)] = true
	}
	if len(set) != len(y) {
		return false
	}
	for _, pr := range y {
		if !set[key(pr)] {
			return false
		}
	}
	return true
}
