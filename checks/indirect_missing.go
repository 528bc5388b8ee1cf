package checks

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"slices"

	"gonum.org/v1/gonum/mat"

	"github.com/pathvet/pathvet/checks/mediation"
	"github.com/pathvet/pathvet/checks/missing"
)

// Indirect effects under missing data: maximum likelihood (the effect of
// the EM covariance, its SE and Monte Carlo interval from the observed
// information) and multiple imputation (Rubin's rules for the estimate
// and SE, the imputations' Monte Carlo draws mixed for the interval).

// Notes of indirect estimates under missing data.
const (
	mlIndirectNote = "point estimate from the EM covariance of all %d rows; SE by the delta method from the " +
		"observed information of the saturated normal model, as full-information maximum likelihood gives it; " +
		"interval: Monte Carlo, %d draws of the covariance matrix from the normal that information gives " +
		"(%d not positive definite, left out); its significance is judged by whether that interval excludes zero"
	miIndirectNote = "%d imputations; estimate and SE pooled by Rubin's rules (Barnard–Rubin df %.1f; fraction " +
		"of missing information %.2f); interval: the Monte Carlo draws of every imputed dataset mixed (Zhou & " +
		"Reiter 2010), %d in all; its significance is judged by whether that interval excludes zero; Monte Carlo " +
		"error of the pooled estimate %.2g"
	// gradStep is the relative step of the central differences of an
	// effect in the covariances: the error is of order step², far below
	// the SE's own sampling error.
	gradStep = 1e-5
)

// covEffect is an indirect effect as a function of a covariance matrix
// over the effect's variables.
type covEffect struct {
	vars    []int // the variables, in order of the local matrix
	parents [][]int
	path    mediation.Path
	std     bool
	n       int
}

func newCovEffect(parents [][]int, p mediation.Path, std bool, n int) *covEffect {
	var vars []int
	for v, pa := range parents {
		if len(pa) > 0 || v == p.From || usedAsParent(parents, v) {
			vars = append(vars, v)
		}
	}
	local := func(v int) int { return slices.Index(vars, v) }
	f := &covEffect{vars: vars, parents: make([][]int, len(vars)), std: std, n: n,
		path: mediation.Path{From: local(p.From), To: local(p.To)}}
	for i, v := range vars {
		for _, u := range parents[v] {
			f.parents[i] = append(f.parents[i], local(u))
		}
	}
	for _, v := range p.Through {
		f.path.Through = append(f.path.Through, local(v))
	}
	return f
}

// at is the effect for the local covariance matrix s.
func (f *covEffect) at(s *mat.SymDense) (float64, error) {
	if f.std {
		k := s.SymmetricDim()
		r := mat.NewSymDense(k, nil)
		for i := range k {
			for j := range i + 1 {
				r.SetSym(i, j, s.At(i, j)/math.Sqrt(s.At(i, i)*s.At(j, j)))
			}
		}
		s = r
	}
	m, err := mediation.FitModel(s, f.n, f.parents, mediation.OLS)
	if err != nil {
		return math.NaN(), err
	}
	ef, err := mediation.Effect(m, f.path)
	return ef.Effect, err
}

// local is the submatrix of sigma over the effect's variables.
func (f *covEffect) local(sigma mat.Symmetric) *mat.SymDense {
	s := mat.NewSymDense(len(f.vars), nil)
	for i, v := range f.vars {
		for j, w := range f.vars[:i+1] {
			s.SetSym(i, j, sigma.At(v, w))
		}
	}
	return s
}

// gradient is ∂θ/∂σ_ij over the local pairs i ≥ j, by central differences.
func (f *covEffect) gradient(s *mat.SymDense) ([]float64, error) {
	var g []float64
	for i := range f.vars {
		for j := range i + 1 {
			h := gradStep * math.Sqrt(s.At(i, i)*s.At(j, j))
			up, down := mat.NewSymDense(s.SymmetricDim(), nil), mat.NewSymDense(s.SymmetricDim(), nil)
			up.CopySym(s)
			down.CopySym(s)
			up.SetSym(i, j, s.At(i, j)+h)
			down.SetSym(i, j, s.At(i, j)-h)
			a, err1 := f.at(up)
			b, err2 := f.at(down)
			if err := errors.Join(err1, err2); err != nil {
				return nil, err
			}
			g = append(g, (a-b)/(2*h))
		}
	}
	return g, nil
}

// acovBlock is the covariance of the local pairs' estimates, from the
// covariance acov of (μ̂, vech Σ̂) over p variables.
func (f *covEffect) acovBlock(acov *missing.Covariance, p int) *mat.SymDense {
	var idx []int
	for i, v := range f.vars {
		for _, w := range f.vars[:i+1] {
			idx = append(idx, missing.CovParam(p, v, w))
		}
	}
	return acov.Block(idx)
}

