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

// With n = 4, the total effect T1 of m on y is y regressed on m and m's
// parents: under the declared graph that is m and x (it needs 4 cases),
// under the stated alternative, which gives m a second parent w and fits
// about as well, it is m, x and w (it needs 5), though that graph itself
// can be fitted (no equation has more than 2 parents). The claim cannot
// be weighed there, and alternatives must warn, not pass.
func TestAlternatives_UnestimatedUnderCloseAlternativeWarns(t *testing.T) {
	doc := []byte(`{"format_version": 1, "title": "Invented test package", "design": "observational",
  "variables": [{"name": "x", "scale": "continuous", "reliability": 0.9},
    {"name": "w", "scale": "continuous", "reliability": 0.9},
    {"name": "m", "scale": "continuous", "reliability": 0.9}, {"name": "y", "scale": "continuous", "reliability": 0.9}],
  "graph": {"edges": [{"from": "x", "to": "m"}, {"from": "m", "to": "y"}, {"from": "w", "to": "y"}],
    "justification": "Invented.", "equivalents_discussed": true},
  "alternatives": [{"name": "two-causes", "edges": [{"from": "x", "to": "m"}, {"from": "w", "to": "m"},
    {"from": "m", "to": "y"}], "justification": "Invented."}],
  "claims": [{"id": "T1", "text": "m raises y", "kind": "total_effect", "from": "m", "to": "y",
    "estimate": 0.35, "estimate_scale": "standardized"}],
  "missing_data": {"method": "none"},
  "data": {"kind": "summary", "n": 4, "variables": ["x", "w", "m", "y"],
    "correlations": [[1], [0.1, 1], [0.3, 0.2, 1], [0.2, 0.25, 0.35, 1]], "sds": [1, 1, 1, 1],
    "means": [0, 0, 0, 0]}}`)
	s, err := load.Load(doc, load.Options{})
	if err != nil {
		t.Fatal(err)
	}
	c := checkOf(mustRun(t, s), "alternatives")
	found := false
	for _, f := range c.Findings {
		found = found || f.Severity == checks.StatusWarn && f.Claim == "T1" &&
			strings.Contains(f.Message, `could not be estimated under the alternative "two-causes"`)
	}
	if c.Status == checks.StatusPass || !found || strings.Contains(c.Summary, "changes sign") {
		t.Errorf("alternatives %s %q: %+v", c.Status, c.Summary, c.Findings)
	}
}

// The nearby-graphs warning names the reasons that apply: tutoring-anxiety
// warns only because the greedy search ends clearly better (ΔBIC −9.28),
// coding-club only because a claim changes in a class within ΔBIC 2.
func TestNearbyGraphs_WarnSummaryNamesItsReason(t *testing.T) {
	for _, tc := range []struct{ demo, want string }{
		{"tutoring-anxiety", "The graphs near the declared one need a look: a greedy search finds graphs that fit " +
			"clearly better (ΔBIC = -9.28); see the findings."},
		{"coding-club", "The graphs near the declared one need a look: a claim changes sign or significance in a " +
			"graph that fits about as well (|ΔBIC| < 2); see the findings."},
	} {
		c := checkOf(mustRun(t, MustLoad(t, "../testdata/demo/"+tc.demo+"/package.json")), "nearby-graphs")
		if c.Status != checks.StatusWarn || c.Summary != tc.want {
			t.Errorf("%s: %s %q\nwant warn %q", tc.demo, c.Status, c.Summary, tc.want)
		}
	}
}

// The listed classes that fit better by 2 or more (sleep-attention has
// one, tutoring-anxiety two) have their claims re-estimated, as the
// classes within 2 do.
func TestNearbyGraphs_BetterClassesReestimated(t *testing.T) {
	for _, demo := range []string{"sleep-attention", "tutoring-anxiety"} {
		r := mustRun(t, MustLoad(t, "../testdata/demo/"+demo+"/package.json"))
		better := 0
		for _, g := range r.Graph.NearbyGraphs {
			if g.DeltaBIC != nil && *g.DeltaBIC <= -2 {
				better++
				if len(g.Claims) == 0 {
					t.Errorf("%s: class %+v (ΔBIC %.2f) fits better by 2 but its claims were not re-estimated",
						demo, g.Edits, *g.DeltaBIC)
				}
			}
		}
		if better == 0 {
			t.Errorf("%s: no listed class fits better by 2 or more", demo)
		}
	}
}
