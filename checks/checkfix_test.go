package checks_test

import (
	"bytes"
	"os"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/load"
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

// A package with no claim open to the correction (R1 points against the
// graph's arrow, R2 has a binary outcome): measurement re-estimates none
// and must say so with a warning, not pass.
func TestMeasurement_NothingReestimatedIsNotAPass(t *testing.T) {
	doc, err := os.ReadFile("../testdata/calibration/clean-randomized/package.json")
	if err != nil {
		t.Fatal(err)
	}
	doc = bytes.ReplaceAll(doc, []byte(`"total_effect", "from": "offered", "to": "reading_score"`),
		[]byte(`"total_effect", "from": "reading_score", "to": "minutes_read"`))
	doc = bytes.ReplaceAll(doc, []byte(`"total_effect", "from": "offered", "to": "minutes_read"`),
		[]byte(`"total_effect", "from": "minutes_read", "to": "offered"`))
	s, err := load.Load(doc, load.Options{})
	if err != nil {
		t.Fatal(err)
	}
	c := checkOf(mustRun(t, s), "measurement")
	if c.Status != checks.StatusWarn || !strings.Contains(c.Summary, "no claim could be re-estimated") {
		t.Fatalf("measurement %s: %q", c.Status, c.Summary)
	}
	found := false
	for _, f := range c.Findings {
		found = found || f.Severity == checks.StatusWarn && strings.Contains(f.Message, "R1 is given no effect") &&
			strings.Contains(f.Message, "R2 has a binary outcome")
	}
	if !found {
		t.Errorf("no warning naming why R1 and R2 were not re-estimated: %+v", c.Findings)
	}
}
