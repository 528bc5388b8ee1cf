package missing

import (
	"context"
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"
)

// EM options and their defaults.
const (
	DefaultTolerance = 1e-10
	DefaultMaxIter   = 1000
)

// ErrNoData is returned when a variable has fewer than two observed values.
var ErrNoData = errors.New("missing: a variable has fewer than two observed values")

// EMResult holds the maximum likelihood estimates under the normal model.
type EMResult struct {
	Mean []float64
	// Cov is the ML covariance (divisor n).
	Cov        *mat.SymDense
	Iterations int
	Converged  bool
	// Tolerance is the convergence criterion that was used: the largest
	// change of a mean or a covariance, each relative to the variables'
	// SDs, below it.
	Tolerance float64
}

// Options tune EM.
type Options struct {
	Tolerance float64 // default DefaultTolerance
	MaxIter   int     // default DefaultMaxIter
	// Start, when set, is the starting mean and covariance; otherwise the
	// observed means and variances (no covariance) are used.
	Start *EMResult
}

// EM estimates the mean and covariance of cols (NaN missing) by the EM
// algorithm for the multivariate normal (Little & Rubin, ch. 11). The
// E-step of a row with missing set M and observed set O uses the precision
// matrix P = Σ⁻¹ of the current estimate:
//
//	E[x_M | x_O] = μ_M − P_MM⁻¹ P_MO (x_O − μ_O),  Cov[x_M | x_O] = P_MM⁻¹
//
// so only |M| × |M| systems are solved; the M-step takes the means and
// the ML (divisor n) covariance of the completed sufficient statistics.
// With complete data the first iteration gives the ML estimates.
//
// EM stops with ctx's error when ctx is done.
func EM(ctx context.Context, cols [][]float64, opt Options) (*EMResult, error) {
	if opt.Tolerance == 0 {
		opt.Tolerance = DefaultTolerance
	}
	if opt.MaxIter == 0 {
		opt.MaxIter = DefaultMaxIter
	}
	p, n := len(cols), rows(cols)
	if p == 0 || n < 2 {
		return nil, ErrNoData
	}
	mean, cov, err := startValues(cols, opt.Start)
	if err != nil {
		return nil, err
	}
	ps := Patterns(cols)
	res := &EMResult{Tolerance: opt.Tolerance}
	for res.Iterations < opt.MaxIter {
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		res.Iterations++
		m2, c2, err := emStep(cols, ps, mean, cov)
		if err != nil {
			return nil, fmt.Errorf("missing: EM iteration %d: %w", res.Iterations, err)
		}
		change := maxChange(mean, cov, m2, c2)
		mean, cov = m2, c2
		if change < opt.Tolerance {
			res.Converged = true
			break
		}
	}
	res.Mean, res.Cov = mean, cov
	return res, nil
}

func startValues(cols [][]float64, start *EMResult) ([]float64, *mat.SymDense, error) {
	p := len(cols)
	if start != nil {
		return append([]float64(nil), start.Mean...), mat.NewSymDense(p, append([]float64(nil), start.Cov.RawSymmetric().Data...)), nil
	}
	mean := make([]float64, p)
	cov := mat.NewSymDense(p, nil)
	for j, c := range cols {
		s, ss, k := 0.0, 0.0, 0
		for _, x := range c {
			if !math.IsNaN(x) {
				s, ss, k = s+x, ss+x*x, k+1
			}
		}
		if k < 2 {
			return nil, nil, ErrNoData
		}
		mean[j] = s / float64(k)
		v := ss/float64(k) - mean[j]*mean[j]
		if v <= 0 {
			return nil, nil, fmt.Errorf("missing: variable %d is constant where observed", j)
		}
		cov.SetSym(j, j, v)
	}
	return mean, cov, nil
}

// condition is the conditional normal of a pattern's missing variables.
type condition struct {
	obs, mis []int
	coef     *mat.Dense    // −P_MM⁻¹ P_MO, |M| × |O|
	cov      *mat.SymDense // P_MM⁻¹
}

