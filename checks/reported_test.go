package checks_test

import (
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
	"gonum.org/v1/gonum/stat"
	"gonum.org/v1/gonum/stat/distuv"

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
		!strings.Contains(f.Message, "ask how the reported figure was obtained") {
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

// An odds-ratio claim whose arrow can point the other way: in the
// equivalent graph with y → x the effect is no effect, an odds ratio of 1
// (not 0), and the sentences say "no effect (odds ratio 1)", not "zero".
func TestOddsRatio_NoEffectIsOne(t *testing.T) {
	doc := `{"format_version": 1, "title": "t", "design": "observational",
		"variables": [{"name": "x", "scale": "continuous"}, {"name": "y", "scale": "binary"}],
		"graph": {"edges": [{"from": "x", "to": "y"}]},
		"claims": [{"id": "L1", "text": "x raises the odds of y", "kind": "direct_effect", "from": "x", "to": "y",
		"estimate_scale": "odds_ratio", "estimate": 2.0, "ci": [1.6, 2.6], "headline": true}],
		"data": {"kind": "rows", "ignore_columns": ["z"], "csv": ` + fmt.Sprintf("%q", logisticRows()) + `}}`
	s, err := load.Load([]byte(doc), load.Options{})
	if err != nil {
		t.Fatal(err)
	}
	r := mustRun(t, s)
	ae := r.Claims[0].AcrossEquivalents
	if ae == nil || ae.Estimates != 2 || ae.Min == nil || *ae.Min != 1 || ae.Max == nil || *ae.Max < 1.5 {
		t.Fatalf("across equivalents %+v: want the odds ratio and no effect (1) as its bounds", ae)
	}
	var text []string
	for _, c := range r.Checks {
		for _, f := range c.Findings {
			if f.Claim == "L1" {
				text = append(text, f.Message)
			}
		}
	}
	all := strings.Join(text, "\n")
	if !strings.Contains(all, "no effect (odds ratio 1) in 1 of the 2 plausible members") ||
		!strings.Contains(all, "is none, an odds ratio of 1") || strings.Contains(all, " zero") {
		t.Errorf("findings:\n%s", all)
	}
}

// A package whose only causal claim asserts no effect makes causal claims:
// the E-value check says there is nothing to explain away, and why.
func TestConfounding_OnlyNoEffectClaims(t *testing.T) {
	s := MustLoad(t, "../testdata/demo/sleep-attention/package.json")
	s.Package.Claims = s.Package.Claims[:1] // S1, "does not predict", asserts no effect
	s.Printed = s.Printed[:1]
	c := checkOf(mustRun(t, s), "confounding-sensitivity")
	if c.Status != checks.StatusNotApplicable ||
		c.Summary != "The only causal claim, S1, asserts no effect, so there is nothing for confounding to explain away." {
		t.Errorf("%s: %q", c.Status, c.Summary)
	}
}

// Little's test rejecting MCAR says what it shows and no more: y is
// missing where z is high (missing at random given z), so the test
// rejects; a complete-case regression of y on x and z would still be
// unbiased (Little & Rubin 2002, sec. 3.2), and the sentence must not say
// the data argue against the assumptions it needs.
func TestMissingData_LittleSaysOnlyMCAR(t *testing.T) {
	r := rand.New(rand.NewPCG(9, 1))
	var b strings.Builder
	b.WriteString("x,y,z\n")
	for range 300 {
		x, z := r.NormFloat64(), r.NormFloat64()
		y := fmt.Sprintf("%.3f", 0.5*x+0.5*z+r.NormFloat64())
		if z > 0.3 {
			y = ""
		}
		fmt.Fprintf(&b, "%.3f,%s,%.3f\n", x, y, z)
	}
	claim := `{"id": "C1", "text": "x goes with y", "kind": "association", "from": "x", "to": "y",
		"adjust_for": ["z"], "estimate": 0.5, "p_value": 0.001, "p_relation": "<"}`
	rep := rowsPackage(t, b.String(), "continuous", claim, "complete_cases")
	var msg string
	for _, f := range checkOf(rep, "missing-data").Findings {
		if strings.HasPrefix(f.Message, "Little's test rejects") {
			msg = f.Message
		}
	}
	if !strings.Contains(msg, "That speaks against missing completely at random only") ||
		!strings.Contains(msg, "stays unbiased when the missingness depends on its predictors alone") ||
		strings.Contains(msg, "argue against") {
		t.Errorf("Little's test: %q", msg)
	}
}

// A nearby class reached only by reversing an arrow out of a binary
// variable (z → b → y, b binary, z → b fixed: reversing b → y makes the
// v-structure z → b ← y, which changes b's equation) is scored by a linear
// equation for b, so its ΔBIC is approximate and a headline claim that
// changes there is a warning, not a failure (README, nearby-graphs).
func TestNearbyGraphs_ReversalOutOfBinaryWarns(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 5))
	var b strings.Builder
	b.WriteString("b,y,z\n")
	for range 200 {
		z, bb := r.NormFloat64(), 0
		if r.Float64() < 1/(1+math.Exp(-0.4*z)) {
			bb = 1
		}
		fmt.Fprintf(&b, "%d,%.4f,%.4f\n", bb, 0.4*float64(bb)+r.NormFloat64(), z)
	}
	doc := `{"format_version": 1, "title": "t", "design": "observational",
		"variables": [{"name": "b", "scale": "binary"}, {"name": "y", "scale": "continuous"},
		{"name": "z", "scale": "continuous"}],
		"graph": {"edges": [{"from": "z", "to": "b"}, {"from": "b", "to": "y"}],
		"fixed_edges": [{"from": "z", "to": "b"}]},
		"claims": [{"id": "H1", "text": "b raises y", "kind": "direct_effect", "from": "b", "to": "y",
		"headline": true, "estimate": 0.3, "std_error": 0.1}],
		"data": {"kind": "rows", "csv": ` + fmt.Sprintf("%q", b.String()) + `}}`
	s, err := load.Load([]byte(doc), load.Options{})
	if err != nil {
		t.Fatal(err)
	}
	c := checkOf(mustRun(t, s), "nearby-graphs")
	seen := false
	for _, f := range c.Findings {
		if f.Claim == "H1" && strings.Contains(f.Message, "with the arrow b → y reversed") {
			seen = true
			if f.Severity != checks.StatusWarn || !strings.Contains(f.Message, "approximate") {
				t.Errorf("%s: %s", f.Severity, f.Message)
			}
		}
	}
	if !seen || c.Status != checks.StatusWarn {
		t.Errorf("nearby-graphs %s, findings %+v", c.Status, c.Findings)
	}
}

