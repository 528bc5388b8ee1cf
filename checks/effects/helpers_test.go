package effects

import "math"

// powerCorrelation is the power of the two-sided Fisher-z test at alpha
// to detect a (partial) correlation rho with n cases and k conditioning
// variables: Power(atanh ρ, 1/sqrt(n − k − 3), α) (Cohen 1988, ch. 3).
func powerCorrelation(rho float64, n, k int, alpha float64) float64 {
	return Power(math.Atanh(rho), 1/math.Sqrt(float64(n-k-3)), alpha, Normal)
}
