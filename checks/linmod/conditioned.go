package linmod

import (
	"math"

	"gonum.org/v1/gonum/mat"
)

// WellConditioned reports whether every regression among the variables
// of cov passes FromMoments' condition check, so that Bordered, which
// makes none, fits only what FromMoments would: the correlation matrix of
// any set of predictors is a principal submatrix of the whole one, whose
// eigenvalues lie between the whole one's (Cauchy's interlacing theorem),
// and the 1-norm condition number that the check estimates is at most p
// times the 2-norm one (p the number of variables):
//
//	κ₁(R_xx) ≤ p · κ₂(R_xx) ≤ p · λ_max(R)/λ_min(R) ≤ MaxCondition
func WellConditioned(cov mat.Symmetric) bool {
	p := cov.SymmetricDim()
	r := mat.NewSymDense(p, nil)
	for i := range p {
		for j := 0; j <= i; j++ {
			r.SetSym(i, j, cov.At(i, j)/math.Sqrt(cov.At(i, i)*cov.At(j, j)))
		}
	}
	var eig mat.EigenSym
	if !eig.Factorize(r, false) {
		return false
	}
	vals := eig.Values(nil)
	lo, hi := vals[0], vals[len(vals)-1]
	return lo > 0 && float64(p)*hi/lo <= MaxCondition
}
