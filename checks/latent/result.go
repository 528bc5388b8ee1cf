package latent

import (
	"cmp"
	"context"
	"math"

	"gonum.org/v1/gonum/mat"
)

// Result is a converged fit. Matrices are over nodes (Spec): Coef.At(to,
// from) is a loading or path (markers 1, absent arrows 0); Cov holds the
// variances and covariances of the exogenous terms (indicators' residuals,
// disturbances of endogenous structural nodes, sources' variances and
// covariances). The SE matrices are 0 for the fixed markers and NaN where
// there is no parameter.
type Result struct {
	Spec       Spec
	N          int
	Likelihood Likelihood
	// Params are the free parameters (Parameters' order) with Estimate,
	// SE and Std beside them; Vcov is their covariance, 2 H⁻¹/n*.
	Params                []Estimate
	Vcov                  *mat.SymDense
	Coef, CoefSE, StdCoef *mat.Dense
	Cov, CovSE, StdCov    *mat.SymDense
	// Implied is Σ(θ̂) (p × p); ImpliedAll is C, the implied covariance of
	// all nodes (m × m).
	Implied, ImpliedAll *mat.SymDense
	Fit                 Indices
	Constructs          []Construct // by latent
	// Problems lists the signs of an improper solution; Proper is true
	// when there are none.
	Problems   []Problem
	Proper     bool
	Iterations int
	// effects is (I − A)⁻¹ at θ̂.
	effects *mat.Dense
}

// Estimate is a free parameter's estimate, its SE from the expected
// information, and its value in the standardized solution.
type Estimate struct {
	Param
	Estimate, SE, Std float64
}

// Construct is the measurement summary of one latent.
type Construct struct {
	StdLoadings []float64 // in Spec.Indicators order, marker first
	// Omega is McDonald's ω, AVE the average variance extracted (Reliability).
	Omega, AVE float64
}

func (l *layout) result(ctx context.Context, st *state, ev *evaluator, n int, o Options, iters int) (*Result, error) {
	r := &Result{Spec: l.spec, N: n, Likelihood: o.Likelihood, Iterations: iters,
		Coef: st.a, Cov: st.pm, Implied: st.sigma, ImpliedAll: st.c, effects: st.e}
	h := ev.information(st)
	if o.Information == Observed {
		h = mat.NewSymDense(len(l.params), nil)
		l.hessian(st, ev.s, h)
	}
	if err := l.standardErrors(r, h, o.multiplier(n)); err != nil {
		return nil, err
	}
	l.standardize(r)
	if err := l.indices(ctx, r, ev, st, o.multiplier(n)); err != nil {
		return nil, err
	}
	l.reliability(r)
	l.problems(r)
	return r, nil
}

// standardErrors inverts H at θ̂, the expected information or the
// Hessian (Options.Information): Cov(θ̂) = 2 H⁻¹ / n*. A singular H (empirical underidentification) is
// an *UnidentifiedError naming the parameters of its null space.
func (l *layout) standardErrors(r *Result, h *mat.SymDense, nstar float64) error {
	var ch mat.Cholesky
	r.Vcov = mat.NewSymDense(len(l.params), nil)
	inverted := ch.Factorize(h) && ch.InverseTo(r.Vcov) == nil
	if !inverted || !wellConditioned(h, r.Vcov) {
		if err := l.nullSpace(h); err != nil || !inverted {
			return cmp.Or(err, l.unidentified(nil))
		}
	}
	r.Vcov.ScaleSym(2/nstar, r.Vcov)
	l.fillEstimates(r)
	return nil
}

// fillEstimates lays the estimates and SEs out by parameter and by node.
func (l *layout) fillEstimates(r *Result) {
	r.CoefSE, r.CovSE = nanDense(l.m), nanSym(l.m)
	for j := range l.spec.Indicators {
		r.CoefSE.Set(l.marker(j), l.spec.Latent(j), 0)
	}
	r.Params = make([]Estimate, len(l.params))
	for i, par := range l.params {
		se := math.Sqrt(r.Vcov.At(i, i))
		est := r.Cov.At(par.To, par.From)
		if par.inA() {
			est = r.Coef.At(par.To, par.From)
			r.CoefSE.Set(par.To, par.From, se)
		} else {
			r.CovSE.SetSym(par.To, par.From, se)
		}
		r.Params[i] = Estimate{Param: par, Estimate: est, SE: se}
	}
}

// standardize is the solution with every node scaled to unit implied
// variance: a coefficient b·sd(from)/sd(to); a variance over the node's
// implied variance; a covariance of two exogenous terms over the square
// root of the product of their own variances (for residuals, the residual
// correlation).
func (l *layout) standardize(r *Result) {
	sd := make([]float64, l.m)
	for v := range l.m {
		sd[v] = math.Sqrt(r.ImpliedAll.At(v, v))
	}
	r.StdCoef = mat.NewDense(l.m, l.m, nil)
	r.StdCoef.Apply(func(to, from int, b float64) float64 {
		if b == 0 {
			return 0 // no arrow
		}
		return b * sd[from] / sd[to]
	}, r.Coef)
	r.StdCov = mat.NewSymDense(l.m, nil)
	for to := range l.m {
		for from := 0; from <= to; from++ {
			r.StdCov.SetSym(to, from, standardCov(r.Cov, sd, to, from))
		}
	}
	for i, e := range r.Params {
		r.Params[i].Std = r.StdCov.At(e.To, e.From)
		if e.inA() {
			r.Params[i].Std = r.StdCoef.At(e.To, e.From)
		}
	}
}

// standardCov is a variance over the node's implied variance, a
// covariance over the root of its two terms' own variances.
func standardCov(cov *mat.SymDense, sd []float64, to, from int) float64 {
	c := cov.At(to, from)
	switch {
	case to == from:
		return c / (sd[to] * sd[to])
	case c == 0:
		return 0
	}
	return c / math.Sqrt(cov.At(to, to)*cov.At(from, from))
}

func nanDense(m int) *mat.Dense {
	d := mat.NewDense(m, m, nil)
	for i := range m {
		for j := range m {
			d.Set(i, j, math.NaN())
		}
	}
	return d
}

func nanSym(m int) *mat.SymDense {
	d := mat.NewSymDense(m, nil)
	for i := range m {
		for j := 0; j <= i; j++ {
			d.SetSym(i, j, math.NaN())
		}
	}
	return d
}
