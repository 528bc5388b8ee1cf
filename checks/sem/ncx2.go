package sem

import (
	"math"

	"gonum.org/v1/gonum/stat/distuv"
)

// NoncentralChiSquaredCDF returns P(X ≤ x) for X noncentral chi-square
// with k degrees of freedom and noncentrality λ, as the Poisson mixture of
// central chi-square distributions (Johnson, Kotz & Balakrishnan,
// Continuous Univariate Distributions 2, ch. 29):
//
//	F(x; k, λ) = Σ_j e^(−λ/2) (λ/2)^j / j! · F_χ²(x; k + 2j)
//
// The sum runs over the Poisson weights that matter (about ±12 standard
// deviations around λ/2), each term from gonum's distributions.
func NoncentralChiSquaredCDF(x, k, lambda float64) float64 {
	if x <= 0 {
		return 0
	}
	if lambda <= 0 {
		return distuv.ChiSquared{K: k}.CDF(x)
	}
	m := lambda / 2
	pois := distuv.Poisson{Lambda: m}
	spread := 12*math.Sqrt(m) + 12
	lo := int(math.Max(0, math.Floor(m-spread)))
	hi := int(math.Ceil(m + spread))
	sum := 0.0
	for j := lo; j <= hi; j++ {
		if w := pois.Prob(float64(j)); w > 0 {
			sum += w * distuv.ChiSquared{K: k + 2*float64(j)}.CDF(x)
		}
	}
	return math.Min(sum, 1)
}

// noncentrality returns the λ ≥ 0 at which F(t; df, λ) = target, 0 when
// even λ = 0 gives less; F decreases in λ, so bisection finds it.
func noncentrality(t, df, target float64) float64 {
	if NoncentralChiSquaredCDF(t, df, 0) <= target {
		return 0
	}
	lo, hi := 0.0, math.Max(t, 1)
	for NoncentralChiSquaredCDF(t, df, hi) > target {
		lo, hi = hi, 2*hi
	}
	for range 200 {
		mid := (lo + hi) / 2
		if NoncentralChiSquaredCDF(t, df, mid) > target {
			lo = mid
		} else {
			hi = mid
		}
		if hi-lo < 1e-10*math.Max(1, hi) {
			break
		}
	}
	return (lo + hi) / 2
}

// RMSEAInterval returns the 90% interval of the RMSEA for a chi-square t
// on df degrees of freedom from n cases (Browne & Cudeck 1993): with λ_L
// and λ_U the noncentralities at which t is the 95th and 5th percentile,
//
//	[sqrt(λ_L / (df (n − 1))), sqrt(λ_U / (df (n − 1)))]
func RMSEAInterval(t float64, df, n int) [2]float64 {
	if df <= 0 {
		return [2]float64{0, 0}
	}
	scale := float64(df) * float64(n-1)
	lo := noncentrality(t, float64(df), 0.95)
	hi := noncentrality(t, float64(df), 0.05)
	return [2]float64{math.Sqrt(lo / scale), math.Sqrt(hi / scale)}
}
