package linmod

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"

	"github.com/pathvet/pathvet/checks/effects"
)

// MaxCondition is the largest condition number of a design (or of its
// correlation matrix) that the fits accept; above it the coefficients
// carry too few correct digits to report.
const MaxCondition = 1e12

// SingularError reports a design that is singular or too near it.
type SingularError struct {
	Condition float64 // the condition number found (+Inf when singular)
}

func (e *SingularError) Error() string {
	if math.IsInf(e.Condition, 1) {
		return "linmod: the predictors are exactly collinear"
	}
	return fmt.Sprintf("linmod: the predictors are nearly collinear (condition number %.3g)", e.Condition)
}

// ErrTooFewCases is returned when n − k − 1 < 1.
var ErrTooFewCases = errors.New("linmod: fewer cases than the model needs (n − k − 1 < 1)")

// ErrPerfectFit is returned when the predictors explain the outcome
// exactly, so no standard error exists.
var ErrPerfectFit = errors.New("linmod: the predictors explain the outcome exactly")

// Coef is one estimated coefficient with its inference.
type Coef struct {
	Estimate float64
	StdError float64
	Stat     float64 // t (OLS) or z (logistic)
	P        float64 // two-sided
	CI       [2]float64
}

// Fit is an ordinary least squares fit.
type Fit struct {
	Coefs     []Coef // one per predictor, in the order given
	Intercept *Coef  // when means (or rows) were given
	R2        float64
	Sigma2    float64 // residual variance, divisor n − k − 1
	DF        int     // residual degrees of freedom, n − k − 1
	N         int
}

// tInference computes t-based p-values and intervals for one fit's
// degrees of freedom and level; the quantile is found once.
type tInference struct {
	df, q float64
}

func newTInference(df int, level float64) tInference {
	return tInference{df: float64(df), q: effects.TQuantile(0.5+level/2, float64(df))}
}

func (ti tInference) coef(est, se float64) Coef {
	stat := est / se
	return Coef{Estimate: est, StdError: se, Stat: stat, P: effects.PFromT(est, se, ti.df),
		CI: [2]float64{est - ti.q*se, est + ti.q*se}}
}

// tCoef fills the t-based inference for an estimate and its SE.
func tCoef(est, se float64, df int, level float64) Coef {
	return newTInference(df, level).coef(est, se)
}

// FromMoments fits y on the predictors x by least squares from the
// covariance matrix cov (divisor n − 1) of n cases, or from their
// correlation matrix, which gives standardized coefficients:
//
//	b = S_xx⁻¹ s_xy,  σ̂² = (s_yy − bᵀs_xy)(n − 1)/(n − k − 1),  Cov(b) = σ̂² S_xx⁻¹/(n − 1)
//
// With means (nil to omit) it also gives the intercept ȳ − bᵀx̄, with
// variance σ̂²/n + x̄ᵀCov(b)x̄. The system is solved on the correlation
// scale (the predictors rescaled to unit variance) by a Cholesky
// factorization whose condition number is checked against MaxCondition.
func FromMoments(cov mat.Symmetric, means []float64, n, y int, x []int, level float64) (*Fit, error) {
	k := len(x)
	df := n - k - 1
	if df < 1 {
		return nil, ErrTooFewCases
	}
	sd, rxx, rxy := standardize(cov, y, x)
	b, inv, err := solveNormal(rxx, rxy, k)
	if err != nil {
		return nil, err
	}
	syy := cov.At(y, y)
	explained := 0.0
	if k > 0 {
		explained = mat.Dot(b, rxy)
	}
	resid := syy - explained
	if resid <= 1e-12*syy {
		return nil, ErrPerfectFit
	}
	fit := &Fit{R2: explained / syy, Sigma2: resid * float64(n-1) / float64(df), DF: df, N: n}
	fit.Coefs = slopes(b, inv, sd, fit.Sigma2, n, newTInference(df, level))
	if means != nil {
		fit.Intercept = intercept(fit, inv, sd, means, y, x, n, level)
	}
	return fit, nil
}

// standardize returns the SDs of the predictors x, their correlation
// matrix and their correlations with y, from the covariance matrix cov.
// The matrices have at least one row, so that they exist for k = 0.
func standardize(cov mat.Symmetric, y int, x []int) (sd []float64, rxx *mat.SymDense, rxy *mat.VecDense) {
	k := len(x)
	sd = make([]float64, k)
	for i, xi := range x {
		sd[i] = math.Sqrt(cov.At(xi, xi))
	}
	rxx = mat.NewSymDense(max(k, 1), nil)
	rxy = mat.NewVecDense(max(k, 1), nil)
	for i, xi := range x {
		for j, xj := range x[:i+1] {
			rxx.SetSym(i, j, cov.At(xi, xj)/(sd[i]*sd[j]))
		}
		rxy.SetVec(i, cov.At(xi, y)/sd[i])
	}
	return sd, rxx, rxy
}

// solveNormal solves rxx b = rxy for the first k rows by a Cholesky
// factorization and returns b with the inverse of rxx, or a
// SingularError when rxx is singular or its condition number exceeds
// MaxCondition. With k = 0 both are zero.
func solveNormal(rxx *mat.SymDense, rxy *mat.VecDense, k int) (*mat.VecDense, *mat.SymDense, error) {
	b := mat.NewVecDense(max(k, 1), nil)
	inv := mat.NewSymDense(max(k, 1), nil)
	if k == 0 {
		return b, inv, nil
	}
	var ch mat.Cholesky
	if !ch.Factorize(rxx) {
		return nil, nil, &SingularError{Condition: math.Inf(1)}
	}
	if c := ch.Cond(); c > MaxCondition {
		return nil, nil, &SingularError{Condition: c}
	}
	if err := ch.SolveVecTo(b, rxy); err != nil {
		return nil, nil, &SingularError{Condition: ch.Cond()}
	}
	if err := ch.InverseTo(inv); err != nil {
		return nil, nil, &SingularError{Condition: ch.Cond()}
	}
	return b, inv, nil
}

// slopes turns the standardized solution b, with inv the inverse of the
// predictors' correlation matrix, into coefficients on the predictors'
// own scale with their t inference.
func slopes(b *mat.VecDense, inv *mat.SymDense, sd []float64, sigma2 float64, n int, ti tInference) []Coef {
	out := make([]Coef, len(sd))
	for i := range out {
		est := b.AtVec(i) / sd[i]
		se := math.Sqrt(sigma2*inv.At(i, i)/float64(n-1)) / sd[i]
		out[i] = ti.coef(est, se)
	}
	return out
}

func intercept(fit *Fit, inv *mat.SymDense, sd, means []float64, y int, x []int, n int, level float64) *Coef {
	b0 := means[y]
	v := fit.Sigma2 / float64(n)
	for i, xi := range x {
		b0 -= fit.Coefs[i].Estimate * means[xi]
		for j, xj := range x {
			v += means[xi] * means[xj] * fit.Sigma2 * inv.At(i, j) / (float64(n-1) * sd[i] * sd[j])
		}
	}
	c := tCoef(b0, math.Sqrt(v), fit.DF, level)
	return &c
}

// withIntercept returns the design [1 x]: a column of ones, then x.
func withIntercept(x *mat.Dense) *mat.Dense {
	n, k := x.Dims()
	d := mat.NewDense(n, k+1, nil)
	for i := range n {
		d.Set(i, 0, 1)
	}
	d.Slice(0, n, 1, k+1).(*mat.Dense).Copy(x)
	return d
}