// mlIndirect gives the maximum-likelihood estimate e of an indirect claim
// (the effect of the EM covariance) its SE by the delta method from the
// observed information, and a Monte Carlo interval of covariance matrices
// drawn from the normal that information gives,
//
//	SE² = ∇θᵀ V ∇θ,  vech Σ* ~ N(vech Σ̂, V),  θ* = θ(Σ*),
//
// V the covariances' block of the inverse observed information, ∇θ by
// central differences. Where the information could not be had, e becomes
// an error that says why.
func (g observedGraph) mlIndirect(c Claim, e est) est {
	a, r := g.a, g.m.ml
	if !e.ok() || e.method != MethodProduct {
		return e
	}
	if r.acovErr != nil {
		return e.failed(fmt.Errorf(mlNoSEFormat, trimMissing(r.acovErr)))
	}
	p := a.claimPath(c)
	f := newCovEffect(effectParents(g.pa, len(a.Study.Names), p.From, p.To), p, e.scale == "standardized", e.n)
	s := f.local(r.em.Cov)
	grad, err := f.gradient(s)
	if err != nil {
		return e.failed(fmt.Errorf(mlNoSEFormat, err))
	}
	v := f.acovBlock(r.acov, len(a.Study.Names))
	gv := mat.NewVecDense(len(grad), grad)
	e.se = math.Sqrt(mat.Inner(gv, v, gv))
	iv, err := f.monteCarlo(g, s, v, a.drawSeed("ml monte carlo", g.m, p), claimLevel(c))
	if err != nil {
		return e.failed(fmt.Errorf(mlNoSEFormat, err))
	}
	e = a.withDraws(e, IntervalMonteCarlo, iv, claimLevel(c))
	e.note = fmt.Sprintf(mlIndirectNote, e.n, len(iv.Draws), iv.Failed)
	if !r.em.Converged {
		e.note += fmt.Sprintf(mlNotConvergedNote, r.em.Iterations)
	}
	return e
}

// monteCarlo draws vech Σ* from N(vech s, v) and returns the interval of
// θ(Σ*), leaving out draws that are not positive definite.
func (f *covEffect) monteCarlo(g observedGraph, s, v *mat.SymDense, seed uint64,
	level float64) (*mediation.Interval, error) {
	var ch mat.Cholesky
	if !ch.Factorize(v) {
		return nil, errors.New("the covariance of the ML estimates is not positive definite")
	}
	var l mat.TriDense
	ch.LTo(&l)
	k, q := len(f.vars), v.SymmetricDim()
	rng := rand.New(rand.NewPCG(seed, 0x5eed))
	z, dv := make([]float64, q), mat.NewVecDense(q, nil)
	draws := make([]float64, mediation.DefaultDraws)
	star := mat.NewSymDense(k, nil)
	for d := range draws {
		if d%1000 == 0 {
			if err := g.ctx.Err(); err != nil {
				return nil, err
			}
		}
		for i := range z {
			z[i] = rng.NormFloat64()
		}
		dv.MulVec(&l, mat.NewVecDense(q, z))
		t := 0
		for i := range k {
			for j := range i + 1 {
				star.SetSym(i, j, s.At(i, j)+dv.AtVec(t))
				t++
			}
		}
		draws[d] = math.NaN()
		if x, err := f.at(star); err == nil {
			draws[d] = x
		}
	}
	return mediation.IntervalOf(draws, level)
}

func trimMissing(err error) string {
	const prefix = "missing: "
	s := err.Error()
	if len(s) > len(prefix) && s[:len(prefix)] == prefix {
		return s[len(prefix):]
	}
	return s
}

// pooledIndirect pools an indirect claim over the imputed datasets: the
// estimate and its SE by Rubin's rules (with the Barnard–Rubin df), and
// the interval from the Monte Carlo draws of every imputed dataset mixed
// with equal weight, each contributing the same number of evenly spaced
// quantiles (Zhou & Reiter 2010, The American Statistician 64(2), mix
// the draws of each completed dataset's posterior). The Monte Carlo error
// of the imputation, sqrt(B/m), could carry the conclusion across the
// line when the interval's limit nearer zero lies within two such errors
// of it.
func (a *Analysis) pooledIndirect(c Claim, ests []est) est {
	var q, u, mix []float64
	first := ests[0]
	per := max(1, mediation.DefaultDraws/len(ests))
	for _, e := range ests {
		q, u = append(q, e.value), append(u, e.se*e.se)
		mix = append(mix, thinDraws(e.draws, per)...)
	}
	pr, err := missing.Pool(q, u, first.df, claimLevel(c))
	if err != nil {
		return est{err: err, scale: first.scale}
	}
	slices.Sort(mix)
	iv, err := mediation.IntervalOf(mix, claimLevel(c))
	if err != nil {
		return est{err: err, scale: first.scale}
	}
	e := est{method: "multiple_imputation", scale: first.scale, n: first.n, value: pr.Estimate,
		additive: pr.Estimate, se: pr.StdError, p: math.NaN(), mcse: monteCarloError(pr)}
	e = a.withDraws(e, IntervalMixture, iv, claimLevel(c))
	near := math.Min(math.Abs(e.judge.lo), math.Abs(e.judge.hi))
	e.nearLine = near < 2*e.mcse
	e.note = fmt.Sprintf(miIndirectNote, pr.M, pr.DF, pr.FMI, len(mix), e.mcse)
	return e
}
