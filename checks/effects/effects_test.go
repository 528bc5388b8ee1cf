package effects

import (
	"encoding/json"
	"math"
	"os"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
	"gonum.org/v1/gonum/mat"
)

// The E-value paper's own worked examples (VanderWeele & Ding 2017, Annals
// of Internal Medicine 167, printed there): RR 3.9 (1.8–8.7) gives E 7.26
// and 3.00 for the interval; RR 0.80 (0.71–0.91) gives 1.81 and 1.43.
func TestEValue_PaperExamples(t *testing.T) {
	for _, c := range []struct{ rr, lo, hi, e, eCI float64 }{
		{3.9, 1.8, 8.7, 7.26, 3.00},
		{0.80, 0.71, 0.91, 1.81, 1.43},
	} {
		if got := EValue(c.rr); !scalar.EqualWithinAbs(got, c.e, 0.005) {
			t.Errorf("E(%v) = %v, paper %v", c.rr, got, c.e)
		}
		if got := EValueCI(c.lo, c.hi); !scalar.EqualWithinAbs(got, c.eCI, 0.005) {
			t.Errorf("E(CI %v–%v) = %v, paper %v", c.lo, c.hi, got, c.eCI)
		}
	}
	// The closed form: E = RR + sqrt(RR(RR − 1)), reciprocal below 1.
	for _, rr := range []float64{1, 1.2, 2.5, 10} {
		want := rr + math.Sqrt(rr*(rr-1))
		if !scalar.EqualWithinRel(EValue(rr), want, 1e-15) ||
			!scalar.EqualWithinRel(EValue(1/rr), want, 1e-12) {
			t.Errorf("E(%v)", rr)
		}
	}
	if EValueCI(0.9, 1.3) != 1 {
		t.Error("an interval including 1 has E-value 1")
	}
}

// A standardized β = .31 with SE .05: RR 1.3259, E 1.983, interval-limit
// E 1.721 (reference-values.md [computed]).
func TestRRFromD(t *testing.T) {
	rr, limit := RRFromD(0.31, 0.05)
	if !scalar.EqualWithinAbs(rr, 1.3259, 5e-5) || !scalar.EqualWithinAbs(EValue(rr), 1.983, 5e-4) ||
		!scalar.EqualWithinAbs(EValue(limit), 1.721, 5e-4) {
		t.Fatalf("RR %v, E %v, limit E %v", rr, EValue(rr), EValue(limit))
	}
	if rr, limit := RRFromD(-0.31, 0.05); !scalar.EqualWithinAbs(EValue(rr), 1.983, 5e-4) ||
		!scalar.EqualWithinAbs(EValue(limit), 1.721, 5e-4) {
		t.Fatal("a negative coefficient has the same E-values")
	}
	if RRFromOR(4, true) != 4 || RRFromOR(4, false) != 2 {
		t.Fatal("odds ratio conversions")
	}
}

// TOST by hand: estimate 0.02, SE 0.03, margin 0.1: the one-sided z are
// (0.02 + 0.1)/0.03 = 4 and (0.02 − 0.1)/0.03 = −2.6667, so p = Φ(−2.6667)
// = 0.0038304 (the larger), equivalence at .05. With SE 0.08: z = 1.5 and
// −1, p = Φ(−1) = 0.158655: the data do not tell.
func TestTOST_ByHand(t *testing.T) {
	if p := TOST(0.02, 0.03, 0.1, Normal); !scalar.EqualWithinAbs(p, 0.0038304, 1e-7) {
		t.Errorf("p = %v", p)
	}
	if p := TOST(0.02, 0.08, 0.1, Normal); !scalar.EqualWithinAbs(p, 0.158655, 1e-6) {
		t.Errorf("p = %v", p)
	}
}

type powerRef struct {
	Power []struct{ Rho, N, Alpha, Power float64 } `json:"power_fisher_z"`
	TTwo  []struct{ T, DF, P float64 }             `json:"t_two_sided_p"`
	ZTwo  []struct{ Z, P float64 }                 `json:"z_two_sided_p"`
}

// Power of the Fisher-z test of a correlation and p-values from t and z,
// against values computed with scipy (testdata/reference/scipy).
func TestPowerAndP_Scipy(t *testing.T) {
	b, err := os.ReadFile("../../testdata/reference/scipy/reference.json")
	if err != nil {
		t.Fatal(err)
	}
	var ref powerRef
	if err := json.Unmarshal(b, &ref); err != nil || len(ref.Power) == 0 {
		t.Fatalf("reference: %v", err)
	}
	for _, c := range ref.Power {
		if got := powerCorrelation(c.Rho, int(c.N), 0, c.Alpha); !scalar.EqualWithinAbs(got, c.Power, 1e-10) {
			t.Errorf("power(ρ %v, n %v) = %v, scipy %v", c.Rho, c.N, got, c.Power)
		}
	}
	for _, c := range ref.TTwo {
		if got := PFromT(c.T, 1, c.DF); !scalar.EqualWithinAbsOrRel(got, c.P, 1e-14, 1e-10) {
			t.Errorf("t %v df %v: %v, scipy %v", c.T, c.DF, got, c.P)
		}
	}
	for _, c := range ref.ZTwo {
		if got := PFromZ(c.Z, 1); !scalar.EqualWithinRel(got, c.P, 1e-10) {
			t.Errorf("z %v: %v, scipy %v", c.Z, got, c.P)
		}
	}
	// b = .33, SE = .08: z = 4.125, p = .0000371 (reference-values.md).
	if p := PFromZ(0.33, 0.08); !scalar.EqualWithinAbs(p, 0.0000371, 5e-8) {
		t.Errorf("p = %v", p)
	}
}

// Spearman's correction: .30 with reliabilities .8 and .7 gives .4009
// (reference-values.md [computed]).
func TestCorrectAttenuation(t *testing.T) {
	r := mat.NewSymDense(2, []float64{1, .3, .3, 1})
	c, err := CorrectAttenuation(r, []float64{.8, .7})
	if err != nil || !scalar.EqualWithinAbs(c.At(0, 1), .4009, 5e-5) || c.At(0, 0) != 1 {
		t.Fatalf("%v, %v", c, err)
	}
	if _, err := CorrectAttenuation(r, []float64{0, 1}); err != ErrReliability {
		t.Fatal("zero reliability accepted")
	}
}
