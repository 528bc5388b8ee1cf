package checks_test

import (
	"bytes"
	"os"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/load"
)

// calibration are the scores the README quotes (section "Score"), held
// exactly, so that a change that moves one must change the README too: a
// clean randomized study with complete reporting scores 100; the flawed
// demos and a purpose-built flawed package score below 50; the coding-club
// demo and a clean package whose headline arrow the graph without it fits
// about as well (nearby-headline) are of moderate concern.
var calibration = []struct {
	path, readme string
	score        int
	band         string
}{
	{
		"../testdata/calibration/clean-randomized/package.json",
		"`testdata/calibration/clean-randomized` scores 100",
		100,
		checks.BandLow,
	},
	{
		"../testdata/calibration/bare-claims/package.json",
		"`testdata/calibration/bare-claims` (20)",
		20,
		checks.BandHigh,
	},
	{"../testdata/demo/tutoring-anxiety/package.json", "tutoring-anxiety (25)", 25, checks.BandHigh},
	{"../testdata/demo/sleep-attention/package.json", "sleep-attention (35)", 35, checks.BandHigh},
	{"../testdata/demo/mentoring-waves/package.json", "mentoring-waves (10)", 10, checks.BandHigh},
	{
		"../testdata/demo/coding-club/package.json",
		"coding-club demo scores 65 (moderate concern)",
		65,
		checks.BandModerate,
	},
	{
		"../testdata/calibration/nearby-headline/package.json",
		"within ΔBIC 2 (75, moderate concern)",
		75,
		checks.BandModerate,
	},
}

func TestScore_Calibration(t *testing.T) {
	readme, err := os.ReadFile("../README.md")
	if err != nil {
		t.Fatal(err)
	}
	text := strings.Join(strings.Fields(string(readme)), " ")
	for _, tc := range calibration {
		r := mustRun(t, MustLoad(t, tc.path))
		if r.Score != tc.score || r.Band != tc.band {
			t.Errorf("%s scores %d (%s), want %d (%s)", tc.path, r.Score, r.Band, tc.score, tc.band)
		}
		if !strings.Contains(text, tc.readme) {
			t.Errorf("the README does not quote %q", tc.readme)
		}
	}
}

// Every check id of the report format runs on every demo.
func TestRun_EveryCheckOnEveryDemo(t *testing.T) {
	ids := []string{"graph-declared", "graph-fit", "equivalence", "alternatives", "nearby-graphs", "missing-data",
		"effect-reporting", "confounding-sensitivity", "measurement", "causal-language"}
	for _, path := range demoPackages(t) {
		r := mustRun(t, MustLoad(t, path))
		if len(r.Checks) != len(ids) {
			t.Fatalf("%s: %d checks", path, len(r.Checks))
		}
		for i, c := range r.Checks {
			if c.ID != ids[i] || c.RunError != "" {
				t.Errorf("%s: check %d is %s (run error %q), want %s", path, i, c.ID, c.RunError, ids[i])
			}
			for _, f := range c.Findings {
				if f.Message == "" || f.Severity == "" {
					t.Errorf("%s %s: empty finding", path, c.ID)
				}
			}
		}
	}
}

// A package whose claims are complete and consistent gets no
// effect-reporting finding above info; with a p-value that its estimate
// and SE do not allow, that claim is flagged.
func TestEffectReporting_Consistency(t *testing.T) {
	path := "../testdata/calibration/clean-randomized/package.json"
	c := checkOf(mustRun(t, MustLoad(t, path)), "effect-reporting")
	for _, f := range c.Findings {
		if f.Severity != checks.SeverityInfo {
			t.Fatalf("clean package: %s finding %q", f.Severity, f.Message)
		}
	}
	doc, _ := os.ReadFile(path)
	doc = bytes.Replace(doc, []byte(`"std_error": 0.030,
     "ci": [0.26, 0.38], "p_value": 0.001, "p_relation": "<"`), []byte(`"std_error": 0.030,
     "ci": [0.26, 0.38], "p_value": 0.06`), 1)
	s, err := load.Load(doc, load.Options{})
	if err != nil {
		t.Fatal(err)
	}
	c = checkOf(mustRun(t, s), "effect-reporting")
	flagged := false
	for _, f := range c.Findings {
		if f.Claim == "R2" && f.Severity == checks.StatusWarn {
			flagged = true
		}
		if f.Claim == "R1" && f.Severity != checks.SeverityInfo {
			t.Errorf("R1 flagged: %s", f.Message)
		}
	}
	if !flagged {
		t.Fatalf("inconsistent p not flagged: %+v", c.Findings)
	}
}

