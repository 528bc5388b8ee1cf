package checks_test

import (
	"fmt"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/load"
)

// codedRows are 150 rows of x, y and z (y = 0.4 x + noise), with x
// written as −99 in 22 of them: a likely missing code the package may not
// declare.
func codedRows() string {
	r := rand.New(rand.NewPCG(23, 3))
	var b strings.Builder
	b.WriteString("x,y,z\n")
	for i := range 150 {
		x := 50 + 10*r.NormFloat64()
		y := 0.4*(x-50)/10 + r.NormFloat64()
		cell := fmt.Sprintf("%.3f", x)
		if i%6 == 3 && i < 6*22 {
			cell = "-99"
		}
		fmt.Fprintf(&b, "%s,%.3f,%.3f\n", cell, y, r.NormFloat64())
	}
	return b.String()
}

// codedPackage runs a package over codedRows with one claim of x on y,
// reporting estimate [lo, hi], and the given missing codes.
func codedPackage(t *testing.T, estimate, lo, hi float64, codes string) *checks.Report {
	t.Helper()
	doc := fmt.Sprintf(`{"format_version": 1, "title": "t", "design": "observational",
		"variables": [{"name": "x", "scale": "continuous"}, {"name": "y", "scale": "continuous"},
		{"name": "z", "scale": "continuous"}],
		"claims": [{"id": "C1", "text": "x goes with y", "kind": "association", "from": "x", "to": "y",
		"estimate": %.2f, "ci": [%.2f, %.2f]}], "missing_data": {"method": "complete_cases"},
		"data": {"kind": "rows", "missing_codes": [%s], "csv": %q}}`, estimate, lo, hi, codes, codedRows())
	s, err := load.Load([]byte(doc), load.Options{})
	if err != nil {
		t.Fatal(err)
	}
	return mustRun(t, s)
}

func reportingFinding(r *checks.Report, prefix string) *checks.Finding {
	for _, f := range checkOf(r, "effect-reporting").Findings {
		if strings.HasPrefix(f.Message, prefix) {
			return &f
		}
	}
	return nil
}

// With a likely missing code in the data (−99 in 22 rows), a reported
// estimate is held to the data both ways, and the sentence says which
// reading it matches. The figures it is held to come from the same data
// loaded with "-99" declared in missing_codes (the loader's own reading)
// and loaded as it stands.
func TestEffectReporting_LikelyCodeBothWays(t *testing.T) {
	probe := codedPackage(t, 0, -1, 1, `"-99"`).Claims[0].Declared
	raw := codedPackage(t, 0, -1, 1, "").Claims[0].Declared
	if strings.Count(codedRows(), "-99,") != 22 || *probe.Estimate-*raw.Estimate < 0.1 {
		t.Fatalf("fixture: declared %v, as read %v", *probe.Estimate, *raw.Estimate)
	}
	for _, c := range []struct {
		name     string
		estimate *checks.Estimate
		severity string
		want     []string
	}{
		{"matches the code read as missing", probe, checks.SeverityInfo, []string{
			`which the data give with -99 in column "x" read as missing`,
			`Declare "-99" in /data/missing_codes`}},
		{"matches the code counted as a value", raw, checks.StatusWarn, []string{
			`which the data give with -99 in column "x" counted as real values`,
			`If -99 is a missing code, the reported figure appears to count it as a measurement`}},
	} {
		r := codedPackage(t, *c.estimate.Estimate, c.estimate.CI[0], c.estimate.CI[1], "")
		f := reportingFinding(r, "C1 reports")
		if f == nil || f.Severity != c.severity {
			t.Errorf("%s: finding %+v, want severity %s", c.name, f, c.severity)
			continue
		}
		for _, w := range c.want {
			if !strings.Contains(f.Message, w) {
				t.Errorf("%s: %q lacks %q", c.name, f.Message, w)
			}
		}
		if strings.Contains(f.Message, "ask how") {
			t.Errorf("%s: %q asks how a figure that the data give was obtained", c.name, f.Message)
		}
	}
	f := reportingFinding(codedPackage(t, 0.95, 0.9, 0.99, ""), "C1 reports")
	if f == nil || f.Severity != checks.StatusWarn || !strings.Contains(f.Message, "counted as real values, and") ||
		!strings.HasPrefix(f.Question, "How was the reported figure obtained") {
		t.Errorf("matching neither reading: %+v", f)
	}
	if f := reportingFinding(codedPackage(t, *probe.Estimate, probe.CI[0], probe.CI[1], `"-99"`),
		"C1 reports"); f != nil {
		t.Errorf("code declared, estimate matching: %+v", f)
	}
}

