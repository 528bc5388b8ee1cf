package latent

import (
	"context"
	"errors"
	"math"

	"gonum.org/v1/gonum/floats"
	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/optimize"
)

const (
	msgIterations = "the iteration limit was reached"
	msgNoDescent  = "no step along the search direction lowers F_ML"
	// maxHalvings bounds the step halvings of one scoring iteration.
	maxHalvings = 40
)

// minimize runs the chosen method; QuasiNewton's end point is polished by
// scoring, because its line search stops where F_ML's rounding hides
// further decrease (a gradient of about 1e-8), above the tolerance.
func (ev *evaluator) minimize(ctx context.Context, theta []float64, o Options) (*state, int, error) {
	iters := 0
	if o.Method == QuasiNewton {
		x, n, err := ev.bfgs(ctx, theta, o)
		if err != nil {
			return nil, n, err
		}
		theta, iters = x, n
		o.MaxIterations = max(o.MaxIterations-n, 1)
	}
	st, n, err := ev.score(ctx, theta, o)
	return st, iters + n, err
}

// score is Fisher scoring (Jennrich & Sampson 1976; Lee & Jennrich 1979),
//
//	θ ← θ − α H(θ)⁻¹ ∇F_ML(θ),
//
// with α halved from 1 until F_ML does not rise beyond its rounding. Once
// the scoring step's predicted decrease ½ gᵀH⁻¹g is below newtonFrom it
// steps by Newton's method on the exact Hessian instead, where that is
// positive definite (scoring converges only linearly when the model does
// not fit). It stops when the predicted decrease is within the
// tolerance, and checks ctx at every iteration.
func (ev *evaluator) score(ctx context.Context, theta []float64, o Options) (*state, int, error) {
	g := make([]float64, len(theta))
	st := ev.at(theta)
	for it := 0; ; it++ {
		if err := ctx.Err(); err != nil {
			return nil, it, err
		}
		ev.l.gradient(st, ev.s, g)
		d := solveRidge(ev.information(st), g)
		dec := floats.Dot(g, d) / 2
		switch {
		case dec <= o.Tolerance:
			return st, it, nil
		case it >= o.MaxIterations || math.IsNaN(dec):
			return nil, it, &NotConvergedError{Iterations: it, GradientNorm: floats.Norm(g, math.Inf(1)),
				Cause: msgIterations}
		case dec < newtonFrom:
			d = ev.newtonStep(st, g, d)
		}
		next, ok := ev.descend(theta, st.f, d)
		if !ok {
			return nil, it, &NotConvergedError{Iterations: it, GradientNorm: floats.Norm(g, math.Inf(1)),
				Cause: msgNoDescent}
		}
		theta, st = next, ev.at(next)
	}
}

// newtonFrom is the predicted decrease below which score tries Newton
// steps.
const newtonFrom = 1e-3

// newtonStep solves ∇²F d = g with the exact Hessian, or returns the
// scoring step when the Hessian is not positive definite.
func (ev *evaluator) newtonStep(st *state, g, scoring []float64) []float64 {
	q := len(g)
	h := mat.NewSymDense(q, nil)
	ev.l.hessian(st, ev.s, h)
	var ch mat.Cholesky
	d := make([]float64, q)
	if !ch.Factorize(h) || ch.SolveVecTo(mat.NewVecDense(q, d), mat.NewVecDense(q, g)) != nil {
		return scoring
	}
	return d
}

// descend halves the step until F_ML(θ − α d) ≤ F_ML(θ) + its rounding.
func (ev *evaluator) descend(theta []float64, f float64, d []float64) ([]float64, bool) {
	slack := 1e-12 * (1 + math.Abs(f) + math.Abs(ev.logDetS))
	x := make([]float64, len(theta))
	for alpha, k := 1.0, 0; k < maxHalvings; alpha, k = alpha/2, k+1 {
		for i := range x {
			x[i] = theta[i] - alpha*d[i]
		}
		if st := ev.at(x); st.pd && st.f <= f+slack {
			return x, true
		}
	}
	return nil, false
}

// solveRidge solves H d = g, adding a growing multiple of the mean
// diagonal to H when it is not numerically positive definite.
func solveRidge(h *mat.SymDense, g []float64) []float64 {
	q := len(g)
	d := make([]float64, q)
	dv, gv := mat.NewVecDense(q, d), mat.NewVecDense(q, g)
	mean := mat.Trace(h) / float64(q)
	work := mat.NewSymDense(q, nil)
	var ch mat.Cholesky
	for tau := 0.0; tau < 1e6*mean; tau = math.Max(10*tau, 1e-10*mean) {
		work.CopySym(h)
		for i := range q {
			work.SetSym(i, i, h.At(i, i)+tau)
		}
		if ch.Factorize(work) && ch.SolveVecTo(dv, gv) == nil {
			return d
		}
	}
	floats.ScaleTo(d, 1/mean, g) // steepest descent
	return d
}

// bfgs runs gonum's BFGS on F_ML and its analytic gradient.
func (ev *evaluator) bfgs(ctx context.Context, theta []float64, o Options) ([]float64, int, error) {
	prob := optimize.Problem{
		Func: func(x []float64) float64 { return ev.at(x).f },
		Grad: func(grad, x []float64) {
			if st := ev.at(x); st.pd {
				ev.l.gradient(st, ev.s, grad)
				return
			}
			for i := range grad {
				grad[i] = math.NaN()
			}
		},
	}
	settings := &optimize.Settings{GradientThreshold: 1e-10, MajorIterations: o.MaxIterations,
		Recorder: ctxRecorder{ctx}}
	res, err := optimize.Minimize(prob, theta, settings, &optimize.BFGS{GradStopThreshold: 1e-10})
	switch {
	case ctx.Err() != nil:
		return nil, 0, ctx.Err()
	case res == nil:
		return nil, 0, &NotConvergedError{GradientNorm: math.NaN(), Cause: "BFGS: " + err.Error()}
	case err != nil && !errors.Is(err, optimize.ErrLinesearcherFailure):
		return nil, res.MajorIterations, &NotConvergedError{Iterations: res.MajorIterations,
			GradientNorm: floats.Norm(res.Gradient, math.Inf(1)), Cause: "BFGS: " + err.Error()}
	}
	return res.X, res.MajorIterations, nil
}

// ctxRecorder stops gonum's optimizer once ctx is done.
type ctxRecorder struct{ ctx context.Context }

func (ctxRecorder) Init() error { return nil }

func (r ctxRecorder) Record(*optimize.Location, optimize.Operation, *optimize.Stats) error {
	return r.ctx.Err()
}
