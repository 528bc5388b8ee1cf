package linmod

import (
	"errors"
	"math"

	"gonum.org/v1/gonum/mat"

	"github.com/pathvet/pathvet/checks/effects"
)

// ErrSeparation is returned when a predictor (or a combination of them)
// separates the outcome's zeros from its ones, so the maximum likelihood
// estimate does not exist.
var ErrSeparation = errors.New("linmod: the outcome is (quasi-)completely separated: " +
	"the odds ratio cannot be estimated")

// ErrNotConverged is returned when IRLS does not settle.
var ErrNotConverged = errors.New("linmod: the logistic regression did not converge")

// LogitFit is a logistic regression fit by maximum likelihood.
type LogitFit struct {
	Intercept Coef
	Coefs     []Coef // log-odds per predictor, Wald z inference
	LogLik    float64
	// NullLogLik is the log-likelihood of the intercept-only model; LR is
	// the likelihood-ratio statistic 2(LogLik − NullLogLik) on LRDF degrees
	// of freedom, with p-value LRP.
	NullLogLik float64
	LR, LRP    float64
	LRDF       int
	N          int
	Iterations int
}

// Logit fitting constants.
const (
	logitMaxIter = 100
	logitTol     = 1e-10
	// separationEta is the linear predictor beyond which a fitted
	// probability is 0 or 1 to double precision.
	separationEta = 30
)

// Logistic fits P(y = 1) = 1/(1 + exp(−(b0 + xb))) by iteratively
// reweighted least squares (McCullagh & Nelder 1989, §4.4), with Wald
// standard errors from the inverse Fisher information (XᵀWX)⁻¹ and
// z-based intervals at the given level. y must be 0 or 1.
func Logistic(x *mat.Dense, y []float64, level float64) (*LogitFit, error) {
	n, k := x.Dims()
	if n <= k+1 {
		return nil, ErrTooFewCases
	}
	d := withIntercept(x)
	beta, info, iter, err := irls(d, y)
	if err != nil {
		return nil, err
	}
	var cov mat.SymDense
	if err := info.InverseTo(&cov); err != nil {
		return nil, &SingularError{Condition: info.Cond()}
	}
	z := effects.TQuantile(0.5+level/2, effects.Normal)
	coef := func(j int) Coef {
		est, se := beta.AtVec(j), math.Sqrt(cov.At(j, j))
		ci := [2]float64{est - z*se, est + z*se}
		return Coef{Estimate: est, StdError: se, Stat: est / se, P: effects.PFromZ(est, se), CI: ci}
	}
	fit := &LogitFit{Intercept: coef(0), Coefs: make([]Coef, k), N: n, Iterations: iter, LRDF: k}
	for j := range k {
		fit.Coefs[j] = coef(j + 1)
	}
	fit.LogLik = logLik(d, beta, y)
	ones := mat.Sum(mat.NewVecDense(n, append([]float64(nil), y...)))
	pbar := ones / float64(n)
	fit.NullLogLik = ones*math.Log(pbar) + (float64(n)-ones)*math.Log(1-pbar)
	fit.LR = 2 * (fit.LogLik - fit.NullLogLik)
	fit.LRP = effects.ChiSquaredSF(fit.LR, float64(k))
	return fit, nil
}

// irls returns the estimate, the Cholesky factor of the information
// matrix at it, and the iterations used.
func irls(d *mat.Dense, y []float64) (*mat.VecDense, *mat.Cholesky, int, error) {
	_, p := d.Dims()
	beta := mat.NewVecDense(p, nil)
	var eta mat.VecDense
	prev := math.Inf(-1)
	for iter := 1; iter <= logitMaxIter; iter++ {
		eta.MulVec(d, beta)
		if mat.Max(&eta) > separationEta || mat.Min(&eta) < -separationEta {
			return nil, nil, iter, ErrSeparation
		}
		step, err := newtonStep(d, &eta, y)
		if err != nil {
			return nil, nil, iter, err
		}
		beta.AddVec(beta, step)
		ll := logLik(d, beta, y)
		if math.Abs(ll-prev) < logitTol*(math.Abs(ll)+logitTol) && mat.Norm(step, math.Inf(1)) < 1e-8 {
			// Information at the final estimate, for the standard errors.
			info, err := information(d, beta)
			return beta, info, iter, err
		}
		prev = ll
	}
	return nil, nil, logitMaxIter, ErrNotConverged
}

// newtonStep is the Newton–Raphson step (XᵀWX)⁻¹ Xᵀ(y − μ) at the linear
// predictor eta, W = diag(μ(1 − μ)); ErrSeparation when XᵀWX is singular.
func newtonStep(d *mat.Dense, eta *mat.VecDense, y []float64) (*mat.VecDense, error) {
	n, p := d.Dims()
	xtwx := mat.NewSymDense(p, nil)
	score := mat.NewVecDense(p, nil)
	for i := range n {
		mu := 1 / (1 + math.Exp(-eta.AtVec(i)))
		w := mu * (1 - mu)
		for a := range p {
			score.SetVec(a, score.AtVec(a)+d.At(i, a)*(y[i]-mu))
			for b := 0; b <= a; b++ {
				xtwx.SetSym(a, b, xtwx.At(a, b)+w*d.At(i, a)*d.At(i, b))
			}
		}
	}
	var ch mat.Cholesky
	if !ch.Factorize(xtwx) {
		return nil, ErrSeparation
	}
	var step mat.VecDense
	if err := ch.SolveVecTo(&step, score); err != nil {
		return nil, ErrSeparation
	}
	return &step, nil
}

func information(d *mat.Dense, beta *mat.VecDense) (*mat.Cholesky, error) {
	n, p := d.Dims()
	var eta mat.VecDense
	eta.MulVec(d, beta)
	xtwx := mat.NewSymDense(p, nil)
	for i := range n {
		mu := 1 / (1 + math.Exp(-eta.AtVec(i)))
		w := mu * (1 - mu)
		for a := range p {
			for b := 0; b <= a; b++ {
				xtwx.SetSym(a, b, xtwx.At(a, b)+w*d.At(i, a)*d.At(i, b))
			}
		}
	}
	var ch mat.Cholesky
	if !ch.Factorize(xtwx) {
		return nil, ErrSeparation
	}
	return &ch, nil
}

func logLik(d *mat.Dense, beta *mat.VecDense, y []float64) float64 {
	var eta mat.VecDense
	eta.MulVec(d, beta)
	ll := 0.0
	for i, yi := range y {
		e := eta.AtVec(i)
		// log(1 + exp(e)) computed stably.
		l1pe := math.Max(e, 0) + math.Log1p(math.Exp(-math.Abs(e)))
		ll += yi*e - l1pe
	}
	return ll
}
