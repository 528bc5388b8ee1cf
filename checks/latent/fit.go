package latent

import (
	"context"
	"fmt"
	"math"

	"gonum.org/v1/gonum/floats"
	"gonum.org/v1/gonum/mat"
)

// Likelihood is the convention that ties S, N and the test statistic.
type Likelihood int

const (
	// Wishart: S has divisor N − 1 and T = (N − 1) F_ML, Cov(θ̂) = 2 H⁻¹/(N − 1),
	// as checks/sem.
	Wishart Likelihood = iota
	// Normal: S has divisor N (the ML covariance) and T = N F_ML,
	// Cov(θ̂) = 2 H⁻¹/N.
	Normal
)

// Method is the optimizer.
type Method int

const (
	// Scoring is Fisher scoring with step halving, switching to Newton
	// steps on the exact Hessian near the minimum (score).
	Scoring Method = iota
	// QuasiNewton is gonum's BFGS on the analytic gradient, its end point
	// polished by Scoring.
	QuasiNewton
)

// Information is the matrix whose inverse gives the standard errors.
type Information int

const (
	// Expected: Cov(θ̂) = 2 H⁻¹/n* with H the expected information at θ̂
	// (Σ⁻¹ ⊗ Σ⁻¹ in the derivatives of Σ).
	Expected Information = iota
	// Observed: the exact Hessian of F_ML at θ̂ (hessian) in place of H.
	Observed
)

// Options tune Fit; the zero value is the default.
type Options struct {
	Likelihood  Likelihood
	Method      Method
	Information Information
	// Warm starts from a fit of the same measurement model (another
	// structural graph): its measurement estimates, and structural values
	// from its implied covariance of the structural nodes.
	Warm *Result
	// Start, when not nil, is the starting vector in Parameters' order.
	Start []float64
	// MaxIterations bounds the optimizer's major iterations (default 500).
	MaxIterations int
	// Tolerance ends the iterations once the scoring step's predicted
	// decrease of F_ML, ½ gᵀ H⁻¹ g (g the gradient), is at most this
	// (default 1e-16; the criterion does not depend on the data's units).
	Tolerance float64
}

func (o *Options) defaults() Options {
	out := Options{}
	if o != nil {
		out = *o
	}
	if out.MaxIterations <= 0 {
		out.MaxIterations = 500
	}
	if out.Tolerance <= 0 {
		out.Tolerance = 1e-16
	}
	return out
}

// multiplier is n*: N − 1 (Wishart) or N (Normal).
func (o Options) multiplier(n int) float64 {
	if o.Likelihood == Normal {
		return float64(n)
	}
	return float64(n - 1)
}

const (
	msgStartNotPD = "the starting values give an implied covariance matrix that is not positive definite"
	msgSample     = "latent: a %d × %d sample matrix of %d cases for %d observed variables (at least 3 cases)"
)

// Fit estimates spec by maximum likelihood from the sample covariance s
// of n cases: it minimizes
//
//	F_ML(θ) = ln|Σ(θ)| − ln|S| + tr(S Σ(θ)⁻¹) − p
//
// (Jöreskog 1967, 1969) with T = n* F_ML, n* = N − 1 or N (Likelihood),
// starting from Options.Start, Options.Warm or the composite-correlation
// rule. It returns an *UnidentifiedError, a *NotConvergedError, a
// *SpecError, ErrNotPositiveDefinite or ctx's error; an improper solution
// is returned with its Problems.
func Fit(ctx context.Context, s *mat.SymDense, n int, spec Spec, opts *Options) (*Result, error) {
	o := opts.defaults()
	l, ev, err := prepare(s, n, spec)
	if err != nil {
		return nil, err
	}
	theta, err := l.start(s, o)
	if err != nil {
		return nil, err
	}
	if err := ev.checkStart(theta); err != nil {
		return nil, err
	}
	st, iters, err := ev.minimize(ctx, theta, o)
	if err != nil {
		return nil, err
	}
	return l.result(ctx, st, ev, n, o, iters)
}

// prepare validates the model and the sample and applies the counting
// rules of identification.
func prepare(s *mat.SymDense, n int, spec Spec) (*layout, *evaluator, error) {
	l, err := newLayout(spec)
	if err != nil {
		return nil, nil, err
	}
	if s.SymmetricDim() != l.p || n < 3 {
		return nil, nil, fmt.Errorf(msgSample, s.SymmetricDim(), s.SymmetricDim(), n, l.p)
	}
	var chS mat.Cholesky
	if !chS.Factorize(s) {
		return nil, nil, ErrNotPositiveDefinite
	}
	if err := l.checkCounts(); err != nil {
		return nil, nil, err
	}
	return l, &evaluator{l: l, s: s, logDetS: chS.LogDet(), h: mat.NewSymDense(len(l.params), nil)}, nil
}

func (l *layout) start(s *mat.SymDense, o Options) ([]float64, error) {
	switch {
	case o.Start != nil:
		if len(o.Start) != len(l.params) {
			return nil, fmt.Errorf("latent: Options.Start has %d values for %d parameters", len(o.Start), len(l.params))
		}
		return append([]float64(nil), o.Start...), nil
	case o.Warm != nil:
		return l.warmStart(o.Warm)
	}
	return l.defaultStart(s), nil
}

// evaluator caches the state at the last θ, which gonum asks for the
// function, gradient and Hessian in turn.
type evaluator struct {
	l       *layout
	s       *mat.SymDense
	logDetS float64
	x       []float64
	st      *state
	// h is the information at hAt (nil: not computed).
	h   *mat.SymDense
	hAt *state
}

// information returns H at st, computing it once per state.
func (ev *evaluator) information(st *state) *mat.SymDense {
	if ev.hAt != st {
		ev.l.information(st, ev.h)
		ev.hAt = st
	}
	return ev.h
}

func (ev *evaluator) at(x []float64) *state {
	if ev.st == nil || !floats.Equal(x, ev.x) {
		ev.x = append(ev.x[:0], x...)
		ev.st = ev.l.newState(x, ev.s, ev.logDetS)
	}
	return ev.st
}

// checkStart refuses a start whose Σ(θ⁰) is not positive definite and a
// model whose information is singular there.
func (ev *evaluator) checkStart(theta []float64) error {
	st := ev.at(theta)
	if !st.pd {
		return &NotConvergedError{Cause: msgStartNotPD, GradientNorm: math.NaN()}
	}
	return ev.l.checkInformation(ev.information(st))
}
