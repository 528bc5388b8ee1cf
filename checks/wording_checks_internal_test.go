package checks

import (
	"math/big"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
)

// A correlation-scale claim is taken to d = 2r/√(1 − r²) (Borenstein et
// al. 2009, eq. 7.5) before exp(0.91 d), its interval limit likewise; a
// standardized coefficient is d itself. r = 0.5 (0.4 to 0.6): d = 1.1547,
// E = 5.1662 and 3.8512; as a standardized coefficient 0.5 (0.4 to 0.6):
// E = 2.5291 and 2.2340 (E = RR + √(RR(RR − 1)), VanderWeele & Ding 2017;
// figures by hand with Python's math).
func TestConvertStandardized_Correlation(t *testing.T) {
	a := &Analysis{Study: &Study{Package: &Package{Variables: []Variable{
		{Name: "x", Scale: ScaleContinuous}, {Name: "y", Scale: ScaleContinuous}}},
		Index: map[string]int{"x": 0, "y": 1}}}
	c := Claim{ID: "R1", From: "x", To: "y"}
	for _, tc := range []struct {
		scale     string
		est, lim  float64
		converted bool
	}{
		{"correlation", 5.16617042811157, 3.851241715083324, true},
		{"standardized", 2.5291419818612693, 2.2339706726333324, false},
	} {
		ev := a.convertStandardized(c, tc.scale, 0.5, nil, []float64{0.4, 0.6})
		if ev == nil || !scalar.EqualWithinRel(*ev.Estimate, tc.est, 1e-8) ||
			!scalar.EqualWithinRel(*ev.CILimit, tc.lim, 1e-8) {
			t.Fatalf("%s: %+v, want E %g and %g", tc.scale, ev, tc.est, tc.lim)
		}
		if got := strings.Contains(ev.Conversion, "2r/√(1 − r²)"); got != tc.converted {
			t.Errorf("%s: conversion %q", tc.scale, ev.Conversion)
		}
	}
}

// An undiscussed class that background knowledge narrows to the declared
// graph alone asks the authors for nothing: it is noted, not warned about;
// one with other plausible members is warned about.
func TestDiscussionFinding_OnlyDeclaredPlausible(t *testing.T) {
	s := &Study{Package: &Package{Graph: &Graph{}}}
	for _, tc := range []struct {
		size, plausible int64
		want            string
	}{
		{3, 1, SeverityInfo}, {3, 2, StatusWarn},
	} {
		eq := &equivalenceResult{size: big.NewInt(tc.size), plausible: big.NewInt(tc.plausible)}
		fs := discussionFinding(s, eq)
		if len(fs) != 1 || fs[0].Severity != tc.want {
			t.Errorf("class %d, plausible %d: %+v, want one %s finding", tc.size, tc.plausible, fs, tc.want)
		}
	}
}
