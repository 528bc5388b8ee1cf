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
// algorithm for the multivariate normal (Little & Rubin, ch. 11). The rows
// are grouped by missingness pattern once; the E-step of a pattern with
// missing set M and observed set O uses the precision matrix P = Σ⁻¹ of the
// current estimate,
//
//	E[x_M | x_O] = μ_M − P_MM⁻¹ P_MO (x_O − μ_O),  Cov[x_M | x_O] = P_MM⁻¹,
//
// and is linear in the pattern's sums and cross-products of x_O, which are
// computed once (see emData); the M-step takes the means and the ML
// (divisor n) covariance of the completed sufficient statistics. SQUAREM
// (Varadhan & Roland 2008, scheme S3) extrapolates from two EM steps; the
// rule to stop is the change of one plain EM step, as without it. With
// complete data the first iteration gives the ML estimates. Iterations
// counts EM steps. The observed values are laid out by pattern once (a
// copy of the data), which the iterations read in order.
//
// EM stops with ctx's error when ctx is done.
func EM(ctx context.Context, cols [][]float64, opt Options) (*EMResult, error) {
	if len(cols) == 0 || rows(cols) < 2 {
		return nil, ErrNoData
	}
	ps := Patterns(cols)
	return emWeighted(ctx, cols, newLayout(cols, ps), ps, nil, opt)
}

// emWeighted runs EM on the rows of cols weighted by w (nil: once each);
// lay holds cols laid out by the patterns ps.
func emWeighted(ctx context.Context, cols [][]float64, lay *layout, ps []Pattern, w []float64,
	opt Options) (*EMResult, error) {
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
	d := newEMData(cols, lay, ps, w, append([]float64(nil), mean...))
	if w != nil && !d.observedTwice() {
		return nil, ErrNoData
	}
	return squarem(ctx, d, theta{mean, cov}, opt)
}

func startValues(cols [][]float64, start *EMResult) ([]float64, *mat.SymDense, error) {
	p := len(cols)
	if start != nil {
		cov := append([]float64(nil), start.Cov.RawSymmetric().Data...)
		return append([]float64(nil), start.Mean...), mat.NewSymDense(p, cov), nil
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
