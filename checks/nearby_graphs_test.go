package checks_test

import (
	"bytes"
	"math"
	"os"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/load"
	"github.com/pathvet/pathvet/checks/render"
)

// The case the nearby-graphs check exists for: a clean randomized package
// whose headline direct effect N1 (offered → wellbeing) is significant at
// .01 (p = .0086) while the graph without that arrow fits within ΔBIC 2.
// The closed form, from the package's correlations (r12 = .30, r13 = .21,
// r23 = .35, N = 500): the partial correlation of offered and wellbeing
// given volunteer_hours is
//
//	r = (r13 − r12 r23) / sqrt((1 − r12²)(1 − r23²)) = 0.105 / sqrt(0.91 · 0.8775)
//
// and removing the arrow changes BIC by −(N − 1) ln(1 − r²) − ln N ≈ 0.72.
func TestNearbyGraphs_HeadlineArrowWithinTwo(t *testing.T) {
	r := mustRun(t, MustLoad(t, "../testdata/calibration/nearby-headline/package.json"))
	pr := 0.105 / math.Sqrt(0.91*0.8775)
	want := -499*math.Log(1-pr*pr) - math.Log(500)
	if r.Graph == nil || len(r.Graph.NearbyGraphs) == 0 {
		t.Fatal("no nearby graphs in the report")
	}
	first := r.Graph.NearbyGraphs[0]
	if len(first.Edits) != 1 || first.Edits[0] != (checks.GraphEdit{Op: "remove", From: "offered", To: "wellbeing"}) {
		t.Fatalf("best nearby class: %+v", first.Edits)
	}
	if first.DeltaBIC == nil || !scalar.EqualWithinAbsOrRel(*first.DeltaBIC, want, 1e-8, 1e-8) ||
		first.Evidence != "indistinguishable" {
		t.Errorf("ΔBIC %v (%s), closed form %g", first.DeltaBIC, first.Evidence, want)
	}
	n1 := first.Claims["N1"]
	if !n1.Changed || n1.Min == nil || *n1.Min != 0 || *n1.Max != 0 || *n1.ShareSignificantSameSign != 0 {
		t.Errorf("N1 across the class: %+v", n1)
	}
	c := checkOf(r, "nearby-graphs")
	if c.Status != checks.StatusFail || c.Deduction != 25 || r.Score != 75 {
		t.Errorf("nearby-graphs %s −%d, score %d; want fail −25, score 75", c.Status, c.Deduction, r.Score)
	}
	found := false
	for _, f := range c.Findings {
		found = found || f.Severity == checks.StatusFail && f.Claim == "N1" &&
			strings.Contains(
				f.Message,
				"without the arrow offered → wellbeing",
			) && strings.Contains(f.Message, "ΔBIC = +0.72")
	}
	if !found {
		t.Errorf("no fail finding naming the edit and the ΔBIC: %+v", c.Findings)
	}
	var text bytes.Buffer
	if err := render.WriteText(&text, r); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(
		text.String(),
		"+0.72  remove offered → wellbeing (indistinguishable); class of 3, 1 plausible; changed:",
	) {
		t.Errorf("the text view lacks the nearby line:\n%s", text.String())
	}
}

// With the arrow stated as an alternative the headline change is only a
// warning: the authors weighed that graph.
func TestNearbyGraphs_StatedAlternativeWarns(t *testing.T) {
	doc, err := os.ReadFile("../testdata/calibration/nearby-headline/package.json")
	if err != nil {
		t.Fatal(err)
	}
	doc = bytes.Replace(doc, []byte(`{"name": "no-hours-effect",`), []byte(`{"name": "no-direct-effect",
     "edges": [{"from": "offered", "to": "volunteer_hours"}, {"from": "volunteer_hours", "to": "wellbeing"}]},
    {"name": "no-hours-effect",`), 1)
	s, err := load.Load(doc, load.Options{})
	if err != nil {
		t.Fatal(err)
	}
	r := mustRun(t, s)
	c := checkOf(r, "nearby-graphs")
	if c.Status != checks.StatusWarn || r.Graph.NearbyGraphs[0].Alternative != "no-direct-effect" {
		t.Errorf(
			"nearby-graphs %s, alternative %q; want warn, no-direct-effect",
			c.Status,
			r.Graph.NearbyGraphs[0].Alternative,
		)
	}
}

// A claim that already changes among the declared graph's own equivalents
// (tutoring-anxiety's C2) is noted by nearby-graphs, not weighed again.
func TestNearbyGraphs_EquivalenceNotCountedTwice(t *testing.T) {
	r := mustRun(t, MustLoad(t, "../testdata/demo/tutoring-anxiety/package.json"))
	var c2 *checks.ClaimReport
	for i := range r.Claims {
		if r.Claims[i].ID == "C2" {
			c2 = &r.Claims[i]
		}
	}
	if c2 == nil || c2.AcrossEquivalents == nil || !c2.AcrossEquivalents.Unstable {
		t.Fatal("C2 should change among the equivalent graphs")
	}
	seen := false
	for _, f := range checkOf(r, "nearby-graphs").Findings {
		if f.Claim == "C2" {
			seen = true
			if f.Severity != checks.SeverityInfo || !strings.Contains(f.Message, "weighed with them rather than here") {
				t.Errorf("C2: %s %q", f.Severity, f.Message)
			}
		}
	}
	if !seen {
		t.Error("no C2 finding")
	}
}

// Where the edit changes a binary variable's equation (coding-club:
// without parent_degree → club_member, club_member binary) the linear
// score is approximate, so the headline change is a warning.
func TestNearbyGraphs_BinaryEquationWarns(t *testing.T) {
	r := mustRun(t, MustLoad(t, "../testdata/demo/coding-club/package.json"))
	c := checkOf(r, "nearby-graphs")
	if c.Status != checks.StatusWarn {
		t.Fatalf("nearby-graphs %s", c.Status)
	}
	for _, f := range c.Findings {
		if f.Claim == "H1" && (f.Severity != checks.StatusWarn || !strings.Contains(f.Message, "approximate") ||
			!strings.Contains(f.Message, "without the arrow parent_degree → club_member")) {
			t.Errorf("H1: %s %q", f.Severity, f.Message)
		}
	}
}
