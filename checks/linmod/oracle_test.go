package linmod

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat"
)

// The raw-row fit is the tests' oracle: pathvet itself fits from the
// moments (FromMoments), once computed from the rows; the tests check
// that both agree and that FromRows matches NIST StRD and statsmodels.

// FromRows fits y on the columns of x (n × k, no intercept column) with an
// intercept by least squares, through a QR factorization of the design
// (Golub & Van Loan, Matrix Computations, §5.3); Cov(b) = σ̂²(RᵀR)⁻¹.
func FromRows(x *mat.Dense, y []float64, level float64) (*Fit, error) {
	n, k := x.Dims()
	df := n - k - 1
	if df < 1 {
		return nil, ErrTooFewCases
	}
	d := withIntercept(x)
	var qr mat.QR
	qr.Factorize(d)
	if c := qr.Cond(); c > MaxCondition*1e2 || math.IsNaN(c) {
		return nil, &SingularError{Condition: c}
	}
	yv := mat.NewVecDense(n, append([]float64(nil), y...))
	var beta mat.VecDense
	if err := qr.SolveVecTo(&beta, false, yv); err != nil {
		return nil, &SingularError{Condition: qr.Cond()}
	}
	var fitted mat.VecDense
	fitted.MulVec(d, &beta)
	rss, tss, mean := 0.0, 0.0, mat.Sum(yv)/float64(n)
	for i := range n {
		r := y[i] - fitted.AtVec(i)
		rss += r * r
		tss += (y[i] - mean) * (y[i] - mean)
	}
	if rss <= 1e-24*tss || tss == 0 {
		return nil, ErrPerfectFit
	}
	var rd mat.Dense
	qr.RTo(&rd)
	r := mat.NewTriDense(k+1, mat.Upper, nil)
	for i := range k + 1 {
		for j := i; j < k+1; j++ {
			r.SetTri(i, j, rd.At(i, j))
		}
	}
	var rinv mat.TriDense
	if err := rinv.InverseTri(r); err != nil {
		return nil, &SingularError{Condition: math.Inf(1)}
	}
	var covb mat.Dense
	covb.Mul(&rinv, rinv.T()) // (RᵀR)⁻¹ = R⁻¹R⁻ᵀ
	sigma2 := rss / float64(df)
	fit := &Fit{R2: 1 - rss/tss, Sigma2: sigma2, DF: df, N: n, Coefs: make([]Coef, k)}
	c0 := tCoef(beta.AtVec(0), math.Sqrt(sigma2*covb.At(0, 0)), df, level)
	fit.Intercept = &c0
	for j := range k {
		fit.Coefs[j] = tCoef(beta.AtVec(j+1), math.Sqrt(sigma2*covb.At(j+1, j+1)), df, level)
	}
	return fit, nil
}

// rowMoments is the covariance (divisor n − 1) and means of the columns
// of d, as pathvet computes them from raw rows before fitting.
func rowMoments(d mat.Matrix) (*mat.SymDense, []float64) {
	_, p := d.Dims()
	cov := mat.NewSymDense(p, nil)
	stat.CovarianceMatrix(cov, d, nil)
	means := make([]float64, p)
	for j := range p {
		means[j] = stat.Mean(mat.Col(nil, j, d), nil)
	}
	return cov, means
}

// The fit pathvet runs (moments, then FromMoments) agrees with the QR
// oracle on the statsmodels dataset: coefficients, SEs, p-values and the
// intercept.
func TestFromMoments_AgreesWithRows(t *testing.T) {
	_, d := loadReference(t)
	n, _ := d.Dims()
	cov, means := rowMoments(d)
	got, err := FromMoments(cov, means, n, 3, []int{0, 1, 2}, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	want, err := FromRows(cols(d, 0, 1, 2), mat.Col(nil, 3, d), 0.95)
	if err != nil {
		t.Fatal(err)
	}
	for i, w := range append([]Coef{*want.Intercept}, want.Coefs...) {
		g := *got.Intercept
		if i > 0 {
			g = got.Coefs[i-1]
		}
		if !scalar.EqualWithinAbsOrRel(g.Estimate, w.Estimate, 1e-12, 1e-10) ||
			!scalar.EqualWithinRel(g.StdError, w.StdError, 1e-10) ||
			!scalar.EqualWithinRel(g.P, w.P, 1e-8) {
			t.Errorf("coefficient %d: moments %+v, rows %+v", i, g, w)
		}
	}
}
