package checks

import (
	"fmt"
	"math"
)

// methodFindings judge the declared method against the missingness.
func methodFindings(method string, r *missingResult, alpha float64) []Finding {
	share := 100 * float64(r.summary.MissingCells) / float64(r.summary.Rows*len(r.summary.MissingByVariable))
	fs := []Finding{{Severity: SeverityInfo, Topic: "patterns", Message: fmt.Sprintf(
		"%d of %d rows are complete; %.1f%% of the data cells are missing, in %s.",
		r.summary.CompleteRows, r.summary.Rows, share, count(r.summary.Patterns, "pattern", "patterns"))}}
	switch name, bad := unsoundMethods[method]; {
	case method == "":
		fs = append(fs, Finding{Severity: StatusWarn, Topic: "method", ask: "method-unstated", Message: fmt.Sprintf(
			unstatedFormat, share, r.summary.CompleteRows, r.summary.Rows)})
	case method == MissingNone:
		fs = append(fs, Finding{Severity: StatusWarn, Topic: "method", ask: "method-none", Message: fmt.Sprintf(
			noneMissingFormat, share, r.summary.CompleteRows, r.summary.Rows)})
	case bad:
		fs = append(fs, Finding{Severity: StatusWarn, Topic: "method", ask: "method-unsound",
			Message: name + unsoundText + reestimatedText(method, r)})
	case method == MissingAvailableCases && r.pairwiseErr != "":
		fs = append(fs, Finding{Severity: StatusWarn, Topic: "method", ask: "available-cases",
			Message: "Available-case analysis: " + r.pairwiseErr + "."})
	}
	if r.mcar != nil && !math.IsNaN(r.mcar.P) {
		sev, tail, ask := SeverityInfo, "", ""
		rejected := r.mcar.P < alpha
		if rejected && (method == MissingCompleteCases || method == MissingAvailableCases || method == "") {
			sev, tail = StatusWarn, littleRejectedTail
			if method == "" {
				ask = "mcar-unstated"
			}
		}
		verdict := "does not reject"
		if rejected {
			verdict = "rejects"
		}
		fs = append(fs, Finding{Severity: sev, Topic: "mcar", ask: ask, Message: fmt.Sprintf(littleFormat,
			verdict, alpha, r.mcar.ChiSquare, r.mcar.DF, pText(r.mcar.P), tail)})
	}
	return fs
}

// Long message formats of the missing-data findings.
const (
	unsoundText = " biases coefficients and understates their uncertainty (Little & Rubin, " +
		"Statistical Analysis with Missing Data)"
	unstatedFormat = "The package does not say how missing values were handled, and %.1f%% of the data cells " +
		"are missing (%d of %d rows are complete)."
	noneMissingFormat = "The package says no values are missing, but %.1f%% of the data cells are " +
		"(%d of %d rows are complete)."
	// littleRejectedTail says what a rejection of MCAR shows, and no more:
	// the complete cases are no random subset of the rows, yet a
	// complete-case regression stays unbiased when the missingness depends
	// on its predictors alone (Little & Rubin, Statistical Analysis with
	// Missing Data, 2nd ed., sec. 3.2), which the test cannot tell.
	// The question asks why the analysis of complete or available cases
	// holds (only if the paper analysed them, where it does not say).
	littleRejectedTail = " That speaks against missing completely at random only: the complete or available " +
		"cases are then no random subset of the rows, but a complete-case regression stays unbiased when the " +
		"missingness depends on its predictors alone, which the test cannot tell."
	littleFormat = "Little's test %s at the %g level that values are missing completely at random " +
		"(χ² = %.2f on %d df, %s).%s"
	uncomparedFormat = "%s could not be estimated by %s (%s), so whether its conclusion depends on how " +
		"missing values were handled is not known."
	missingFailSummary = "A headline claim changes sign or significance once missing values are handled by a " +
		"principled method; the conclusion rests on the missing-data method, not on the data."
	missingChangedFormat = "%s %s sign or significance once missing values are handled by a principled method; " +
		"the paper should report the analysis by multiple imputation or maximum likelihood."
)

// reestimatedText says by which principled methods the claims were
// re-estimated and which one the findings hold the declared method
// against: the report's missing_data has every estimate, the findings
// compare one.
func reestimatedText(method string, r *missingResult) string {
	done := principledDone(r)
	if done == "" {
		return "; the claims could not be re-estimated by a principled method."
	}
	has := methodsRun(r)
	dk, pk := comparison(method, has)
	if _, ok := has[pk]; !ok {
		return "; the claims are re-estimated by " + done + "."
	}
	return fmt.Sprintf("; the claims are re-estimated by %s, and each claim's %s estimate is held against "+
		"its estimate by %s.", done, r.label(dk), r.label(pk))
}

// principledDone names the principled methods the claims were re-estimated
// by: maximum likelihood, multiple imputation, both or neither ("").
func principledDone(r *missingResult) string {
	_, ml := r.moments[MissingMaximumLikelihood]
	switch mi := len(r.imputed) > 0; {
	case ml && mi:
		return "maximum likelihood and multiple imputation"
	case ml:
		return "maximum likelihood"
	case mi:
		return "multiple imputation"
	}
	return ""
}

// principledMissing names the principled methods that could not be run.
func principledMissing(r *missingResult) string {
	_, ml := r.moments[MissingMaximumLikelihood]
	switch mi := len(r.imputed) > 0; {
	case !ml && !mi:
		return "maximum likelihood and multiple imputation"
	case !ml:
		return "maximum likelihood"
	case !mi:
		return "multiple imputation"
	}
	return ""
}

