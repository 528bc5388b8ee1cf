package checks

import (
	"context"
	"fmt"
	"math"
	"slices"
	"strings"

	"github.com/pathvet/pathvet/checks/dag"
)

// weakBIC is the BIC difference below which two models fit about equally
// well: "weak" evidence in Raftery's (1995) scale, common practice.
const weakBIC = 2

// alternatives: did the authors state alternatives; are they
// distinguishable from the declared graph; do the claims survive them?
// (README, "Checks")
var alternativesCheck = Check{
	ID:    "alternatives",
	Title: "Stated alternative graphs",
	Run:   runAlternatives,
	Summaries: map[string]string{
		StatusPass: "No claim changes its conclusion under a stated alternative that fits the data about as " +
			"well as the declared graph or better.",
		StatusWarn: "The stated alternatives need attention; see the findings.",
		StatusFail: "A headline claim changes sign or significance under a stated alternative that fits the " +
			"data about as well or better; the data do not support choosing the declared graph over it.",
		StatusNotApplicable: "No alternatives are stated, and the paper makes no causal claim.",
	},
}

func runAlternatives(ctx context.Context, a *Analysis) (CheckResult, error) {
	s := a.Study
	causal := slices.ContainsFunc(s.Package.Claims, func(c Claim) bool { return Causal(c.Kind) })
	switch {
	case len(s.Alternatives) == 0 && causal:
		return CheckResult{Status: StatusWarn, Metrics: map[string]any{"alternatives": 0},
			Summary: "The paper states no alternative graph for its causal claims; ask which other causal orders " +
				"the authors considered and why they rejected them.",
			Findings: []Finding{{Severity: StatusWarn, Topic: "none-stated",
				Message: "No alternative graph is stated, so nothing shows " +
					"the causal claims were weighed against another causal order."}}}, nil
	case len(s.Alternatives) == 0:
		return CheckResult{Status: StatusNotApplicable}, nil
	case s.Declared == nil:
		return CheckResult{Status: StatusNotApplicable, Summary: "Alternatives are stated but no declared graph, so " +
			"there is nothing to compare them with."}, nil
	}
	m, err := a.moments()
	if err != nil {
		return CheckResult{}, fmt.Errorf("the alternatives could not be compared: %w", a.dataError())
	}
	declFit, err := a.fitGraph(ctx, s.Declared, s.InGraph)
	if err != nil {
		return CheckResult{}, fmt.Errorf("the alternatives could not be compared: the declared graph could not be "+
			"fitted to the data (%w)", err)
	}
	var fs []Finding
	var rows []map[string]any
	declCPDAG := a.equivalenceClass().cpdag.Key()
	for j, alt := range s.Alternatives {
		row, f, err := a.compareAlternative(ctx, j, alt, declFit, declCPDAG, m)
		if err != nil {
			return CheckResult{}, err
		}
		rows, fs = append(rows, row), append(fs, f...)
		if err := ctx.Err(); err != nil {
			return CheckResult{}, err
		}
	}
	res := CheckResult{Findings: fs, Metrics: map[string]any{"alternatives": len(s.Alternatives), "comparisons": rows,
		"declared_bic": num(declFit.fit.BIC), "declared_chi_square": num(declFit.fit.ChiSquare),
		"declared_df": declFit.fit.DF}}
	res.Status = statusOf(fs)
	res.Summary = alternativesSummary(res.Status, len(s.Alternatives), rows, fs)
	return res, nil
}

// alternativesSummary words the check's result from its comparisons and
// findings.
func alternativesSummary(status string, n int, rows []map[string]any, fs []Finding) string {
	asWell, changed := 0, 0
	for _, r := range rows {
		if r["fits_about_as_well"] == true || r["fits_better"] == true {
			asWell++
		}
	}
	for _, f := range fs {
		if f.Claim != "" && (f.Severity == StatusWarn || f.Severity == StatusFail) && f.Details["not_estimated"] == nil {
			changed++
		}
	}
	stated := "The paper states " + count(n, "alternative graph", "alternative graphs")
	switch {
	case status == StatusFail:
		return "A headline claim changes sign or significance under a stated alternative that fits the data " +
			"about as well or better; the data do not support choosing the declared graph over it."
	case changed > 0:
		return fmt.Sprintf("%s sign or significance under a stated alternative that fits the data about as well "+
			"or better; the paper should say why the declared graph is preferred.",
			count(changed, "claim changes", "claims change"))
	case status == StatusWarn:
		return stated + "; some comparisons with the declared graph could not be made (see the findings), and " +
			"no claim that could be estimated changes its conclusion under those that fit about as well or better."
	case asWell == 0:
		return stated + "; none fits the data about as well as the declared graph or better (Markov equivalent, " +
			"or ΔBIC below 2), so none challenges the claims."
	}
	return fmt.Sprintf("%s; under %s the data about as well as the declared graph or better, no claim that "+
		"could be estimated changes its conclusion (the sign of a significant estimate, or its non-significance).",
		stated, map[bool]string{true: "the one that fits", false: fmt.Sprintf("the %d that fit", asWell)}[asWell == 1])
}

// fitWord says how an alternative fits beside the declared graph by
// ΔBIC (alternative − declared): better by 2 or more, about as well within
// 2, else worse.
func fitWord(delta float64) string {
	switch {
	case delta <= -weakBIC:
		return "better"
	case delta < weakBIC:
		return "about as well"
	}
	return "worse"
}

