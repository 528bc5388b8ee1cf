package checks

import (
	"fmt"
	"math"

	"github.com/pathvet/pathvet/checks/effects"
	"github.com/pathvet/pathvet/checks/missing"
)

// methodFindings judge the declared method against the missingness.
func methodFindings(method string, r *missingResult) []Finding {
	share := 100 * float64(r.summary.MissingCells) / float64(r.summary.Rows*len(r.summary.MissingByVariable))
	fs := []Finding{{Severity: SeverityInfo, Message: fmt.Sprintf(
		"%d of %d rows are complete; %.1f%% of the data cells are missing, in %d patterns.",
		r.summary.CompleteRows, r.summary.Rows, share, r.summary.Patterns)}}
	switch name, bad := unsoundMethods[method]; {
	case method == "":
		fs = append(fs, Finding{Severity: StatusWarn, Message: fmt.Sprintf(
			"The package does not say how missing values were handled, and %.1f%% of the data cells are missing (%d of %d rows are complete).",
			share, r.summary.CompleteRows, r.summary.Rows)})
	case method == MissingNone:
		fs = append(fs, Finding{Severity: StatusWarn, Message: fmt.Sprintf(
			"The package says no values are missing, but %.1f%% of the data cells are (%d of %d rows are complete).", share, r.summary.CompleteRows, r.summary.Rows)})
	case bad:
		fs = append(fs, Finding{Severity: StatusWarn, Message: name + " biases coefficients and understates their uncertainty (Little & Rubin, Statistical Analysis with Missing Data); the claims are re-estimated below by maximum likelihood and multiple imputation."})
	case method == MissingAvailableCases && r.pairwiseErr != "":
		fs = append(fs, Finding{Severity: StatusWarn, Message: "Available-case analysis: " + r.pairwiseErr + "."})
	}
	if r.mcar != nil && !math.IsNaN(r.mcar.P) {
		sev, tail := SeverityInfo, ""
		rejected := r.mcar.P < 0.05
		if rejected && (method == MissingCompleteCases || method == MissingAvailableCases || method == "") {
			sev, tail = StatusWarn, " An analysis of complete or available cases is then unbiased only under assumptions the data argue against."
		}
		verdict := "does not reject"
		if rejected {
			verdict = "rejects"
		}
		fs = append(fs, Finding{Severity: sev, Message: fmt.Sprintf(
			"Little's test %s that values are missing completely at random (χ² = %.2f on %d df, %s).%s", verdict, r.mcar.ChiSquare, r.mcar.DF, pText(r.mcar.P), tail)})
	}
	return fs
}

// methodLabel names the missing-data methods in sentences.
var methodLabel = map[string]string{
	MissingCompleteCases:      "complete cases",
	MissingAvailableCases:     "available cases",
	MissingMeanSubstitution:   "mean substitution",
	MissingSingleRegression:   "single regression imputation",
	MissingMaximumLikelihood:  "maximum likelihood (EM)",
	MissingMultipleImputation: fmt.Sprintf("multiple imputation with %d imputations", Imputations),
}

// claimMissing estimates a claim by every method, fills
// claims[].missing_data, and says whether its conclusion changes between
// the declared method and a principled one.
func (a *Analysis) claimMissing(i int, c Claim, method string, r *missingResult) ([]Finding, bool) {
	pa := a.declaredParentsFor(c)
	ests := map[string]est{}
	for key, m := range r.moments {
		ests[key] = a.estimateWith(m, c, pa)
	}
	if len(r.imputed) > 0 {
		ests[MissingMultipleImputation] = pooled(c, r.imputedEst[i], r.imputed)
	}
	out := map[string]*Estimate{}
	for key, e := range ests {
		out[key] = a.report(e)
	}
	a.Claims[i].MissingData = out
	declaredKey, principledKey := comparison(method, ests)
	d, okD := ests[declaredKey]
	p, okP := ests[principledKey]
	if !okD || !okP || !d.ok() || !p.ok() {
		return nil, false
	}
	if d.category(a.Alpha) == p.category(a.Alpha) {
		return []Finding{{Severity: SeverityInfo, Claim: c.ID, Message: fmt.Sprintf(
			"%s keeps its sign and significance: %s by %s, %s by %s.", c.ID, valueText(d), methodLabel[declaredKey], valueText(p), methodLabel[principledKey])}}, false
	}
	sev := StatusWarn
	if c.Headline {
		sev = StatusFail
	}
	return []Finding{{Severity: sev, Claim: c.ID, Message: fmt.Sprintf(
		"%s is %s by %s (%s) but %s by %s (%s): the conclusion depends on how missing values were handled.",
		c.ID, valueText(d), methodLabel[declaredKey], ciText(d), valueText(p), methodLabel[principledKey], ciText(p))}}, true
}

