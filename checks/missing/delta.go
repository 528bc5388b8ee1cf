package missing

import (
	"errors"
	"math"

	"gonum.org/v1/gonum/mat"
)

// Coefficient names a function of Σ that DeltaSE differentiates.
type Coefficient int

// The coefficients of x[0] when y is regressed on x.
const (
	// Unstandardized is β₀ of β = Σ_xx⁻¹ σ_xy.
	Unstandardized Coefficient = iota
	// Standardized is β₀ σ₀/σ_y.
	Standardized
	// PartialCorrelation is the correlation of x[0] and y given x[1:],
	// −P_0y / sqrt(P_00 P_yy) with P the inverse of Σ over x and y.
	PartialCorrelation
)

// DeltaSE is the value of a coefficient of the covariance matrix sigma
// and its standard error by the delta method (Bishop, Fienberg & Holland
// 1975, Discrete Multivariate Analysis, sec. 14.6),
//
//	SE² = ∇gᵀ V ∇g,
//
// with V = acov the covariance of the estimates (μ̂, vech Σ̂), indexed as
// CovParam does (EstimateCovariance). The gradients, with W = Σ_xx⁻¹, w
// its row for x[0] and dΣ⁻¹ = −Σ⁻¹ dΣ Σ⁻¹:
//
//	∂β₀/∂σ_{x_a y} = w_a,  ∂β₀/∂σ_{x_a x_b} = −(w_a β_b + w_b β_a)  (a ≠ b; −w_a β_a for a = b)
//	standardized: (σ₀/σ_y) ∂β₀, plus β₀/(2 σ₀ σ_y) on σ_00 and −β₀ σ₀/(2 σ_y³) on σ_yy
//	partial: dr = −dP_0y / s + P_0y (dP_00 P_yy + P_00 dP_yy) / (2 s³),  s = sqrt(P_00 P_yy)
func DeltaSE(sigma, acov *mat.SymDense, y int, x []int, kind Coefficient) (value, se float64, err error) {
	var grad map[int]float64
	switch kind {
	case PartialCorrelation:
		value, grad, err = partialGradient(sigma, y, x)
	default:
		value, grad, err = coefficientGradient(sigma, y, x, kind == Standardized)
	}
	if err != nil {
		return math.NaN(), math.NaN(), err
	}
	v := 0.0
	for a, ga := range grad {
		for b, gb := range grad {
			v += ga * acov.At(a, b) * gb
		}
	}
	if !(v >= 0) {
		return value, math.NaN(), errors.New("missing: the delta-method variance is not positive")
	}
	return value, math.Sqrt(v), nil
}

// subMatrix is Σ over the variables vars, in their order.
func subMatrix(sigma *mat.SymDense, vars []int) *mat.SymDense {
	s := mat.NewSymDense(len(vars), nil)
	for a, i := range vars {
		for b := 0; b <= a; b++ {
			s.SetSym(a, b, sigma.At(i, vars[b]))
		}
	}
	return s
}

func inverse(s *mat.SymDense) (*mat.SymDense, error) {
	var ch mat.Cholesky
	if ok := ch.Factorize(s); !ok {
		return nil, errors.New("missing: the covariance matrix is not positive definite")
	}
	var inv mat.SymDense
	if err := ch.InverseTo(&inv); err != nil {
		return nil, err
	}
	return &inv, nil
}

// coefficientGradient is β₀ (standardized when std) and its gradient by
// the covariances' parameter indices.
func coefficientGradient(sigma *mat.SymDense, y int, x []int, std bool) (float64, map[int]float64, error) {
	p := sigma.SymmetricDim()
	w, err := inverse(subMatrix(sigma, x))
	if err != nil {
		return 0, nil, err
	}
	k := len(x)
	beta := make([]float64, k)
	for a := range k {
		for b := range k {
			beta[a] += w.At(a, b) * sigma.At(x[b], y)
		}
	}
	grad := map[int]float64{}
	for a := range k {
		grad[CovParam(p, x[a], y)] += w.At(0, a)
		for b := 0; b <= a; b++ {
			g := -(w.At(0, a)*beta[b] + w.At(0, b)*beta[a])
			if a == b {
				g = -w.At(0, a) * beta[a]
			}
			grad[CovParam(p, x[a], x[b])] += g
		}
	}
	if !std {
		return beta[0], grad, nil
	}
	s0, sy := math.Sqrt(sigma.At(x[0], x[0])), math.Sqrt(sigma.At(y, y))
	for i := range grad {
		grad[i] *= s0 / sy
	}
	grad[CovParam(p, x[0], x[0])] += beta[0] / (2 * s0 * sy)
	grad[CovParam(p, y, y)] -= beta[0] * s0 / (2 * sy * sy * sy)
	return beta[0] * s0 / sy, grad, nil
}

// partialGradient is the partial correlation of x[0] and y given x[1:]
// and its gradient by the covariances' parameter indices.
func partialGradient(sigma *mat.SymDense, y int, x []int) (float64, map[int]float64, error) {
	p := sigma.SymmetricDim()
	vars := append(append([]int(nil), x...), y)
	pr, err := inverse(subMatrix(sigma, vars))
	if err != nil {
		return 0, nil, err
	}
	yi := len(vars) - 1
	p0y, p00, pyy := pr.At(0, yi), pr.At(0, 0), pr.At(yi, yi)
	s := math.Sqrt(p00 * pyy)
	// dP_uv/dσ_ab = −(P_ua P_bv + P_ub P_av), a ≠ b; −P_ua P_av, a = b.
	dP := func(u, v, a, b int) float64 {
		if a == b {
			return -pr.At(u, a) * pr.At(a, v)
		}
		return -(pr.At(u, a)*pr.At(b, v) + pr.At(u, b)*pr.At(a, v))
	}
	grad := map[int]float64{}
	for a := range vars {
		for b := 0; b <= a; b++ {
			g := -dP(0, yi, a, b)/s + p0y*(dP(0, 0, a, b)*pyy+p00*dP(yi, yi, a, b))/(2*s*s*s)
			grad[CovParam(p, vars[a], vars[b])] += g
		}
	}
	return -p0y / s, grad, nil
}
