package missing

import (
	"math"

	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat/distuv"
)

// MCARTest is Little's test of missing completely at random.
type MCARTest struct {
	ChiSquare float64
	DF        int
	P         float64
}

// LittleMCAR computes Little's (1988) test from the data and their EM
// estimates (ML, divisor n, as the README's "Checks" section states):
//
//	d² = Σ_j n_j (ȳ_j − μ_Oj)ᵀ Σ_OjOj⁻¹ (ȳ_j − μ_Oj),  df = Σ_j p_j − p
//
// over the patterns j, with ȳ_j the mean of the n_j rows of pattern j over
// its p_j observed variables. Patterns with nothing observed add nothing.
//
// Σ_OO⁻¹ comes from the precision matrix P = Σ⁻¹ as P_OO − P_OM P_MM⁻¹ P_MO,
// so with u = P_·O d that quadratic form is d·u_O − u_Mᵀ P_MM⁻¹ u_M, and
// only |M| × |M| systems are solved.
func LittleMCAR(cols [][]float64, em *EMResult) (MCARTest, error) {
	var t MCARTest
	p := len(cols)
	prec, err := precision(em.Cov)
	if err != nil {
		return t, errorf("the EM covariance is not positive definite")
	}
	var c condition
	d, u := make([]float64, p), make([]float64, p)
	for _, pat := range Patterns(cols) {
		if len(pat.obs) == 0 {
			continue
		}
		if err := c.set(prec, em.Mean, pat.obs, pat.mis); err != nil {
			return t, errorf("the EM covariance is not positive definite")
		}
		t.ChiSquare += float64(len(pat.Rows)) * c.quadratic(cols, pat, em.Mean, prec, d, u)
		t.DF += len(pat.obs)
	}
	t.DF -= p
	t.P = math.NaN()
	if t.DF > 0 {
		t.P = distuv.ChiSquared{K: float64(t.DF)}.Survival(t.ChiSquare)
	}
	return t, nil
}

// quadratic is dᵀ Σ_OO⁻¹ d for d the pattern's observed means minus μ_O,
// through the condition c of the pattern (C = P_MM⁻¹); d and u are
// scratch of length p.
func (c *condition) quadratic(cols [][]float64, pat Pattern, mean []float64, prec *mat.SymDense,
	d, u []float64) float64 {
	clear(d)
	for _, j := range pat.obs {
		s := 0.0
		for _, i := range pat.Rows {
			s += cols[j][i]
		}
		d[j] = s/float64(len(pat.Rows)) - mean[j]
	}
	vec := func(x []float64) blas64.Vector { return blas64.Vector{N: len(x), Inc: 1, Data: x} }
	blas64.Symv(1, prec.RawSymmetric(), vec(d), 0, vec(u))
	q := 0.0
	for _, j := range pat.obs {
		q += d[j] * u[j]
	}
	nm := len(pat.mis)
	for x, i := range pat.mis {
		for y, j := range pat.mis {
			q -= u[i] * c.c[x*nm+y] * u[j]
		}
	}
	return q
}