// conditional returns the regression of a pattern's missing variables on
// its observed ones under (mean, cov), through the precision matrix.
func conditional(prec *mat.SymDense, pat Pattern) (*condition, error) {
	obs, mis := pat.ObservedIndex()
	c := &condition{obs: obs, mis: mis}
	switch len(mis) {
	case 0:
		return c, nil
	case 1: // the common case: a scalar P_MM
		return c.scalar(prec)
	}
	pmm := mat.NewSymDense(len(mis), nil)
	for a, i := range mis {
		for b, j := range mis[:a+1] {
			pmm.SetSym(a, b, prec.At(i, j))
		}
	}
	var ch mat.Cholesky
	if !ch.Factorize(pmm) {
		return nil, errors.New("the covariance estimate is not positive definite")
	}
	c.cov = mat.NewSymDense(len(mis), nil)
	if err := ch.InverseTo(c.cov); err != nil {
		return nil, err
	}
	if len(obs) == 0 {
		return c, nil
	}
	pmo := mat.NewDense(len(mis), len(obs), nil)
	for a, i := range mis {
		for b, j := range obs {
			pmo.Set(a, b, prec.At(i, j))
		}
	}
	c.coef = mat.NewDense(len(mis), len(obs), nil)
	c.coef.Mul(c.cov, pmo)
	c.coef.Scale(-1, c.coef)
	return c, nil
}

// scalar fills the condition of a pattern with one missing variable m:
// variance 1/P_mm and coefficients −P_mO/P_mm.
func (c *condition) scalar(prec *mat.SymDense) (*condition, error) {
	m := c.mis[0]
	pmm := prec.At(m, m)
	if !(pmm > 0) {
		return nil, errors.New("the covariance estimate is not positive definite")
	}
	c.cov = mat.NewSymDense(1, []float64{1 / pmm})
	if len(c.obs) == 0 {
		return c, nil
	}
	c.coef = mat.NewDense(1, len(c.obs), nil)
	for b, j := range c.obs {
		c.coef.Set(0, b, -prec.At(m, j)/pmm)
	}
	return c, nil
}

// predict fills the missing values of row i into x with their conditional
// means.
func (c *condition) predict(cols [][]float64, i int, mean []float64, x []float64) {
	for _, j := range c.obs {
		x[j] = cols[j][i]
	}
	for a, j := range c.mis {
		v := mean[j]
		for b, k := range c.obs {
			v += c.coef.At(a, b) * (cols[k][i] - mean[k])
		}
		x[j] = v
	}
}

func precision(cov *mat.SymDense) (*mat.SymDense, error) {
	var ch mat.Cholesky
	if !ch.Factorize(cov) {
		return nil, errors.New("the covariance estimate is not positive definite")
	}
	prec := mat.NewSymDense(cov.SymmetricDim(), nil)
	return prec, ch.InverseTo(prec)
}

// emStep is one E and M step.
func emStep(cols [][]float64, ps []Pattern, mean []float64, cov *mat.SymDense) ([]float64, *mat.SymDense, error) {
	p, n := len(cols), rows(cols)
	prec, err := precision(cov)
	if err != nil {
		return nil, nil, err
	}
	t1 := make([]float64, p)
	t2 := mat.NewSymDense(p, nil)
	x := mat.NewVecDense(p, nil)
	for _, pat := range ps {
		c, err := conditional(prec, pat)
		if err != nil {
			return nil, nil, err
		}
		for _, i := range pat.Rows {
			c.predict(cols, i, mean, x.RawVector().Data)
			for j := range p {
				t1[j] += x.AtVec(j)
			}
			t2.SymRankOne(t2, 1, x)
		}
		for a, i := range c.mis {
			for b, j := range c.mis[:a+1] {
				t2.SetSym(i, j, t2.At(i, j)+float64(len(pat.Rows))*c.cov.At(a, b))
			}
		}
	}
	m2 := make([]float64, p)
	for j := range p {
		m2[j] = t1[j] / float64(n)
	}
	c2 := mat.NewSymDense(p, nil)
	for i := range p {
		for j := 0; j <= i; j++ {
			c2.SetSym(i, j, t2.At(i, j)/float64(n)-m2[i]*m2[j])
		}
	}
	return m2, c2, nil
}

func maxChange(m1 []float64, c1 *mat.SymDense, m2 []float64, c2 *mat.SymDense) float64 {
	worst := 0.0
	for i := range m1 {
		si := math.Sqrt(c1.At(i, i))
		worst = math.Max(worst, math.Abs(m2[i]-m1[i])/si)
		for j := 0; j <= i; j++ {
			sj := math.Sqrt(c1.At(j, j))
			worst = math.Max(worst, math.Abs(c2.At(i, j)-c1.At(i, j))/(si*sj))
		}
	}
	return worst
}
