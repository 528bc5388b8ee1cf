package mediation

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat"
)

// confoundedRows simulates n rows of exposure t, covariate x, mediator m
// and outcome y (columns 0..3) from the linear model with errors of the
// mediator and the outcome correlated by rho:
//
//	t = 0.5x + e,  m = 1 + 0.6t + 0.3x + ε₂,  y = 2 + 0.2t + γm + 0.4x + ε₃,
//	sd(ε₂) = 1, sd(ε₃) = 1.5, corr(ε₂, ε₃) = rho.
func confoundedRows(r *rand.Rand, n int, gamma, rho float64) *mat.SymDense {
	d := mat.NewDense(n, 4, nil)
	for i := range n {
		x := r.NormFloat64()
		t := 0.5*x + r.NormFloat64()
		z2, z3 := r.NormFloat64(), r.NormFloat64()
		e2, e3 := z2, 1.5*(rho*z2+math.Sqrt(1-rho*rho)*z3)
		m := 1 + 0.6*t + 0.3*x + e2
		d.SetRow(i, []float64{t, x, m, 2 + 0.2*t + gamma*m + 0.4*x + e3})
	}
	var cov mat.SymDense
	stat.CovarianceMatrix(&cov, d, nil)
	return &cov
}

// The closed form against simulated data with a known error correlation
// (200,000 rows each; tolerance 0.01, five times the sampling SD of a
// correlation there, (1 − ρ²)/√n ≈ 0.002):
//   - with no effect of m on y (γ = 0) and errors correlated by 0.36, the
//     naive estimate is not zero, but the error correlation at which the
//     closed form vanishes is the one the data were made with;
//   - with γ = 0.5 (true indirect effect 0.6·0.5 = 0.3) and errors
//     correlated by −0.3, the closed form at −0.3 recovers 0.3, while the
//     naive estimate (ρ = 0) misses it.
//
// ACME(0) is the product-of-coefficients estimate of the fitted model
// (to 1e-10).
func TestMediatorConfounding_Simulation(t *testing.T) {
	r := rand.New(rand.NewPCG(18, 8))
	for _, tc := range []struct{ gamma, rho, truth float64 }{{0, 0.36, 0}, {0.5, -0.3, 0.3}} {
		cov := confoundedRows(r, 200_000, tc.gamma, tc.rho)
		c, err := MediatorConfounding(cov, 0, 2, 3, []int{1})
		if err != nil {
			t.Fatal(err)
		}
		if tc.gamma == 0 && math.Abs(c.RhoAtZero-tc.rho) > 0.01 {
			t.Errorf("γ = 0, ρ = %v: zero crossing at %v", tc.rho, c.RhoAtZero)
		}
		if got := c.ACME(tc.rho); math.Abs(got-tc.truth) > 0.01 {
			t.Errorf("γ = %v, ρ = %v: ACME(ρ) = %v, truth %v", tc.gamma, tc.rho, got, tc.truth)
		}
		if naive := c.ACME(0); math.Abs(naive-tc.truth) < 0.1 {
			t.Errorf("γ = %v, ρ = %v: the naive estimate %v is near the truth; the test shows nothing",
				tc.gamma, tc.rho, naive)
		}
		if z := c.ACME(c.RhoAtZero); math.Abs(z) > 1e-12 {
			t.Errorf("ACME at its zero crossing: %v", z)
		}
		m, err := FitModel(cov, 200_000, [][]int{{1}, nil, {0, 1}, {0, 1, 2}}, OLS)
		if err != nil {
			t.Fatal(err)
		}
		est, err := Effect(m, Path{From: 0, To: 3, Through: []int{2}})
		if err != nil || !scalar.EqualWithinAbsOrRel(c.ACME(0), est.Effect, 1e-10, 1e-10) {
			t.Errorf("ACME(0) %v, product of coefficients %v (%v)", c.ACME(0), est.Effect, err)
		}
	}
}

func TestMediatorConfounding_Errors(t *testing.T) {
	cov := mat.NewSymDense(3, []float64{1, 0.3, 0.2, 0.3, 1, 0.4, 0.2, 0.4, 1})
	if _, err := MediatorConfounding(cov, 0, 1, 2, []int{1}); err == nil {
		t.Error("mediator among the covariates: no error")
	}
	if _, err := MediatorConfounding(cov, 0, 1, 2, []int{7}); err == nil {
		t.Error("covariate out of range: no error")
	}
}
