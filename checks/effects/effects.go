// Package effects holds the effect-size arithmetic that reporting checks
// need: p-values from an estimate and its standard error, two one-sided
// tests of equivalence, power, E-values with their conversions to the
// risk-ratio scale, and Spearman's correction for attenuation. Plain
// functions on numbers and gonum matrices, with gonum's distributions.
package effects

import (
	"errors"
	"math"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat/distuv"
)

// PFromZ is the two-sided p-value of z = estimate / SE under the normal.
func PFromZ(estimate, se float64) float64 {
	return 2 * distuv.UnitNormal.Survival(math.Abs(estimate/se))
}

// PFromT is the two-sided p-value of t = estimate / SE on df degrees of
// freedom.
func PFromT(estimate, se, df float64) float64 {
	return 2 * distuv.StudentsT{Mu: 0, Sigma: 1, Nu: df}.Survival(math.Abs(estimate/se))
}

// SEFromCI recovers the standard error from a symmetric interval at the
// given level under the normal: (hi − lo) / (2 z_{(1+level)/2}).
func SEFromCI(lo, hi, level float64) float64 {
	return (hi - lo) / (2 * distuv.UnitNormal.Quantile(0.5+level/2))
}

// TOST is the two one-sided tests of equivalence (Schuirmann 1987) of an
// estimate with standard error se against the margin (−delta, delta),
// under the normal: p is the larger of the two one-sided p-values, and
// the estimate is shown equivalent to zero at alpha when p < alpha, which
// is when the 1 − 2α interval lies inside the margin.
func TOST(estimate, se, delta float64) (p float64) {
	lower := distuv.UnitNormal.Survival((estimate + delta) / se) // H0: effect ≤ −δ
	upper := distuv.UnitNormal.CDF((estimate - delta) / se)      // H0: effect ≥ δ
	return math.Max(lower, upper)
}

// Power is the power of a two-sided z test at alpha to detect an effect
// of size delta when the estimate's standard error is se:
//
//	Φ(δ/SE − z_{1−α/2}) + Φ(−δ/SE − z_{1−α/2})
func Power(delta, se, alpha float64) float64 {
	z := distuv.UnitNormal.Quantile(1 - alpha/2)
	return distuv.UnitNormal.CDF(delta/se-z) + distuv.UnitNormal.CDF(-delta/se-z)
}

// PowerCorrelation is the power of the two-sided Fisher-z test at alpha
// to detect a (partial) correlation rho with n cases and k conditioning
// variables: Power(atanh ρ, 1/sqrt(n − k − 3), α) (Cohen 1988, ch. 3).
func PowerCorrelation(rho float64, n, k int, alpha float64) float64 {
	return Power(math.Atanh(rho), 1/math.Sqrt(float64(n-k-3)), alpha)
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
