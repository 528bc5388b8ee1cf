package checks

import (
	"context"
	"fmt"
	"math"
	"strings"

	"gonum.org/v1/gonum/mat"

	"github.com/pathvet/pathvet/checks/effects"
)

// lowReliability: reliabilities below it are noted. A rule of thumb in the
// field (common practice, no single source).
const lowReliability = 0.70

// measurement: are reliabilities reported, and how much would measurement
// error move the claims? (README, "Checks")
var measurementCheck = Check{
	ID:    "measurement",
	Title: "Measurement error",
	Run:   runMeasurement,
	Summaries: map[string]string{
		StatusPass: "Correcting for measurement error changes the conclusion of no claim it could " +
			"re-estimate.",
		StatusWarn:          "Measurement error needs attention; see the findings.",
		StatusFail:          "Correcting for measurement error changes the sign or significance of a headline claim.",
		StatusNotApplicable: "Nothing here is open to a correction for measurement error.",
	},
}

// MeasurementResult is a claim re-estimated on the correlation matrix
// corrected for attenuation.
type MeasurementResult struct {
	Corrected *Estimate `json:"corrected"`
	Change    *float64  `json:"change"` // corrected − declared estimate
	Changed   bool      `json:"changed"`
}

func runMeasurement(ctx context.Context, a *Analysis) (CheckResult, error) {
	s := a.Study
	used := claimVariables(s)
	var missingRel, low []string
	rel := make([]float64, len(s.Names))
	for i, v := range s.Package.Variables {
		rel[i] = 1
		switch {
		case v.Scale == ScaleBinary:
		case v.Reliability == nil && used[i]:
			missingRel = append(missingRel, v.Name)
		case v.Reliability != nil:
			rel[i] = *v.Reliability
			if *v.Reliability < lowReliability && used[i] {
				low = append(low, fmt.Sprintf("%s (%.2f)", v.Name, *v.Reliability))
			}
		}
	}
	var fs []Finding
	if len(missingRel) > 0 {
		fs = append(fs, Finding{Severity: StatusWarn, Topic: "no-reliability",
			Details: map[string]any{"variables": missingRel}, Message: fmt.Sprintf(
				"No reliability is reported for %s; how much measurement error weakens the claims that use %s cannot "+
					"be judged, and %s left uncorrected.",
				strings.Join(missingRel, ", "), them(len(missingRel)), plural(len(missingRel), "it is", "they are"))})
	}
	if len(low) > 0 {
		fs = append(fs, Finding{Severity: SeverityInfo, Topic: "low-reliability",
			Message: "Reliability below .70 (a rule of thumb in the " +
				"field, no single source): " + strings.Join(low, ", ") + "."})
	}
	m, err := a.moments()
	if err != nil {
		return CheckResult{}, fmt.Errorf("the correction for measurement error needs the data's correlations: "+
			"%w", a.dataError())
	}
	corrected, problem := correctedMoments(m, rel)
	metrics := map[string]any{"variables_without_reliability": len(missingRel), "variables_low_reliability": len(low)}
	if problem != "" {
		fs = append(fs, Finding{Severity: StatusWarn, Topic: "corrected-impossible", Message: "Corrected for " +
			"attenuation (Spearman 1904), the " +
			"correlation matrix " + problem + ", so the claims are not re-estimated on it; the reliabilities and " +
			"the correlations cannot all be right."})
	} else {
		cf, n, changed := a.correctedClaims(corrected)
		metrics["claims_corrected"], metrics["claims_changed"] = n, changed
		fs = append(fs, cf...)
	}
	if err := ctx.Err(); err != nil {
		return CheckResult{}, err
	}
	res := CheckResult{Findings: fs, Status: statusOf(fs), Metrics: metrics}
	res.Summary = measurementSummary(res.Status, metrics, len(s.Package.Claims), problem != "")
	return res, nil
}

func measurementSummary(status string, metrics map[string]any, claims int, impossible bool) string {
	switch {
	case status == StatusFail:
		return "" // the declared summary
	case impossible:
		return "Corrected for the reported reliabilities, the correlations are impossible, so the claims could not " +
			"be re-estimated; the reliabilities or the correlations need checking."
	case status == StatusWarn:
		return measurementWarnText(metrics)
	}
	n, _ := metrics["claims_corrected"].(int)
	return measurementPassText(n, claims)
}

// measurementWarnText names the reasons for a warning that apply, and
// only those.
func measurementWarnText(metrics map[string]any) string {
	var why []string
	if k, _ := metrics["variables_without_reliability"].(int); k > 0 {
		why = append(why, fmt.Sprintf("%s reported for %d of the claims' variables",
			plural(k, "no reliability is", "no reliabilities are"), k))
	}
	n, _ := metrics["claims_corrected"].(int)
	switch changed, _ := metrics["claims_changed"].(int); {
	case n == 0:
		why = append(why, "no claim could be re-estimated on the corrected correlations")
	case changed > 0:
		why = append(why, fmt.Sprintf("correcting for it changes the conclusion of %d of the %d claims "+
			"re-estimated", changed, n))
	}
	if len(why) == 0 {
		return "Measurement error needs attention: some claims could not be estimated with and without the " +
			"correction; see the findings."
	}
	return "Measurement error needs attention: " + strings.Join(why, ", and ") + "; see the findings."
}