// Pooling correlations over imputations on Fisher's z scale: with x and y
// complete and only z (outside the claim) missing, every imputed dataset
// gives the same r, so B = 0 and the pooled interval is the closed form
// tanh(atanh r ± t_{.975, ν} / sqrt(n − 3)) (Fisher 1921: Var z = 1/(n − 3)
// given no variable; Rubin 1987 with B = 0; Barnard & Rubin 1999:
// ν = (ν_com + 1)/(ν_com + 3) ν_com, ν_com = n − 2), computed here with
// gonum's stat and t quantile, to 1e-9.
func TestMissingData_PooledCorrelationFisherVariance(t *testing.T) {
	r := rand.New(rand.NewPCG(40, 2))
	n := 40
	var b strings.Builder
	b.WriteString("x,y,z\n")
	xs, ys := make([]float64, n), make([]float64, n)
	for i := range n {
		xs[i] = math.Round(r.NormFloat64()*1e4) / 1e4
		ys[i] = math.Round((0.5*xs[i]+r.NormFloat64())*1e4) / 1e4
		z := fmt.Sprintf("%.4f", r.NormFloat64())
		if i%8 == 0 {
			z = ""
		}
		fmt.Fprintf(&b, "%.4f,%.4f,%s\n", xs[i], ys[i], z)
	}
	claim := `{"id": "R1", "text": "x goes with y", "kind": "association", "from": "x", "to": "y",
		"estimate_scale": "correlation", "estimate": 0.4, "p_value": 0.01}`
	mi := rowsPackage(t, b.String(), "continuous", claim, "complete_cases").Claims[0].MissingData["multiple_imputation"]
	if mi == nil || mi.Estimate == nil || len(mi.CI) != 2 {
		t.Fatalf("multiple imputation %+v", mi)
	}
	rho := stat.Correlation(xs, ys, nil)
	dfCom := float64(n - 2)
	nu := (dfCom + 1) / (dfCom + 3) * dfCom
	q := distuv.StudentsT{Mu: 0, Sigma: 1, Nu: nu}.Quantile(0.975)
	se := 1 / math.Sqrt(float64(n-3))
	lo, hi := math.Tanh(math.Atanh(rho)-q*se), math.Tanh(math.Atanh(rho)+q*se)
	if !scalar.EqualWithinAbs(*mi.Estimate, rho, 1e-9) || !scalar.EqualWithinAbs(mi.CI[0], lo, 1e-9) ||
		!scalar.EqualWithinAbs(mi.CI[1], hi, 1e-9) {
		t.Errorf("pooled r %v [%v, %v], closed form %v [%v, %v]", *mi.Estimate, mi.CI[0], mi.CI[1], rho, lo, hi)
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
