package mediation

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"

	"github.com/pathvet/pathvet/checks/linmod"
)

// Confounding is the sensitivity of a single-mediator indirect effect to
// a common cause of the mediator and the outcome, in the linear
// structural equation model of Imai, Keele & Yamamoto (2010, Statistical
// Science 25(1); also Imai, Keele & Tingley 2010, Psychological
// Methods 15(4)). With exposure T, mediator M, outcome Y and covariates X
// in every equation,
//
//	Y = α₁ + β₁T + ξ₁ᵀX + ε₁          (the outcome's reduced form)
//	M = α₂ + β₂T + ξ₂ᵀX + ε₂          (the mediator model)
//	Y = α₃ + β₃T + γM + ξ₃ᵀX + ε₃     (the outcome model)
//
// σ₁², σ₂² are the variances of ε₁, ε₂, ρ̃ = corr(ε₁, ε₂) (all three
// identified by the two regressions on T and X), and ρ = corr(ε₂, ε₃) is
// the unidentified error correlation that an unmeasured common cause of M
// and Y would create. The indirect effect β₂γ at a given ρ is
//
//	ACME(ρ) = (β₂σ₁/σ₂) · {ρ̃ − ρ·√((1 − ρ̃²)/(1 − ρ²))},
//
// which is zero at ρ = ρ̃. Derivation (worked here from the setup):
// substituting M into the outcome model gives ε₁ = γε₂ + ε₃, so
// Cov(ε₁, ε₂) = γσ₂² + ρσ₂σ₃ and σ₁² = γ²σ₂² + σ₃² + 2γρσ₂σ₃. The first
// gives γσ₂ = ρ̃σ₁ − ρσ₃; putting that in the second leaves
// σ₁² = ρ̃²σ₁² + (1 − ρ²)σ₃², so σ₃ = σ₁√((1 − ρ̃²)/(1 − ρ²)) and
// γ = (σ₁/σ₂){ρ̃ − ρ√((1 − ρ̃²)/(1 − ρ²))}. At ρ = 0, γ is the least
// squares coefficient of M, and ACME(0) the product-of-coefficients
// estimate.
type Confounding struct {
	// RhoAtZero is ρ̃, the correlation of the mediator's and the
	// outcome's errors at which the indirect effect vanishes: the
	// partial correlation of M and Y given T and X.
	RhoAtZero float64
	// Beta2 is T's coefficient in the mediator model; Sigma1 and Sigma2
	// are the SDs of ε₁ and ε₂ (any common divisor: only their ratio
	// enters).
	Beta2, Sigma1, Sigma2 float64
}

// ACME is the indirect effect at error correlation rho, |rho| < 1.
func (c Confounding) ACME(rho float64) float64 {
	r := c.RhoAtZero
	return c.Beta2 * c.Sigma1 / c.Sigma2 * (r - rho*math.Sqrt((1-r*r)/(1-rho*rho)))
}

// MediatorConfounding computes Confounding from the covariance (or
// correlation) matrix cov for exposure t, mediator m, outcome y and the
// covariates of both equations (the union of those of the mediator and
// the outcome, as the model above puts the same X in every equation). The
// mediator and the outcome must be continuous for the linear model to
// apply.
func MediatorConfounding(cov mat.Symmetric, t, m, y int, covariates []int) (Confounding, error) {
	given := append([]int{t}, covariates...)
	for _, v := range given {
		if v == m || v == y || v < 0 || v >= cov.SymmetricDim() {
			return Confounding{}, fmt.Errorf("mediation: covariate %d is the mediator, the outcome or out of range", v)
		}
	}
	bm, _, rssM, err := solveEquation(cov, m, given)
	if err != nil {
		return Confounding{}, fmt.Errorf("mediation: mediator model: %w", err)
	}
	_, _, rssY, err := solveEquation(cov, y, given)
	if err != nil {
		return Confounding{}, fmt.Errorf("mediation: outcome's reduced form: %w", err)
	}
	rho, err := linmod.PartialCorrelation(cov, m, y, given)
	if err != nil {
		return Confounding{}, fmt.Errorf("mediation: partial correlation of mediator and outcome: %w", err)
	}
	return Confounding{RhoAtZero: rho, Beta2: bm[0], Sigma1: math.Sqrt(rssY), Sigma2: math.Sqrt(rssM)}, nil
}
