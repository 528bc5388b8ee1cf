package sem

import (
	"context"
	"math"

	"gonum.org/v1/gonum/stat/distuv"

	"github.com/pathvet/pathvet/checks/effects"
)

// SankaranLambda is the noncentrality from which NoncentralChiSquaredCDF
// uses Sankaran's approximation instead of the Poisson mixture, so that
// its cost is bounded whatever λ is: at most about 800 mixture terms
// below it, a closed form above. At the switch the two agree with scipy's
// ncx2 to within 1e-4 (testdata/reference/scipy, ncx2_cdf_switch).
const SankaranLambda = 2000

// NoncentralChiSquaredCDF returns P(X ≤ x) for X noncentral chi-square
// with k degrees of freedom and noncentrality λ. Below SankaranLambda it
// is the Poisson mixture of central chi-square distributions (Johnson,
// Kotz & Balakrishnan, Continuous Univariate Distributions 2, ch. 29),
//
//	F(x; k, λ) = Σ_j e^(−λ/2) (λ/2)^j / j! · F_χ²(x; k + 2j),
//
// over the Poisson weights that matter (about ±12 standard deviations
// around λ/2); from SankaranLambda on it is Sankaran's approximation.
func NoncentralChiSquaredCDF(x, k, lambda float64) float64 {
	switch {
	case x <= 0:
		return 0
	case lambda <= 0:
		return distuv.ChiSquared{K: k}.CDF(x)
	case lambda >= SankaranLambda:
		return sankaranCDF(x, k, lambda)
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

// sankaranCDF is Sankaran's (1959, Biometrika 46:235–237) normal
// approximation of the noncentral chi-square: with
//
//	h = 1 − ⅔ (k + λ)(k + 3λ)/(k + 2λ)²,  p = (k + 2λ)/(k + λ)²,  m = (h − 1)(1 − 3h),
//
// (x/(k + λ))^h is about normal with mean 1 + h p (h − 1 − (2 − h) m p / 2)
// and standard deviation h √(2p) (1 + m p / 2).
func sankaranCDF(x, k, lambda float64) float64 {
	h := 1 - 2.0/3*(k+lambda)*(k+3*lambda)/((k+2*lambda)*(k+2*lambda))
	p := (k + 2*lambda) / ((k + lambda) * (k + lambda))
	m := (h - 1) * (1 - 3*h)
	mean := 1 + h*p*(h-1-0.5*(2-h)*m*p)
	sd := h * math.Sqrt(2*p) * (1 + 0.5*m*p)
	return effects.NormalSF(-(math.Pow(x/(k+lambda), h) - mean) / sd)
}

// noncentrality returns the λ ≥ 0 at which F(t; df, λ) = target, 0 when
// even λ = 0 gives less; F decreases in λ, so bisection finds it. The
// bracket grows from max(t, 1) by doubling (F(t; df, λ) < target once λ
// is a few standard deviations past t), the bisection stops at a
// relative width of 1e-10 or after 200 halvings; ctx is checked at each
// step.
func noncentrality(ctx context.Context, t, df, target float64) (float64, error) {
	if err := ctx.Err(); err != nil {
		return math.NaN(), err
	}
	if NoncentralChiSquaredCDF(t, df, 0) <= target {
		return 0, nil
	}
	lo, hi := 0.0, math.Max(t, 1)
	for NoncentralChiSquaredCDF(t, df, hi) > target && !math.IsInf(hi, 1) {
		if err := ctx.Err(); err != nil {
			return math.NaN(), err
		}
		lo, hi = hi, 2*hi
	}
	for range 200 {
		if err := ctx.Err(); err != nil {
			return math.NaN(), err
		}
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
	return (lo + hi) / 2, nil
}

// RMSEAInterval returns the 90% interval of the RMSEA for a chi-square t
// on df degrees of freedom from n cases (Browne & Cudeck 1993): with λ_L
// and λ_U the noncentralities at which t is the 95th and 5th percentile,
//
//	[sqrt(λ_L / (df (n − 1))), sqrt(λ_U / (df (n − 1)))]
//
// It stops with ctx's error when ctx is cancelled.
func RMSEAInterval(ctx context.Context, t float64, df, n int) ([2]float64, error) {
	if df <= 0 {
		return [2]float64{0, 0}, nil
	}
	scale := float64(df) * (float64(n) - 1)
	lo, err := noncentrality(ctx, t, float64(df), 0.95)
	if err != nil {
		return [2]float64{math.NaN(), math.NaN()}, err
	}
	hi, err := noncentrality(ctx, t, float64(df), 0.05)
	if err != nil {
		return [2]float64{math.NaN(), math.NaN()}, err
	}
	return [2]float64{math.Sqrt(lo / scale), math.Sqrt(hi / scale)}, nil
}