// A reported direction the data contradict is flagged on any scale: an
// odds ratio below 1 with an interval below 1, where the data give a
// positive association: by a logistic regression of the rows (the same
// scale), and from summary statistics (a standardized coefficient, another
// scale, where no interval can be compared).
func TestEffectReporting_ReportedDirectionContradicted(t *testing.T) {
	claim := `{"id": "L1", "text": "x goes with y", "kind": "association", "from": "x", "to": "y",
		"estimate_scale": "odds_ratio", "estimate": 0.80, "ci": [0.71, 0.91], "headline": true}`
	rows := rowsPackage(t, logisticRows(), "binary", claim, "none")
	summary := `{"format_version": 1, "title": "t", "design": "observational",
		"variables": [{"name": "x", "scale": "continuous"}, {"name": "y", "scale": "binary"}],
		"claims": [` + claim + `], "data": {"kind": "summary", "n": 400, "variables": ["x", "y"],
		"correlations": [[1], [0.3, 1]]}}`
	s, err := load.Load([]byte(summary), load.Options{})
	if err != nil {
		t.Fatal(err)
	}
	for name, r := range map[string]*checks.Report{"rows": rows, "summary": mustRun(t, s)} {
		f := reportingFinding(r, "L1 reports an odds ratio of 0.80 (95% interval 0.71 to 0.91), a negative estimate")
		if f == nil || f.Severity != checks.StatusFail || !strings.Contains(f.Message, "give a positive one") ||
			!strings.Contains(f.Message, "the data contradict the reported direction") {
			t.Errorf("%s: %+v", name, checkOf(r, "effect-reporting").Findings)
		}
	}
	// The same figures of a claim of no effect show no direction.
	noEffect := strings.Replace(claim, `"headline": true`, `"asserts_absence": true`, 1)
	if f := reportingFinding(rowsPackage(t, logisticRows(), "binary", noEffect, "none"),
		"L1 reports an odds ratio of 0.80 (95% interval 0.71 to 0.91), a negative"); f != nil {
		t.Errorf("claim of no effect: %+v", f)
	}
}

// A claim of no effect weighed on the data is weighed both ways where the
// data hold a likely code: as read (−99 counted as x's value) the estimate
// does not tell, with −99 read as missing it is a significant effect
// (the same data with "-99" declared, TestEffectReporting_LikelyCodeBothWays).
func TestEffectReporting_AbsenceBothWays(t *testing.T) {
	doc := fmt.Sprintf(`{"format_version": 1, "title": "t", "design": "observational",
		"variables": [{"name": "x", "scale": "continuous"}, {"name": "y", "scale": "continuous"},
		{"name": "z", "scale": "continuous"}],
		"claims": [{"id": "A1", "text": "x does not go with y", "kind": "association", "from": "x", "to": "y",
		"asserts_absence": true, "p_value": 0.4}], "missing_data": {"method": "complete_cases"},
		"data": {"kind": "rows", "csv": %q}}`, codedRows())
	s, err := load.Load([]byte(doc), load.Options{})
	if err != nil {
		t.Fatal(err)
	}
	r := mustRun(t, s)
	f := reportingFinding(r, "A1 says there is no effect")
	if f == nil || r.Claims[0].Absence == nil || r.Claims[0].Absence.Verdict == "effect_found" ||
		!strings.Contains(f.Message, `With -99 in column "x" read as missing, the data give 0.49 (p < .001) instead, `+
			`a significant effect, against "no effect".`) {
		t.Errorf("absence %+v, finding %+v", r.Claims[0].Absence, f)
	}
}
