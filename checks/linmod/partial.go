package linmod

import (
	"math"

	"gonum.org/v1/gonum/mat"

	"github.com/pathvet/pathvet/checks/effects"
)

// PartialCorrelation returns the correlation of x and y given the
// variables in given, from a correlation (or covariance) matrix r: with P
// the inverse of r restricted to {x, y} ∪ given,
//
//	r_xy·given = −P_xy / sqrt(P_xx P_yy)
//
// (Anderson, An Introduction to Multivariate Statistical Analysis, §2.5).
// With one conditioning variable b this is the textbook
// (r_xy − r_xb r_yb)/sqrt((1 − r_xb²)(1 − r_yb²)).
func PartialCorrelation(r mat.Symmetric, x, y int, given []int) (float64, error) {
	idx := append([]int{x, y}, given...)
	sub := mat.NewSymDense(len(idx), nil)
	for i, a := range idx {
		for j, b := range idx[:i+1] {
			sub.SetSym(i, j, r.At(a, b))
		}
	}
	var ch mat.Cholesky
	if !ch.Factorize(sub) {
		return math.NaN(), &SingularError{Condition: math.Inf(1)}
	}
	if c := ch.Cond(); c > MaxCondition {
		return math.NaN(), &SingularError{Condition: c}
	}
	var p mat.SymDense
	if err := ch.InverseTo(&p); err != nil {
		return math.NaN(), &SingularError{Condition: ch.Cond()}
	}
	return -p.At(0, 1) / math.Sqrt(p.At(0, 0)*p.At(1, 1)), nil
}

// FisherZ tests a (partial) correlation r from n cases with k
// conditioning variables against zero by Fisher's z transformation:
//
//	z = atanh(r) · sqrt(n − k − 3),  p = 2 Φ(−|z|)
//
// (Fisher 1924). ok is false when n − k − 3 < 1.
func FisherZ(r float64, n, k int) (z, p float64, ok bool) {
	m := n - k - 3
	if m < 1 || math.Abs(r) >= 1 {
		return math.NaN(), math.NaN(), false
	}
	z = math.Atanh(r) * math.Sqrt(float64(m))
	return z, effects.PFromZ(z, 1), true
}
