package checks

import (
	"context"
	"fmt"
	"math"
	"strings"

	"github.com/pathvet/pathvet/checks/dag"
	"github.com/pathvet/pathvet/checks/sem"
)

// Conventional cut-offs of Hu & Bentler (1999): guides, not verdicts.
const (
	cutRMSEA = 0.06
	cutCFI   = 0.95
	cutSRMR  = 0.08
)

// MaxListedImplications bounds the implications listed in the metrics.
const MaxListedImplications = 200

// graph-fit: do the data contradict the graph's testable implications;
// how well does it fit? (README, "Checks")
var graphFitCheck = Check{
	ID:    "graph-fit",
	Title: "Fit of the declared graph",
	Run:   runGraphFit,
	Summaries: map[string]string{
		StatusPass:          "The data do not contradict the declared graph's testable implications.",
		StatusWarn:          "The declared graph fits the data only loosely; see the findings.",
		StatusFail:          "The data reject independences the declared graph implies; see the findings.",
		StatusNotApplicable: "No causal graph is declared, so there is nothing to test against the data.",
	},
}

// modelFit is a graph's fit over the nodes of the declared graph.
type modelFit struct {
	fit   *sem.Fit
	nodes []int // variable index of each row of the fitted matrix
}

func runGraphFit(ctx context.Context, a *Analysis) (CheckResult, error) {
	s := a.Study
	if s.Declared == nil {
		return CheckResult{Status: StatusNotApplicable}, nil
	}
	m, err := a.moments()
	if err != nil {
		return CheckResult{}, fmt.Errorf("the fit could not be computed: %w", a.dataError())
	}
	mf, err := a.fitGraph(ctx, s.Declared, s.InGraph)
	if err != nil {
		return CheckResult{}, fmt.Errorf("the declared graph could not be fitted to the data: %w", err)
	}
	tests := a.implicationTests(m)
	if err := ctx.Err(); err != nil {
		return CheckResult{}, err
	}
	res := CheckResult{Metrics: a.fitMetrics(mf.fit, tests, m)}
	res.Findings = append(res.Findings, a.rejectedFindings(tests)...)
	tooFew, best := a.fitTooFew(tests, m.N)
	res.Metrics["implication_power_large_effect"] = num(best)
	if tooFew != nil && len(res.Findings) == 0 { // no rejection: a rejection tells, whatever the power
		res.Findings = append(res.Findings, *tooFew)
	} else {
		tooFew = nil
	}
	res.Findings = append(res.Findings, fitFindings(mf.fit, a.Alpha)...)
	res.Findings = append(res.Findings, a.binaryNodeFindings(m)...)
	res.Status = statusOf(res.Findings)
	if mf.fit.DF == 0 && len(tests) == 0 {
		res.Status = StatusNotApplicable
		res.Summary = "The declared graph is saturated (every pair of its variables is joined): it implies no independence and fits any data perfectly, so fit says nothing about it."
		return res, nil
	}
	res.Summary = fitSummary(res.Status, mf.fit, tests, a.Alpha)
	if tooFew != nil {
		res.Summary = tooFewFitSummary(m.N, best) +
			strings.TrimPrefix(res.Summary, "The declared graph fits the data only loosely: ")
	}
	return res, nil
}

// implicationTest is one tested implication with its Holm-adjusted p.
type implicationTest struct {
	imp    dag.Implication
	r      float64 // partial correlation, NaN for a Wald test
	p      float64
	pHolm  float64
	method string
	err    error
}

