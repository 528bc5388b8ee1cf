package effects

import (
	"encoding/json"
	"math"
	"os"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
)

// tailRef is the far-tail part of testdata/reference/scipy/reference.json,
// computed by Debian's python3-scipy (norm.sf, t.sf, chi2.sf, nct).
type tailRef struct {
	Normal []struct{ Z, SF float64 }     `json:"norm_sf_tail"`
	T      []struct{ T, DF, SF float64 } `json:"t_sf_tail"`
	Chi2   []struct{ X, DF, SF float64 } `json:"chi2_sf_tail"`
	Chi2M  []struct{ X, DF, SF float64 } `json:"chi2_sf"`
	PowerT []struct {
		NCP, DF, Alpha, Power float64
	} `json:"power_t"`
	TOSTT []struct{ B, SE, Delta, DF, P float64 } `json:"tost_t"`
	TQ    []struct{ Q, DF, X float64 }            `json:"t_quantile"`
}

// closeRel is |got/want − 1| ≤ tol, meaningful below the smallest normal
// double too (scalar.EqualWithinRel turns absolute there).
func closeRel(got, want, tol float64) bool {
	return want != 0 && math.Abs(got/want-1) <= tol
}

func readTailRef(t *testing.T) tailRef {
	t.Helper()
	b, err := os.ReadFile("../../testdata/reference/scipy/reference.json")
	if err != nil {
		t.Fatal(err)
	}
	var ref tailRef
	if err := json.Unmarshal(b, &ref); err != nil || len(ref.Normal) == 0 || len(ref.T) == 0 || len(ref.Chi2) == 0 {
		t.Fatalf("reference: %v", err)
	}
	return ref
}

// Tail areas down to 1e-308 keep their relative precision: the normal
// past |z| = 8 (where 1 − Φ rounds to 0), t with up to 1e15 df (where the
// incomplete beta loses every digit), the chi-square to 1e-300.
func TestTails_Scipy(t *testing.T) {
	ref := readTailRef(t)
	for _, c := range ref.Normal {
		if got := NormalSF(c.Z); !closeRel(got, c.SF, 1e-12) {
			t.Errorf("normal sf(%v) = %g, scipy %g", c.Z, got, c.SF)
		}
		if got := PFromZ(c.Z, 1); !closeRel(got, 2*c.SF, 1e-12) {
			t.Errorf("two-sided p(z = %v) = %g, scipy %g", c.Z, got, 2*c.SF)
		}
	}
	for _, c := range ref.T {
		if got := TSF(c.T, c.DF); !closeRel(got, c.SF, 1e-9) {
			t.Errorf("t sf(%v; %v) = %g, scipy %g", c.T, c.DF, got, c.SF)
		}
		if got := TSF(-c.T, c.DF); !scalar.EqualWithinAbs(got, 1-c.SF, 1e-15) {
			t.Errorf("t sf(%v; %v) = %g, scipy %g", -c.T, c.DF, got, 1-c.SF)
		}
	}
	for _, c := range append(ref.Chi2, ref.Chi2M...) {
		if got := ChiSquaredSF(c.X, c.DF); !closeRel(got, c.SF, 1e-12) {
			t.Errorf("chi2 sf(%v; %v) = %g, scipy %g", c.X, c.DF, got, c.SF)
		}
	}
}

// The t-based TOST against scipy's t, and the power of the t test against
// the exact noncentral t (scipy's nct), to 2e-9 (the error of scipy's own
// t quantile, testdata/reference/scipy/nct_reference.py).
func TestTOSTAndPower_T_Scipy(t *testing.T) {
	ref := readTailRef(t)
	if len(ref.PowerT) == 0 || len(ref.TOSTT) == 0 {
		t.Fatal("reference: no power_t or tost_t")
	}
	for _, c := range ref.TOSTT {
		if got := TOST(c.B, c.SE, c.Delta, c.DF); !scalar.EqualWithinRel(got, c.P, 1e-10) {
			t.Errorf("TOST(%v, %v, %v; t(%v)) = %v, scipy %v", c.B, c.SE, c.Delta, c.DF, got, c.P)
		}
	}
	for _, c := range ref.PowerT {
		if got := Power(c.NCP, 1, c.Alpha, c.DF); !scalar.EqualWithinAbs(got, c.Power, 2e-9) {
			t.Errorf("power(ncp %v, t(%v), α %v) = %v, scipy nct %v", c.NCP, c.DF, c.Alpha, got, c.Power)
		}
	}
}

// t quantiles to df = 1e15, and far in the lower tail.
func TestTQuantile_Scipy(t *testing.T) {
	ref := readTailRef(t)
	if len(ref.TQ) == 0 {
		t.Fatal("reference: no t_quantile")
	}
	for _, c := range ref.TQ {
		if got := TQuantile(c.Q, c.DF); !closeRel(got, c.X, 1e-10) {
			t.Errorf("t quantile %v, df %v: %v, scipy %v", c.Q, c.DF, got, c.X)
		}
	}
}
