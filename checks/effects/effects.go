package effects

import (
	"errors"
	"math"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat/distuv"
)

// Normal is the df that makes the t-based functions below use the normal
// distribution: a z test is a t test on infinitely many df.
var Normal = math.Inf(1)

// PFromZ is the two-sided p-value of z = estimate / SE under the normal.
func PFromZ(estimate, se float64) float64 {
	return PFromT(estimate, se, Normal)
}

// PFromT is the two-sided p-value of t = estimate / SE on df degrees of
// freedom (Normal for a z test), from the complementary tail TSF so that
// tiny p-values stay numbers.
func PFromT(estimate, se, df float64) float64 {
	return 2 * TSF(math.Abs(estimate/se), df)
}

// TQuantile is the q-quantile of Student's t on df degrees of freedom
// (Normal for the normal): gonum's inverse incomplete beta below hillDF,
// and from there, where that loses its digits (3.23 for the 97.5th
// percentile at df = 1e15), the Cornish–Fisher expansion of Abramowitz &
// Stegun 26.7.5 in 1/df to the fourth order, within 1e-12 of scipy.
func TQuantile(q, df float64) float64 {
	z := distuv.UnitNormal.Quantile(q)
	switch {
	case math.IsInf(df, 1):
		return z
	case df < hillDF:
		return distuv.StudentsT{Mu: 0, Sigma: 1, Nu: df}.Quantile(q)
	}
	z2 := z * z
	g1 := (z2 + 1) * z / 4
	g2 := ((5*z2+16)*z2 + 3) * z / 96
	g3 := (((3*z2+19)*z2+17)*z2 - 15) * z / 384
	g4 := ((((79*z2+776)*z2+1482)*z2-1920)*z2 - 945) * z / 92160
	return z + (g1+(g2+(g3+g4/df)/df)/df)/df
}

// SEFromCI recovers the standard error from a symmetric interval at the
// given level under the normal: (hi − lo) / (2 z_{(1+level)/2}).
func SEFromCI(lo, hi, level float64) float64 {
	return SEFromTCI(lo, hi, level, Normal)
}

// SEFromTCI recovers the standard error from a symmetric interval at the
// given level under t on df degrees of freedom (Normal for the normal):
// (hi − lo) / (2 t_{df,(1+level)/2}).
func SEFromTCI(lo, hi, level, df float64) float64 {
	return (hi - lo) / (2 * TQuantile(0.5+level/2, df))
}

// TOST is the two one-sided tests of equivalence (Schuirmann 1987) of an
// estimate with standard error se against the margin (−delta, delta),
// under t on df degrees of freedom (Normal for the normal): p is the
// larger of the two one-sided p-values, and the estimate is shown
// equivalent to zero at alpha when p < alpha, which is when the 1 − 2α
// interval lies inside the margin.
func TOST(estimate, se, delta, df float64) (p float64) {
	lower := TSF((estimate+delta)/se, df)  // H0: effect ≤ −δ
	upper := TSF(-(estimate-delta)/se, df) // H0: effect ≥ δ
	return math.Max(lower, upper)
}

// Power is the power of a two-sided test at alpha on df degrees of freedom
// (Normal for a z test) to detect an effect of size delta when the
// estimate's standard error is se: with c = t_{df,1−α/2} and T′ noncentral
// t with noncentrality δ/SE (NoncentralTCDF: Lenth's AS 243),
//
//	power = P(T′ > c) + P(T′ < −c),
//
// within 1e-10 of scipy's nct from df 1 to 1e6
// (testdata/reference/scipy/nct_reference.py).
func Power(delta, se, alpha, df float64) float64 {
	c := TQuantile(1-alpha/2, df)
	return 1 - NoncentralTCDF(c, df, delta/se) + NoncentralTCDF(-c, df, delta/se)
}

// EValue is the E-value of a risk ratio (VanderWeele & Ding 2017, Ann.
// Intern. Med. 167:268–274): the minimum strength of association, on the
// risk-ratio scale, that an unmeasured confounder would need with both
// treatment and outcome to explain the association away:
//
//	E = RR + sqrt(RR (RR − 1)) for RR ≥ 1, with RR replaced by 1/RR below 1
func EValue(rr float64) float64 {
	if rr < 1 {
		rr = 1 / rr
	}
	return rr + math.Sqrt(rr*(rr-1))
}

// EValueCI is the E-value of the interval limit nearer the null: 1 when
// the interval includes 1.
func EValueCI(lo, hi float64) float64 {
	switch {
	case lo <= 1 && hi >= 1:
		return 1
	case lo > 1:
		return EValue(lo)
	}
	return EValue(hi)
}

// RRFromOR converts an odds ratio to the risk-ratio scale (VanderWeele &
// Ding 2017): unchanged for a rare outcome (under about 15%), sqrt(OR)
// for a common one.
func RRFromOR(or float64, rare bool) float64 {
	if rare {
		return or
	}
	return math.Sqrt(or)
}

// RRFromD converts a standardized difference d (or a standardized
// coefficient) with standard error se to the risk-ratio scale
// (VanderWeele & Ding 2017): RR ≈ exp(0.91 d), and the interval limit
// nearer the null exp(0.91 d ∓ 1.78 SE), clipped at 1 where it crosses.
func RRFromD(d, se float64) (rr, limit float64) {
	rr = math.Exp(0.91 * d)
	switch {
	case d > 0:
		limit = math.Max(math.Exp(0.91*d-1.78*se), 1)
	case d < 0:
		limit = math.Min(math.Exp(0.91*d+1.78*se), 1)
	default:
		limit = 1
	}
	return rr, limit
}

// ErrReliability is returned for a reliability outside (0, 1].
var ErrReliability = errors.New("effects: a reliability must lie in (0, 1]")

// CorrectAttenuation applies Spearman's (1904) correction to a
// correlation matrix: r_ij / sqrt(r_ii' r_jj') off the diagonal, with r_ii'
// the reliability of variable i (1 leaves it as it is). The result can
// stop being a correlation matrix (entries past ±1, not positive
// definite); the caller checks.
func CorrectAttenuation(r mat.Symmetric, reliability []float64) (*mat.SymDense, error) {
	p := r.SymmetricDim()
	out := mat.NewSymDense(p, nil)
	for i := range p {
		if reliability[i] <= 0 || reliability[i] > 1 {
			return nil, ErrReliability
		}
		out.SetSym(i, i, 1)
		for j := range i {
			out.SetSym(i, j, r.At(i, j)/math.Sqrt(reliability[i]*reliability[j]))
		}
	}
	return out, nil
}
