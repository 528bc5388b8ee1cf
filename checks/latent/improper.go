package latent

import (
	"math"

	"gonum.org/v1/gonum/mat"
)

// problems lists the signs of an improper solution (Dillon, Kumar &
// Mulani 1987; Bollen 1989, ch. 7): negative variances (Heywood cases),
// standardized loadings beyond ±1, and latent or residual covariance
// matrices that are not positive definite.
func (l *layout) problems(r *Result) {
	for v := range l.m {
		if c := r.Cov.At(v, v); c < 0 {
			r.Problems = append(r.Problems, Problem{Kind: NegativeVariance, To: v, From: v, Value: c})
		}
	}
	for j, items := range l.spec.Indicators {
		for _, v := range items {
			if b := r.StdCoef.At(v, l.spec.Latent(j)); !(math.Abs(b) <= 1) {
				r.Problems = append(r.Problems, Problem{Kind: LoadingAboveOne, To: v, From: l.spec.Latent(j), Value: b})
			}
		}
	}
	lat := make([]int, len(l.spec.Indicators))
	for j := range lat {
		lat[j] = l.spec.Latent(j)
	}
	if !positiveDefinite(r.ImpliedAll, lat) {
		r.Problems = append(r.Problems, Problem{Kind: LatentCovarianceNotPD, To: -1, From: -1, Value: math.NaN()})
	}
	if len(l.spec.ResidualCovariances) > 0 && !positiveDefinite(r.Cov, l.indicators()) {
		r.Problems = append(r.Problems, Problem{Kind: ResidualCovarianceNotPD, To: -1, From: -1, Value: math.NaN()})
	}
	r.Proper = len(r.Problems) == 0
}

// indicators lists the indicator nodes.
func (l *layout) indicators() []int {
	var out []int
	for v := range l.p {
		if l.roles.latentOf[v] >= 0 {
			out = append(out, v)
		}
	}
	return out
}

// positiveDefinite reports whether the submatrix of m on idx is.
func positiveDefinite(m *mat.SymDense, idx []int) bool {
	sub := mat.NewSymDense(len(idx), nil)
	for i, u := range idx {
		for k := 0; k <= i; k++ {
			sub.SetSym(i, k, m.At(u, idx[k]))
		}
	}
	var ch mat.Cholesky
	return ch.Factorize(sub)
}