// implicationTests tests Shipley's basis set of the declared graph: by
// the partial correlation and Fisher's z, or, where the later variable of
// the pair is binary and raw rows are at hand, by the Wald test of a
// logistic regression; then Holm's adjustment over the set.
func (a *Analysis) implicationTests(m *Moments) []implicationTest {
	s := a.Study
	order, _ := dag.TopoOrder(s.Declared)
	rank := make([]int, len(order))
	for i, v := range order {
		rank[v] = i
	}
	var out []implicationTest
	for _, imp := range dag.BasisSet(s.Declared, s.InGraph) {
		resp, other := imp.Y, imp.X
		if rank[imp.X] > rank[imp.Y] {
			resp, other = imp.X, imp.Y
		}
		t := implicationTest{imp: imp, r: math.NaN(), p: math.NaN(), method: "fisher_z"}
		if s.Package.Variables[resp].Scale == ScaleBinary && m.Rows != nil {
			e := logisticEstimate(m, resp, append([]int{other}, imp.Given...), "log_odds", 0.95)
			t.method, t.p, t.err = "logistic_wald", e.p, e.err
		} else {
			it := sem.ZTest(m.Cor, m.N, sem.Independence{X: imp.X, Y: imp.Y, Given: imp.Given})
			t.r, t.p, t.err = it.PartialR, it.P, it.Err
		}
		out = append(out, t)
	}
	ps := make([]float64, len(out))
	for i, t := range out {
		ps[i] = t.p
	}
	for i, h := range sem.Holm(ps) {
		out[i].pHolm = h
	}
	return out
}

func (a *Analysis) rejectedFindings(tests []implicationTest) []Finding {
	var fs []Finding
	for _, t := range tests {
		if !(t.pHolm < a.Alpha) {
			continue
		}
		what := fmt.Sprintf("their partial correlation is %.2f", t.r)
		if t.method == "logistic_wald" {
			what = "a logistic regression finds an association"
		}
		x, y := a.Study.Names[t.imp.X], a.Study.Names[t.imp.Y]
		fs = append(fs, Finding{Severity: StatusFail, Topic: topic("independence", min(x, y), max(x, y)),
			Details: map[string]any{"x": x, "y": y}, Message: fmt.Sprintf(
				"The data contradict an independence the graph implies: %s and %s should be independent given %s, but %s (Holm-adjusted %s).",
				x,
				y,
				a.setText(t.imp.Given),
				what,
				pText(t.pHolm),
			)})
	}
	return fs
}

func (a *Analysis) setText(vs []int) string {
	if len(vs) == 0 {
		return "nothing"
	}
	return "{" + strings.Join(a.names(vs), ", ") + "}"
}

func (a *Analysis) names(vs []int) []string {
	names := make([]string, len(vs))
	for i, v := range vs {
		names[i] = a.Study.Names[v]
	}
	return names
}

func fitFindings(f *sem.Fit, alpha float64) []Finding {
	if f.DF == 0 {
		return nil
	}
	var fs []Finding
	if f.P < alpha {
		fs = append(fs, Finding{Severity: StatusWarn, Topic: "chi-square", Message: fmt.Sprintf(
			"The chi-square test rejects the graph: χ² = %.2f on %d df, %s (with large samples it rejects small misfits too).",
			f.ChiSquare,
			f.DF,
			pText(f.P),
		)})
	}
	type cut struct {
		name   string
		value  float64
		bad    bool
		thresh string
	}
	for _, c := range []cut{
		{"RMSEA", f.RMSEA, f.RMSEA > cutRMSEA, fmt.Sprintf("above the conventional %.2f (90%% interval %.3f to %.3f)", cutRMSEA, f.RMSEACI[0], f.RMSEACI[1])},
		{"CFI", f.CFI, f.CFI < cutCFI, fmt.Sprintf("below the conventional %.2f", cutCFI)},
		{"SRMR", f.SRMR, f.SRMR > cutSRMR, fmt.Sprintf("above the conventional %.2f", cutSRMR)},
	} {
		if c.bad {
			fs = append(fs, Finding{Severity: StatusWarn, Topic: topic("fit-index", strings.ToLower(c.name)),
				Message: fmt.Sprintf(
					"%s is %.3f, %s; the cut-offs of Hu & Bentler (1999) are a guide, not a verdict.",
					c.name,
					c.value,
					c.thresh,
				)})
		}
	}
	return fs
}