// compareAlternative fits alternative j beside the declared graph and
// re-estimates every claim under it.
func (a *Analysis) compareAlternative(ctx context.Context, j int, alt *dag.PDAG, declFit *modelFit, declCPDAG string,
	m *Moments) (map[string]any, []Finding, error) {
	s := a.Study
	name := s.Package.Alternatives[j].Name
	in := graphNodes(alt)
	same := slices.Equal(in, s.InGraph)
	equivalent := same && dag.CPDAG(alt).Key() == declCPDAG
	row := map[string]any{"name": name, "equivalent": equivalent, "same_variables": same}
	var fs []Finding
	delta, fitted, fit := 0.0, false, topic("fit", slug(name))
	switch {
	case equivalent:
		fs = append(fs, Finding{Severity: SeverityInfo, Topic: fit, Message: fmt.Sprintf(
			"The alternative %q is Markov equivalent to the declared graph: it fits any data exactly as well, so the "+
				"data cannot tell the two apart.", name)})
	default:
		af, err := a.fitGraph(ctx, alt, in)
		if err != nil {
			fs = append(fs, Finding{Severity: StatusWarn, Topic: fit, Question: alternativeFitQuestion(name, false),
				Message: fmt.Sprintf("The alternative %q could not be fitted to the data: %v.", name, err)})
			break
		}
		delta, fitted = af.fit.BIC-declFit.fit.BIC, true
		row["chi_square"], row["df"] = num(af.fit.ChiSquare), af.fit.DF
		row["p_value"], row["bic"] = num(af.fit.P), num(af.fit.BIC)
		if same {
			row["delta_bic"] = num(delta)
			fs = append(fs, Finding{Severity: SeverityInfo, Topic: fit, Message: fmt.Sprintf(
				"The alternative %q: χ² = %.2f on %d df against %.2f on %d df for the declared graph; ΔBIC = %+.1f "+
					"(negative favours the alternative).",
				name, af.fit.ChiSquare, af.fit.DF, declFit.fit.ChiSquare, declFit.fit.DF, delta)})
		} else {
			fs = append(fs, Finding{Severity: StatusWarn, Topic: topic("variables", slug(name)),
				Question: alternativeFitQuestion(name, true), Message: fmt.Sprintf(
					"The alternative %q does not cover the same variables as the declared graph, so their fits "+
						"cannot be "+
						"compared.", name)})
		}
	}
	// About as well: equivalent, or |ΔBIC| < 2; better: ΔBIC ≤ −2 (Raftery
	// 1995's bands). Either challenges the claims.
	asWell := equivalent || (same && fitted && math.Abs(delta) < weakBIC)
	better := same && fitted && delta <= -weakBIC
	row["fits_about_as_well"], row["fits_better"] = asWell, better
	for i, c := range s.Package.Claims {
		ae, f := a.claimUnderAlternative(i, c, name, alt, in, equivalent, asWell || better, delta)
		a.Claims[i].UnderAlternatives = append(a.Claims[i].UnderAlternatives, ae)
		fs = append(fs, f...)
	}
	return row, fs, nil
}

func graphNodes(g *dag.PDAG) []bool {
	in := make([]bool, g.N())
	for _, e := range g.Arcs() {
		in[e.From], in[e.To] = true, true
	}
	return in
}

func (a *Analysis) claimUnderAlternative(i int, c Claim, name string, alt *dag.PDAG, in []bool,
	equivalent, challenges bool, delta float64) (AlternativeEstimate, []Finding) {
	s := a.Study
	ae := AlternativeEstimate{Name: name, Equivalent: equivalent}
	if Causal(c.Kind) && (!in[s.Index[c.From]] || !in[s.Index[c.To]]) {
		ae.Error = "the claim's variables are not in this alternative"
		return ae, nil
	}
	decl := a.declaredEstimate(i)
	e := a.estimateClaim(c, alt.Parents)
	r := a.report(e)
	ae.Estimate, ae.CI, ae.PValue, ae.Method, ae.Error = r.Estimate, r.CI, r.PValue, r.Method, r.Error
	ae.StructuralZero, ae.Significance = r.StructuralZero, r.Significance
	if !e.ok() && decl.ok() && challenges {
		fit := "which the data cannot tell from the declared graph"
		if !equivalent {
			fit = fmt.Sprintf("which fits the data %s (ΔBIC = %+.1f)", fitWord(delta), delta)
		}
		return ae, []Finding{{Severity: StatusWarn, Claim: c.ID, Details: map[string]any{"not_estimated": true},
			Topic: topic("under", slug(name)), Question: alternativeQuestion("unestimated", name),
			Message: fmt.Sprintf("%s could not be estimated under the alternative %q, %s (%s), so whether its "+
				"conclusion holds there is not known.", c.ID, name, fit, ae.Error)}}
	}
	if !e.ok() || !decl.ok() {
		return ae, nil
	}
	ae.Changed = e.category(a.Alpha) != decl.category(a.Alpha)
	if !ae.Changed {
		return ae, nil
	}
	how := "which the data cannot tell from it"
	if !equivalent {
		how = fmt.Sprintf("which fits the data %s (ΔBIC = %+.1f)", fitWord(delta), delta)
	}
	if e.method == MethodZero && c.Kind == KindIndirect { // say why, in words
		how = "which has " + strings.TrimSuffix(e.zero, " in this graph") + " and " + how
	}
	sev := SeverityInfo
	if challenges {
		sev = StatusWarn
		if c.Headline {
			sev = StatusFail
		}
	}
	return ae, []Finding{{Severity: sev, Claim: c.ID, Topic: topic("under", slug(name)),
		Question: alternativeQuestion("changed", name), Message: fmt.Sprintf(
			"%s is %s under the declared graph but %s under the alternative %q, "+
				"%s.", c.ID, valueText(decl), valueText(e), name, how)}}
}
