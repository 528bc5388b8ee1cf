package checks_test

import (
	"strings"
	"testing"
)

// In tutoring-anxiety the arrows behind C1 and C2, and the path behind
// the total effect C3, point the other way in 3 of the 6 plausible
// equivalents (see its equivalence findings): each E-value must say it
// assumes the declared direction. sleep-attention's claims keep an
// effect in every plausible equivalent, so theirs must not.
func TestConfounding_EValueCautionsUnorientedDirection(t *testing.T) {
	const caution = "it says nothing of that direction, which the data cannot settle: in 3 of the 6 plausible " +
		"equivalent graphs"
	r := mustRun(t, MustLoad(t, "../testdata/demo/tutoring-anxiety/package.json"))
	got := map[string]bool{}
	for _, f := range checkOf(r, "confounding-sensitivity").Findings {
		got[f.Claim] = got[f.Claim] || strings.Contains(f.Message, caution)
	}
	for _, id := range []string{"C1", "C2", "C3"} {
		if !got[id] {
			t.Errorf("%s: no caution that the E-value assumes the declared direction", id)
		}
	}
	r = mustRun(t, MustLoad(t, "../testdata/demo/sleep-attention/package.json"))
	for _, f := range checkOf(r, "confounding-sensitivity").Findings {
		if strings.Contains(f.Message, "says nothing of that direction") {
			t.Errorf("sleep-attention %s: caution where no equivalent gives the claim zero: %s", f.Claim, f.Message)
		}
	}
}
