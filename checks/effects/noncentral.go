package effects

import (
	"math"

	"gonum.org/v1/gonum/integrate/quad"
	"gonum.org/v1/gonum/mathext"
)

// Limits of the noncentral t series (NoncentralTCDF).
const (
	nctTolerance = 1e-14
	nctMaxTerms  = 2000
	// nctSeriesDelta is the |δ| past which exp(−δ²/2), the series' first
	// weight, nears the smallest double and the series would need more
	// than a thousand terms; from there the CDF is integrated instead.
	nctSeriesDelta = 37
	// nctSeriesLogWeight bounds −ln (1 − x)^{df/2}, x = t²/(t² + df): past
	// it the series' starting terms underflow (t above about 37), and the
	// CDF is integrated instead.
	nctSeriesLogWeight = 600
)

// NoncentralTCDF is P(T′ ≤ t) for T′ = (Z + δ) / sqrt(V/df), Z standard
// normal and V an independent χ² on df degrees of freedom (Normal: the
// normal shifted by δ). For |δ| ≤ 37 it is the twin series of Lenth's
// (1989, Appl. Statist. 38:185, Algorithm AS 243) after Guenther (1978),
// for t ≥ 0 with x = t²/(t² + df),
//
//	P(T′ ≤ t) = Φ(−δ) + ½ Σ_{j≥0} ( p_j I_x(j + ½, df/2) + q_j I_x(j + 1, df/2) ),
//	p_j = e^{−δ²/2} (δ²/2)^j / j!,  q_j = δ e^{−δ²/2} (δ²/2)^j / (√2 Γ(j + 3/2)),
//
// the incomplete beta functions I_x updated by their recurrences, summed
// until Lenth's bound on the remainder is below 1e-14; t < 0 by
// P(T′ ≤ t | δ) = 1 − P(T′ ≤ −t | −δ). Where the series' weights would
// underflow (|δ| > 37, or (1 − x)^{df/2} below e^{−600}) it integrates
// over z by Gauss–Legendre, in pieces (nctUpperByQuadrature),
//
//	P(T′ > t) = ∫ φ(z) F_χ²(df)( df (z + δ)² / t² ) dz  over z > −δ  (t > 0, δ > 0).
//
// Checked against scipy.stats.nct (testdata/reference/scipy/nct_reference.py).
func NoncentralTCDF(t, df, delta float64) float64 {
	switch {
	case math.IsNaN(t) || math.IsNaN(df) || math.IsNaN(delta) || df <= 0:
		return math.NaN()
	case math.IsInf(df, 1):
		return 1 - NormalSF(t-delta)
	case t < 0:
		return 1 - NoncentralTCDF(-t, df, -delta)
	case math.IsInf(t, 1):
		return 1
	case t == 0:
		return NormalSF(delta)
	case math.Abs(delta) > nctSeriesDelta || df/2*math.Log1p(t*t/df) > nctSeriesLogWeight:
		return 1 - nctUpperByQuadrature(t, df, delta)
	}
	return nctSeries(t, df, delta)
}

// nctSeries is AS 243 for t ≥ 0 (see NoncentralTCDF).
func nctSeries(t, df, delta float64) float64 {
	x := t * t / (t*t + df)
	if x <= 0 {
		return NormalSF(delta)
	}
	lambda := delta * delta
	p := 0.5 * math.Exp(-0.5*lambda)
	q := math.Sqrt(2/math.Pi) * p * delta
	s := 0.5 - p
	a, b := 0.5, 0.5*df
	rxb := math.Pow(1-x, b)
	lgb, _ := math.Lgamma(b)
	lgab, _ := math.Lgamma(a + b)
	albeta := 0.5*math.Log(math.Pi) + lgb - lgab
	xodd := mathext.RegIncBeta(a, b, x)
	godd := 2 * rxb * math.Exp(a*math.Log(x)-albeta)
	xeven := 1 - rxb
	geven := b * x * rxb
	sum := p*xodd + q*xeven
	for en := 1.0; en <= nctMaxTerms; en++ {
		a++
		xodd -= godd
		xeven -= geven
		godd *= x * (a + b - 1) / a
		geven *= x * (a + b - 0.5) / (a + 0.5)
		p *= lambda / (2 * en)
		q *= lambda / (2*en + 1)
		s -= p
		sum += p*xodd + q*xeven
		if 2*s*(xodd-godd) <= nctTolerance {
			break
		}
	}
	return math.Min(math.Max(sum+NormalSF(delta), 0), 1)
}

// nctUpperByQuadrature is P(T′ > t) for t > 0 (see NoncentralTCDF): the
// integral over z from max(−δ, −13) to 13, in three pieces about
// z* = t − δ, where the χ² CDF rises (over a width of about t/sqrt(2 df)),
// each by Gauss–Legendre on 128 points.
func nctUpperByQuadrature(t, df, delta float64) float64 {
	lo, hi := math.Max(-delta, -13), 13.0
	if lo >= hi {
		return 0
	}
	f := func(z float64) float64 {
		w := z + delta
		if w <= 0 {
			return 0
		}
		return math.Exp(-z*z/2) / math.Sqrt(2*math.Pi) * mathext.GammaIncReg(df/2, df*w*w/(2*t*t))
	}
	mid, width := t-delta, 10*t/math.Sqrt(2*df)
	cuts := []float64{lo}
	for _, c := range []float64{mid - width, mid + width} {
		if c > cuts[len(cuts)-1] && c < hi {
			cuts = append(cuts, c)
		}
	}
	cuts = append(cuts, hi)
	sum := 0.0
	for i := 1; i < len(cuts); i++ {
		sum += quad.Fixed(f, cuts[i-1], cuts[i], 128, quad.Legendre{}, 0)
	}
	return sum
}