// measurementPassText says how many claims were re-estimated on the
// corrected correlations, and of how many, without a bare "(of n)".
func measurementPassText(n, claims int) string {
	const head = "Reliabilities are reported for the claims' variables; "
	switch {
	case n == 0:
		return head + "no claim could be re-estimated on the corrected correlations."
	case n == 1 && claims == 1:
		return head + "the claim, re-estimated on the corrected correlations, keeps its conclusion."
	case n == claims:
		return fmt.Sprintf("%scorrecting for measurement error changes the conclusion of none of the %d claims, "+
			"each re-estimated on the corrected correlations.", head, n)
	}
	return fmt.Sprintf("%s%d of the %d claims %s re-estimated on the corrected correlations, and correcting for "+
		"measurement error changes the conclusion of none of them.", head, n, claims, plural(n, "was", "were"))
}

// claimVariables marks the variables that some claim names.
func claimVariables(s *Study) []bool {
	used := make([]bool, len(s.Names))
	for _, c := range s.Package.Claims {
		for _, v := range append([]string{c.From, c.To}, c.AdjustFor...) {
			used[s.Index[v]] = true
		}
	}
	return used
}

// correctedMoments applies Spearman's correction to the correlations;
// problem says why the result is not usable.
func correctedMoments(m *Moments, rel []float64) (*Moments, string) {
	cor, err := effects.CorrectAttenuation(m.Cor, rel)
	if err != nil {
		return nil, err.Error()
	}
	p := cor.SymmetricDim()
	for i := range p {
		for j := range i {
			if math.Abs(cor.At(i, j)) >= 1 {
				return nil, fmt.Sprintf("has an entry of %.3f, beyond ±1", cor.At(i, j))
			}
		}
	}
	var eig mat.EigenSym
	if !eig.Factorize(cor, false) {
		return nil, "has eigenvalues that cannot be computed"
	}
	if low := eig.Values(nil)[0]; low <= minEigen {
		return nil, fmt.Sprintf("is not positive definite (smallest eigenvalue %.4g)", low)
	}
	return &Moments{N: m.N, Cor: cor, SD: m.SD, Method: "corrected_for_attenuation"}, ""
}

// correctedClaims re-estimates every claim on the corrected matrix, on
// the standardized scale, and reports the change; n counts the claims
// re-estimated, changed those whose conclusion the correction changes.
func (a *Analysis) correctedClaims(cm *Moments) (fs []Finding, n, changed int) {
	var skipped []string
	for i, c := range a.Study.Package.Claims {
		if why := a.notCorrectable(c); why != "" {
			skipped = append(skipped, c.ID+" "+why)
			continue
		}
		std := c
		if std.EstimateScale != "correlation" {
			std.EstimateScale = "standardized"
		}
		decl := a.estimateUnder(a.mustMoments(), a.declaredParentsFor(c), std)
		corr := a.estimateUnder(cm, a.declaredParentsFor(c), std)
		if bad := firstErr(decl, corr); bad != nil {
			fs = append(fs, Finding{Severity: StatusWarn, Claim: c.ID, Topic: "corrected",
				ask: "corrected-unestimated",
				Message: fmt.Sprintf("%s could not be estimated with and without the correction (%v), so what "+
					"measurement error does to "+
					"it is not known.", c.ID, bad)})
			continue
		}
		if corr.method == MethodZero {
			skipped = append(skipped, c.ID+" has no effect under the declared graph")
			continue
		}
		n++
		r := &MeasurementResult{Corrected: a.report(corr), Change: finite(corr.value - decl.value)}
		r.Changed = corr.category(a.Alpha) != decl.category(a.Alpha)
		a.Claims[i].Measurement = r
		if r.Changed {
			changed++
			fs = append(fs, Finding{Severity: headlineSeverity(c), Claim: c.ID, Topic: "corrected",
				Message: fmt.Sprintf(
					"%s is %s as measured but %s once the correlations are corrected for the reported reliabilities: "+
						"measurement error alone could carry the conclusion.",
					c.ID, valueText(decl), valueText(corr))})
		} else if math.Abs(corr.value-decl.value) >= 0.05 {
			fs = append(fs, Finding{Severity: SeverityInfo, Claim: c.ID, Topic: "corrected", Message: fmt.Sprintf(
				"%s moves from %s to %s (standardized) when corrected for measurement error; it "+
					"%s.", c.ID, estText(decl.value), estText(corr.value),
				agreement(decl, corr, a.Alpha))})
		}
	}
	if n == 0 && len(skipped) > 0 {
		fs = append(fs, Finding{Severity: StatusWarn, Topic: "none-corrected", Message: "No claim could be " +
			"re-estimated on the corrected " +
			"correlations, so what measurement error does to the claims is not known: " +
			strings.Join(skipped, "; ") + "."})
	}
	return fs, n, changed
}

// notCorrectable says why claim c is not re-estimated on the corrected
// correlations: Spearman's correction is for correlations, not for a
// logistic model, and a claim the graph gives no effect has nothing to
// correct.
func (a *Analysis) notCorrectable(c Claim) string {
	switch {
	case a.Study.Package.Variables[a.Study.Index[c.To]].Scale == ScaleBinary:
		return "has a binary outcome, and the correction for attenuation is not made for a logistic model"
	case a.graphContradiction(c) != "":
		return "is given no effect by the declared graph"
	}
	return ""
}

// firstErr is the error of the first estimate that has one.
func firstErr(es ...est) error {
	for _, e := range es {
		if e.err != nil {
			return e.err
		}
	}
	return nil
}

func (a *Analysis) mustMoments() *Moments {
	m, _ := a.moments()
	return m
}