// A claim of no effect: the sleep demo's headline is contradicted by the
// data; the coding-club H3 is backed by an equivalence test.
func TestEffectReporting_Absence(t *testing.T) {
	r := mustRun(t, MustLoad(t, "../testdata/demo/sleep-attention/package.json"))
	if a := r.Claims[0].Absence; a == nil || a.Verdict != "effect_found" {
		t.Fatalf("sleep demo S1: %+v", a)
	}
	// the estimate weighed is the complete cases', and the sentence says so
	if f := checkOf(r, "effect-reporting").Findings; len(f) == 0 ||
		!strings.Contains(f[0].Message, "recomputed from the 152 complete rows (of 300) is 0.20") {
		t.Errorf("S1's sentence does not name its data: %+v", f)
	}
	r = mustRun(t, MustLoad(t, "../testdata/demo/coding-club/package.json"))
	if a := r.Claims[2].Absence; a == nil || a.Verdict != "excludes_meaningful_effects" || a.Power == nil ||
		*a.Power <= 0 ||
		*a.Power >= 1 {
		t.Fatalf("coding-club H3: %+v", a)
	}
	// the package sets no margin, so the sentence says it is the default
	found := false
	for _, f := range checkOf(r, "effect-reporting").Findings {
		found = found ||
			f.Claim == "H3" && strings.Contains(f.Message, "±0.1, standardized, is the default smallest effect")
	}
	if !found {
		t.Errorf(
			"H3's equivalence finding does not say its margin is the default: %+v",
			checkOf(r, "effect-reporting").Findings,
		)
	}
}

// E-values for the causal claims of a non-randomized design, none for a
// randomized one.
func TestConfounding_EValues(t *testing.T) {
	r := mustRun(t, MustLoad(t, "../testdata/demo/coding-club/package.json"))
	ev := r.Claims[0].EValue
	// H1 reports β = .52, SE .045: RR = exp(0.91 × .52) = 1.6055, E = 2.590.
	if ev == nil || *ev.Estimate < 2.589 || *ev.Estimate > 2.591 || ev.Source != "reported" {
		t.Fatalf("H1 E-value %+v", ev)
	}
	if r.Claims[2].EValue != nil {
		t.Fatal("an association got an E-value")
	}
	r = mustRun(t, MustLoad(t, "../testdata/calibration/clean-randomized/package.json"))
	if c := checkOf(r, "confounding-sensitivity"); c.Status != checks.StatusNotApplicable {
		t.Fatalf("randomized design: %s", c.Status)
	}
}

// Spearman's correction re-estimates the claims; a corrected matrix that
// is no longer positive definite is reported, not fitted.
func TestMeasurement_Correction(t *testing.T) {
	r := mustRun(t, MustLoad(t, "../testdata/demo/coding-club/package.json"))
	m := r.Claims[1].Measurement
	if m == nil || *m.Change <= 0 {
		t.Fatalf("H2 measurement %+v", m)
	}
	doc, _ := os.ReadFile("../testdata/demo/tutoring-anxiety/package.json")
	doc = bytes.Replace(doc, []byte(`"reliability": 0.84`), []byte(`"reliability": 0.12`), 1)
	s, err := load.Load(doc, load.Options{})
	if err != nil {
		t.Fatal(err)
	}
	c := checkOf(mustRun(t, s), "measurement")
	if c.Status != checks.StatusWarn ||
		!bytes.Contains([]byte(c.Findings[len(c.Findings)-1].Message), []byte("Corrected for attenuation")) {
		t.Fatalf("%s %+v", c.Status, c.Findings)
	}
}