// methodLabel names the missing-data methods in sentences.
var methodLabel = map[string]string{
	MissingCompleteCases:     "complete cases",
	MissingAvailableCases:    "available cases",
	MissingMeanSubstitution:  "mean substitution",
	MissingSingleRegression:  "single regression imputation",
	MissingMaximumLikelihood: "maximum likelihood (EM)",
}

// label names a method in sentences; multiple imputation with the m it ran.
func (r *missingResult) label(key string) string {
	if key == MissingMultipleImputation {
		return fmt.Sprintf("multiple imputation with %d imputations", max(len(r.imputed), Imputations))
	}
	return methodLabel[key]
}

// claimMissing estimates a claim by every method, fills
// claims[].missing_data, and says whether its conclusion changes between
// the declared method and a principled one.
func (a *Analysis) claimMissing(i int, c Claim, method string, r *missingResult) ([]Finding, bool) {
	pa := a.declaredParentsFor(c)
	ests := map[string]est{}
	for key, m := range r.moments {
		ests[key] = a.estimateUnder(m, pa, c)
	}
	if len(r.imputed) > 0 {
		ests[MissingMultipleImputation] = a.pooled(c, r.imputedEst[i], r.imputed)
	}
	out := map[string]*Estimate{}
	for key, e := range ests {
		out[key] = a.report(e)
	}
	a.Claims[i].MissingData = out
	if why := a.graphContradiction(c); why != "" {
		return []Finding{{Severity: SeverityInfo, Claim: c.ID, Topic: "by-method", Message: fmt.Sprintf(
			"%s is not weighed here: the declared graph itself gives it no effect, %s.",
			c.ID,
			why,
		)}}, false
	}
	declaredKey, principledKey := comparison(method, ests)
	d, p := ests[declaredKey], ests[principledKey]
	if f := r.uncompared(c, ests, declaredKey, principledKey); f != nil {
		return f, false
	}
	if d.category(a.Alpha) == p.category(a.Alpha) {
		return []Finding{{Severity: SeverityInfo, Claim: c.ID, Topic: "by-method", Message: fmt.Sprintf(
			"%s %s: %s by %s, %s by %s.", c.ID, agreement(d, p, a.Alpha),
			valueText(d), r.label(declaredKey), valueText(p), r.label(principledKey))}}, false
	}
	sev := StatusWarn
	if c.Headline {
		sev = StatusFail
	}
	level := claimLevel(c)
	return []Finding{{Severity: sev, Claim: c.ID, Topic: "by-method", Message: fmt.Sprintf(
		"%s is %s by %s (%s) but %s by %s (%s): the conclusion depends on how missing values were handled.",
		c.ID, valueText(d), r.label(declaredKey), ciText(d, level), valueText(p), r.label(principledKey),
		ciText(p, level))}}, true
}

// uncompared is the warning for a claim whose declared-method or
// principled estimate could not be made, with the reason; nil when both
// were made.
func (r *missingResult) uncompared(c Claim, ests map[string]est, declaredKey, principledKey string) []Finding {
	for _, key := range []string{declaredKey, principledKey} {
		e, ok := ests[key]
		why := "that method could not be run on these data"
		if ok && e.ok() {
			continue
		}
		if ok {
			why = e.err.Error()
		}
		return []Finding{{Severity: StatusWarn, Claim: c.ID, Topic: "by-method", ask: "by-method-unestimated",
			Message: fmt.Sprintf(uncomparedFormat, c.ID, r.label(key), why)}}
	}
	return nil
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

func ciText(e est, level float64) string {
	if e.method == MethodZero || math.IsNaN(e.lo) || math.IsNaN(e.hi) {
		return "no interval"
	}
	return fmt.Sprintf("%g%% interval %s to %s", 100*level, estText(e.lo), estText(e.hi))
}

// declaredParentsFor is the graph the declared estimate uses.
func (a *Analysis) declaredParentsFor(c Claim) parentsFunc {
	if a.Study.Declared != nil && a.claimInGraph(c) {
		return a.Study.Declared.Parents
	}
	return nil
}

// methodsRun is the set of methods the claims were re-estimated by, keyed
// as comparison wants them.
func methodsRun(r *missingResult) map[string]est {
	has := map[string]est{}
	for k := range r.moments {
		has[k] = est{}
	}
	if len(r.imputed) > 0 {
		has[MissingMultipleImputation] = est{}
	}
	return has
}

func missingSummary(status string, changed, uncompared int, method string, r *missingResult) string {
	has := methodsRun(r)
	dk, pk := comparison(method, has)
	switch {
	case changed > 0 && status == StatusFail:
		return missingFailSummary
	case changed > 0:
		return fmt.Sprintf(
			missingChangedFormat,
			count(changed, "claim", "claims"),
			plural(changed, "changes", "change"),
		)
	case uncompared > 0:
		return fmt.Sprintf("%s could not be compared between %s and %s, so the screen of missing data is "+
			"incomplete; see the findings.", count(uncompared, "claim", "claims"), r.label(dk), r.label(pk))
	case status == StatusWarn:
		return fmt.Sprintf("No claim changes its conclusion between %s and %s, but the way missing values were "+
			"handled or reported needs attention; see the findings.", r.label(dk), r.label(pk))
	}
	return fmt.Sprintf("No claim changes its conclusion (the sign of a significant estimate, or its "+
		"non-significance) between %s and %s (%d of %d rows complete).", r.label(dk), r.label(pk),
		r.summary.CompleteRows, r.summary.Rows)
}