// comparison picks the declared method's estimate and the principled one
// to hold it against: multiple imputation, or maximum likelihood where
// the declared method is multiple imputation.
func comparison(method string, ests map[string]est) (declared, principled string) {
	declared = method
	if _, ok := ests[method]; !ok || method == "" || method == MissingNone || method == MissingOther {
		declared = MissingCompleteCases
	}
	principled = MissingMultipleImputation
	if declared == MissingMultipleImputation {
		principled = MissingMaximumLikelihood
	}
	return declared, principled
}

func ciText(e est) string {
	if math.IsNaN(e.lo) || math.IsNaN(e.hi) {
		return "no interval"
	}
	return fmt.Sprintf("95%% interval %.2f to %.2f", e.lo, e.hi)
}

// declaredParentsFor is the graph the declared estimate uses.
func (a *Analysis) declaredParentsFor(c Claim) parentsFunc {
	if a.Study.Declared != nil && a.claimInGraph(c) {
		return a.Study.Declared.Parents
	}
	return nil
}

// pooled pools a claim's estimates in the imputed datasets by Rubin's
// rules with the Barnard–Rubin degrees of freedom. Correlations are pooled
// on Fisher's z scale, odds ratios on the log scale.
func pooled(c Claim, ests []est, imputed []*Moments) est {
	var q, u []float64
	var first est
	for k, m := range imputed {
		e := ests[k]
		if !e.ok() {
			return est{err: fmt.Errorf("imputation %d: %w", k+1, e.err), scale: e.scale}
		}
		if e.method == MethodZero {
			return e
		}
		if k == 0 {
			first = e
		}
		qk, uk := pooledScale(e, m.N, claimLevel(c))
		q, u = append(q, qk), append(u, uk)
	}
	dfCom := float64(first.n - len(first.adjusted) - 2)
	level := claimLevel(c)
	pr, err := missing.Pool(q, u, dfCom, level)
	if err != nil {
		return est{err: err, scale: first.scale}
	}
	e := est{method: "multiple_imputation", scale: first.scale, n: first.n, adjusted: first.adjusted, p: pr.P,
		value: pr.Estimate, additive: pr.Estimate, se: pr.StdError, lo: pr.CI[0], hi: pr.CI[1],
		note: fmt.Sprintf("%d imputations pooled by Rubin's rules; Barnard–Rubin df %.1f; fraction of missing information %.2f", pr.M, pr.DF, pr.FMI)}
	switch {
	case first.method == MethodPartial:
		e.value, e.lo, e.hi, e.se = math.Tanh(pr.Estimate), math.Tanh(pr.CI[0]), math.Tanh(pr.CI[1]), math.NaN()
		e.additive = e.value
	case first.scale == "odds_ratio":
		e.value, e.lo, e.hi, e.se = math.Exp(pr.Estimate), math.Exp(pr.CI[0]), math.Exp(pr.CI[1]), math.NaN()
	}
	return e
}

// pooledScale gives an estimate and its variance on the scale Rubin's
// rules pool it on.
func pooledScale(e est, n int, level float64) (q, u float64) {
	switch {
	case e.method == MethodPartial:
		return math.Atanh(e.value), 1 / float64(n-len(e.adjusted)-3)
	case e.scale == "odds_ratio":
		se := effects.SEFromCI(math.Log(e.lo), math.Log(e.hi), level)
		return math.Log(e.value), se * se
	}
	return e.value, e.se * e.se
}

func missingSummary(status string, changed int, r *missingResult) string {
	switch {
	case changed > 0 && status == StatusFail:
		return "A headline claim changes sign or significance once missing values are handled by a principled method; the conclusion rests on the missing-data method, not on the data."
	case changed > 0:
		return fmt.Sprintf("%d claim(s) change sign or significance once missing values are handled by a principled method; the paper should report the analysis by multiple imputation or maximum likelihood.", changed)
	case status == StatusWarn:
		return "Every claim keeps its sign and significance under maximum likelihood and multiple imputation, but the way missing values were handled or reported needs attention; see the findings."
	}
	return fmt.Sprintf("Every claim keeps its sign and significance under complete cases, maximum likelihood and multiple imputation (%d of %d rows complete).", r.summary.CompleteRows, r.summary.Rows)
}
