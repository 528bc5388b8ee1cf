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

// Sentences and verdicts that must hold for every number they can be
// filled with: an odds ratio's no effect, the E-values of claims of no
// effect, Little's test, a reversal out of a binary variable, pooled
// correlations.

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
		c.Summary != "The only causal claim, S1, asserts no effect, so there is nothing for confounding to "+
			"explain away." {
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