// binaryNodeFindings say where the linear chi-square treats a binary
// variable as continuous.
func (a *Analysis) binaryNodeFindings(m *Moments) []Finding {
	var names []string
	for i, v := range a.Study.Package.Variables {
		if v.Scale == ScaleBinary && a.Study.InGraph[i] && len(a.Study.Declared.Parents(i)) > 0 {
			names = append(names, v.Name)
		}
	}
	if len(names) == 0 {
		return nil
	}
	how := "with raw rows the independences implied for them are tested by logistic regressions"
	if m.Rows == nil {
		how = "summary statistics allow no logistic regression, so every test treats them as continuous"
	}
	return []Finding{{Severity: SeverityInfo, Topic: "binary-approximation", Message: fmt.Sprintf(
		"%s: binary, with arrows into %s. The linear chi-square and the fit indices treat %s as continuous and are approximate there; %s.",
		strings.Join(names, ", "),
		them(len(names)),
		them(len(names)),
		how,
	)}}
}

func (a *Analysis) fitMetrics(f *sem.Fit, tests []implicationTest, m *Moments) map[string]any {
	ps := make([]float64, len(tests))
	rejected := 0
	listed := []map[string]any{}
	for i, t := range tests {
		ps[i] = t.p
		if t.pHolm < a.Alpha {
			rejected++
		}
		if i < MaxListedImplications {
			listed = append(
				listed,
				map[string]any{"x": a.Study.Names[t.imp.X], "y": a.Study.Names[t.imp.Y], "given": a.names(t.imp.Given),
					"partial_r": num(t.r), "p_value": num(t.p), "p_holm": num(t.pHolm), "test": t.method},
			)
		}
	}
	c, cdf, cp := sem.ShipleyC(ps)
	return map[string]any{
		"n": f.N, "data": m.Method, "chi_square": num(f.ChiSquare), "df": f.DF, "p_value": num(f.P),
		"rmsea": num(f.RMSEA), "rmsea_ci": []any{num(f.RMSEACI[0]), num(f.RMSEACI[1])},
		"cfi": num(f.CFI), "tli": num(f.TLI), "srmr": num(f.SRMR), "aic": num(f.AIC), "bic": num(f.BIC),
		"free_parameters":     f.FreeParams,
		"baseline_chi_square": num(f.BaselineChiSquare), "baseline_df": f.BaselineDF,
		"implications_tested": len(tests), "implications_rejected": rejected,
		"fisher_c": num(c), "fisher_c_df": cdf, "fisher_c_p_value": num(cp),
		"conventional_cutoffs": map[string]any{"rmsea_max": cutRMSEA, "cfi_min": cutCFI, "srmr_max": cutSRMR,
			"source": "Hu & Bentler (1999); a guide, not a verdict"},
		"implications": listed,
	}
}

func fitSummary(status string, f *sem.Fit, tests []implicationTest, alpha float64) string {
	base := fmt.Sprintf(
		"χ² = %.2f on %d df (%s), RMSEA %.3f, CFI %.3f, SRMR %.3f; %s tested.",
		f.ChiSquare,
		f.DF,
		pText(f.P),
		f.RMSEA,
		f.CFI,
		f.SRMR,
		count(len(tests), "implied independence", "implied independences"),
	)
	switch status {
	case StatusFail:
		rejected := 0
		for _, t := range tests {
			if t.pHolm < alpha {
				rejected++
			}
		}
		which := fmt.Sprintf("%d of the %d independences", rejected, len(tests))
		if len(tests) == 1 {
			which = "the one independence"
		}
		return fmt.Sprintf("The data reject %s the declared graph implies (Holm-adjusted, family-wise level %g; %s): "+
			"the graph may lack an arrow or a common cause there, or those assumptions may not hold. ",
			which, alpha, testAssumptions(tests)) + base
	case StatusWarn:
		return "The declared graph fits the data only loosely: " + base
	}
	return "The data do not contradict the declared graph's testable implications: " + base
}

// testAssumptions names what the implication tests assume.
func testAssumptions(tests []implicationTest) string {
	for _, t := range tests {
		if t.method == "logistic_wald" {
			return "tests that assume linear relations and normal errors, and logistic ones for binary variables"
		}
	}
	return "tests that assume linear relations and normal errors"
}
