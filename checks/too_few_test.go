package checks_test

import (
	"bytes"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/load"
	"github.com/pathvet/pathvet/checks/render"
)

// fiveRows is a study of five cases: x → m → y, one implied independence
// (x and y given m), a claim of m on y.
const fiveRows = `{"format_version": 1, "title": "Five cases", "design": "observational",
	"variables": [{"name": "x", "scale": "continuous"}, {"name": "m", "scale": "continuous"},
	{"name": "y", "scale": "continuous"}],
	"graph": {"edges": [{"from": "x", "to": "m"}, {"from": "m", "to": "y"}], "equivalents_discussed": true},
	"claims": [{"id": "C1", "text": "m goes with y", "kind": "association", "from": "m", "to": "y",
	"estimate": 0.4, "ci": [-0.9, 1.7], "p_value": 0.38}],
	"missing_data": {"method": "none"},
	"data": {"kind": "rows", "csv": "x,m,y\n1,2.1,3.0\n2,2.4,2.2\n3,3.9,4.1\n4,3.1,3.3\n5,5.2,4.0\n"}}`

// An n = 5 study: the tests have almost no power (the power of Fisher's z
// to detect a partial correlation of 0.5 is 0.12 on n − 3 = 2 and 0.09 on
// n − 4 = 1: Φ-based closed form, Cohen 1988 ch. 3, recomputed in
// TestLargeEffectPower), so graph-fit says the fit test cannot tell and
// never that the data do not contradict the graph, the claim is said to
// rest on too few cases, and the score is capped at moderate concern, in
// the JSON, the text, the page and the letter alike.
func TestTooFewCases_FiveRows(t *testing.T) {
	s, err := load.Load([]byte(fiveRows), load.Options{})
	if err != nil {
		t.Fatal(err)
	}
	r := mustRun(t, s)
	fit := checkOf(r, "graph-fit")
	if fit.Status != checks.StatusWarn || !strings.Contains(fit.Summary, "the fit test cannot tell") ||
		strings.Contains(fit.Summary, "do not contradict the declared graph") {
		t.Errorf("graph-fit %s: %q", fit.Status, fit.Summary)
	}
	found := false
	for _, f := range checkOf(r, "effect-reporting").Findings {
		found = found || f.Claim == "C1" && strings.HasPrefix(f.Message, "With 5 cases and nothing adjusted for, "+
			"the data can hardly tell C1's size or sign") && strings.Contains(f.Message, "probability 0.12")
	}
	if !found {
		t.Errorf("effect-reporting findings %+v", checkOf(r, "effect-reporting").Findings)
	}
	if r.Score != checks.MaxScoreTooFewCases || r.Band != checks.BandModerate || r.ScoreCap == nil ||
		r.ScoreCap.Uncapped <= r.Score || !strings.Contains(r.ScoreCap.Reason, "graph-fit and effect-reporting") {
		t.Fatalf("score %d, band %s, cap %+v", r.Score, r.Band, r.ScoreCap)
	}
	var text, page, letter bytes.Buffer
	if err := render.WriteText(&text, r); err != nil {
		t.Fatal(err)
	}
	if err := render.WritePage(&page, r, render.PageOptions{}); err != nil {
		t.Fatal(err)
	}
	if err := render.WriteLetter(&letter, render.DefaultLetter(r)); err != nil {
		t.Fatal(err)
	}
	for name, out := range map[string]string{"text": text.String(), "page": page.String()} {
		if !strings.Contains(strings.Join(strings.Fields(out), " "), "The score is capped at 79 (moderate concern)") {
			t.Errorf("%s does not say the score is capped", name)
		}
	}
	if strings.Contains(letter.String(), "score") { // the authors' letter carries no triage figure
		t.Errorf("the letter speaks of the score:\n%s", letter.String())
	}
}

// Enough cases: no cap, and graph-fit's pass sentence stands (the
// coding-club demo, 340 complete rows).
func TestTooFewCases_NotForEnoughCases(t *testing.T) {
	r := mustRun(t, MustLoad(t, "../testdata/demo/coding-club/package.json"))
	if r.ScoreCap != nil {
		t.Errorf("cap %+v", r.ScoreCap)
	}
	for _, c := range r.Checks {
		for _, f := range c.Findings {
			if f.Details["too_few_cases"] == true {
				t.Errorf("%s: %s", c.ID, f.Message)
			}
		}
	}
}

// With four cases the implication given one variable has no degrees of
// freedom left for Fisher's z (n − k − 3 = 0): the sentence says so rather
// than quote a power of 0.
func TestTooFewCases_NoTestAtAll(t *testing.T) {
	doc := strings.Replace(fiveRows, `\n5,5.2,4.0\n`, `\n`, 1)
	s, err := load.Load([]byte(doc), load.Options{})
	if err != nil {
		t.Fatal(err)
	}
	r := mustRun(t, s)
	fit := checkOf(r, "graph-fit")
	msg := ""
	for _, f := range fit.Findings {
		if f.Details["too_few_cases"] == true {
			msg = f.Message
		}
	}
	if !strings.Contains(msg, "With 4 cases, the test of the graph's one implied independence cannot tell: so few "+
		"cases leave no degrees of freedom for a test by Fisher's z") || r.Score > checks.MaxScoreTooFewCases {
		t.Errorf("graph-fit %s %q %+v; score %d", fit.Status, fit.Summary, fit.Findings, r.Score)
	}
}
