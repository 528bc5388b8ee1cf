package checks

import (
	"context"
	"fmt"
	"math"
	"sort"
	"strings"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat"

	"github.com/pathvet/pathvet/checks/effects"
)

// effect-reporting: does every claim carry an effect size and interval
// beside its p-value; are the reported numbers consistent; is "no effect"
// backed by an interval that excludes meaningful effects? (README, "Checks")
var effectReportingCheck = Check{
	ID:        "effect-reporting",
	Title:     "Effect sizes, intervals and p-values",
	Run:       runEffectReporting,
	Summaries: effectReportingSummaries,
}

var effectReportingSummaries = map[string]string{
	StatusPass: "Every claim reports an effect size with its uncertainty, the reported p-values agree with the " +
		"estimates, and no claim of \"no effect\" goes beyond what the data show.",
	StatusWarn: "Some claims are reported incompletely or inconsistently, or claim \"no effect\" where the data " +
		"do not tell; see the findings.",
	StatusFail: "A headline claim is reported inconsistently or claims \"no effect\" that the data do not " +
		"support; ask the authors for the estimate, its interval and the equivalence test.",
}

// OddsRatioRange is a binary outcome's odds ratio per unit and between the
// 10th and 90th percentile of the predictor, which readers grasp.
type OddsRatioRange struct {
	PerUnit   *float64  `json:"per_unit"`
	P10       float64   `json:"p10"`
	P90       float64   `json:"p90"`
	Range     *float64  `json:"p10_to_p90"`
	RangeCI   []float64 `json:"p10_to_p90_ci"`
	Predictor string    `json:"predictor"`
}

func runEffectReporting(ctx context.Context, a *Analysis) (CheckResult, error) {
	prs := a.Study.printedClaims()
	var fs []Finding
	complete, inconsistent := 0, 0
	for i, c := range a.Study.Package.Claims {
		f, ok, bad := a.claimReporting(i, c, prs[i])
		fs = append(fs, f...)
		if ok {
			complete++
		}
		if bad {
			inconsistent++
		}
		if err := ctx.Err(); err != nil {
			return CheckResult{}, err
		}
	}
	res := CheckResult{Findings: fs, Status: statusOf(fs), Metrics: map[string]any{
		"claims": len(a.Study.Package.Claims), "claims_fully_reported": complete, "claims_inconsistent": inconsistent,
		"smallest_effect_of_interest": a.Study.SmallestEffect(),
	}}
	switch only, n := tooFewOnly(fs); {
	case skewOnly(fs) != nil: // the only warnings are normal-theory tests of indirect effects
		res.Summary = skewSummary(skewOnly(fs))
	case only: // the declared warning speaks of reporting, which is not at fault
		res.Summary = fmt.Sprintf(tooFewSummary, map[bool]string{true: "the claim", false: "the claims"}[n == 1])
	case n > 0:
		few := fmt.Sprintf(tooFewSummary, plural(n, "one claim", "some claims"))
		res.Summary = effectReportingSummaries[res.Status] + " " + strings.TrimSuffix(few, "; see the findings.") + "."
	}
	return res, nil
}

func headlineSeverity(c Claim) string {
	if c.Headline {
		return StatusFail
	}
	return StatusWarn
}

// claimReporting checks one claim: ok says it reports an effect size with
// its uncertainty; bad that its p-value disagrees with its figures.
func (a *Analysis) claimReporting(i int, c Claim, pr printed) (fs []Finding, ok, bad bool) {
	hasEst, hasUnc, hasP := c.Estimate != nil, c.StdError != nil || len(c.CI) == 2, c.PValue != nil
	switch {
	case !hasEst && hasP:
		fs = append(fs, Finding{Severity: StatusWarn, Claim: c.ID, Topic: "figures", ask: "p-without-estimate",
			Message: fmt.Sprintf("%s reports a p-value (%s) but no effect size, so readers cannot judge how large the effect "+
				"is.", c.ID, reportedP(c))})
	case !hasEst && !hasP:
		fs = append(fs, Finding{Severity: StatusWarn, Claim: c.ID, Topic: "figures", ask: "no-figures",
			Message: c.ID + " reports no estimate, interval or p-value at all."})
	case !hasUnc:
		fs = append(fs, Finding{Severity: StatusWarn, Claim: c.ID, Topic: "figures", ask: "no-interval",
			Message: fmt.Sprintf("%s reports an estimate (%g) without an interval or standard error.", c.ID,
				*c.Estimate)})
	}
	ok = hasEst && hasUnc
	decl := a.declaredEstimate(i)
	if f := a.consistency(c, pr, decl); f != nil {
		fs, bad = append(fs, *f), true
	}
	fs = append(fs, a.reportedFinding(i, c, decl)...)
	if f := a.claimTooFew(c, decl); f != nil {
		fs = append(fs, *f)
	}
	switch {
	case c.Kind == KindIndirect:
		fs = append(fs, a.indirectReporting(i, c, pr, decl)...)
	case c.AssertsAbsence:
		fs = append(fs, a.absenceFinding(i, c, decl)...)
	}
	fs = append(fs, a.oddsRatioFinding(i, c, decl)...)
	return fs, ok, bad
}

func reportedP(c Claim) string {
	rel := c.PRelation
	if rel == "" {
		rel = "="
	}
	return fmt.Sprintf("p %s %g", rel, *c.PValue)
}

// consistency recomputes the p-value from the printed estimate and SE (or
// interval) and flags a reported p that no rounding of those figures
// allows, under the claim's test distribution (testDF).
func (a *Analysis) consistency(c Claim, pr printed, decl est) *Finding {
	if c.PValue == nil || c.Estimate == nil {
		return nil
	}
	df := testDF(c, decl)
	lo, hi, ok := pRange(c, pr, df)
	if !ok {
		return nil
	}
	p, hp := *c.PValue, halfUnit(pr.PValue)
	consistent := false
	switch c.PRelation {
	case "<":
		consistent = lo < p
	case ">":
		consistent = hi > p
	default:
		consistent = p+hp >= lo && p-hp <= hi
	}
	if consistent {
		return nil
	}
	return &Finding{Severity: headlineSeverity(c), Claim: c.ID, Topic: "p-consistency", Message: fmt.Sprintf(
		"%s reports %s, but its estimate and %s give p between %s and %s under %s, allowing for the rounding of the "+
			"printed figures.",
		c.ID, reportedP(c), uncertaintyName(c), pNumber(lo), pNumber(hi), distName(df)),
		Details: map[string]any{"recomputed_p_min": num(lo), "recomputed_p_max": num(hi), "distribution": distName(df)}}
}

// testDF is the df of the distribution a claim is tested under: t on the
// recomputed OLS fit's n − k − 1 residual df, for the interval, the p-value
// and the equivalence test alike; the normal (effects.Normal) for odds
// ratios and log-odds (Wald z), correlations (Fisher's z), and claims the
// data cannot re-estimate by OLS.
func testDF(c Claim, decl est) float64 {
	switch claimScale(c) {
	case "odds_ratio", "log_odds", "correlation":
		return effects.Normal
	}
	if decl.ok() && decl.method == MethodOLS && decl.df > 0 {
		return decl.df
	}
	return effects.Normal
}

// distribution names what an estimate's p-value and interval are taken
// under: t on its OLS df, or for pooled imputations t on the
// Barnard–Rubin df (to one decimal, as the note prints it; on the pooling
// scale for correlations and odds ratios).
func (e est) distribution() string {
	switch {
	case e.method == MethodOLS && e.df > 0:
		return distName(e.df)
	case e.method == "multiple_imputation" && e.df > 0:
		return distName(math.Round(e.df*10) / 10)
	case e.method == MethodLogit || e.method == MethodPartial:
		return "normal"
	}
	return ""
}

// distName names a test distribution for a report: "normal" or "t(df)".
func distName(df float64) string {
	if math.IsInf(df, 1) {
		return "normal"
	}
	return fmt.Sprintf("t(%g)", df)
}

// figure writes a recomputed number for a sentence: two decimals where
// they carry it, three significant digits where two decimals would not
// (0.0004, 123456).
func figure(x float64) string {
	if ax := math.Abs(x); ax == 0 || (ax >= 0.01 && ax < 1e5) {
		return fmt.Sprintf("%.2f", x)
	}
	return fmt.Sprintf("%.3g", x)
}

func uncertaintyName(c Claim) string {
	if c.StdError != nil {
		return "standard error"
	}
	return "interval"
}

func pNumber(p float64) string {
	if p < 0.0001 {
		return fmt.Sprintf("%.1e", p)
	}
	return fmt.Sprintf("%.4f", p)
}

// pRange is the range of two-sided p-values that the printed figures
// allow under t on df degrees of freedom (effects.Normal for the normal):
// the estimate and SE each within half a unit of their last digit (the SE
// recovered from the interval under the same distribution where none is
// given; odds ratios on the log scale).
func pRange(c Claim, pr printed, df float64) (lo, hi float64, ok bool) {
	b, hb := *c.Estimate, halfUnit(pr.Estimate)
	logScale := c.EstimateScale == "odds_ratio"
	if logScale {
		if b <= 0 {
			return 0, 0, false
		}
		b, hb = math.Log(b), hb/b
	}
	s, hs, ok := printedSE(c, pr, logScale, df)
	if !ok || s <= 0 {
		return 0, 0, false
	}
	zmin := math.Max(math.Abs(b)-hb, 0) / (s + hs)
	zmax := (math.Abs(b) + hb) / math.Max(s-hs, s*1e-3)
	return effects.PFromT(zmax, 1, df), effects.PFromT(zmin, 1, df), true
}

// printedSE is the SE the printed figures give, with half a unit of its
// rounding: the reported SE, or (u − l)/(2 q) from the interval with q
// the quantile of t on df degrees of freedom at the claim's level.
func printedSE(c Claim, pr printed, logScale bool, df float64) (s, hs float64, ok bool) {
	switch {
	case c.StdError != nil && !logScale:
		return *c.StdError, halfUnit(pr.StdError), true
	case len(c.CI) == 2 && len(pr.CI) == 2:
		l, u := c.CI[0], c.CI[1]
		hl, hu := halfUnit(pr.CI[0]), halfUnit(pr.CI[1])
		if logScale {
			if l <= 0 {
				return 0, 0, false
			}
			l, u, hl, hu = math.Log(l), math.Log(u), hl/c.CI[0], hu/c.CI[1]
		}
		q := effects.TQuantile(0.5+claimLevel(c)/2, df)
		return (u - l) / (2 * q), (hl + hu) / (2 * q), true
	}
	return 0, 0, false
}

// dataBasis names the data a recomputed estimate comes from: the complete
// rows where some rows have a missing value (the missing-data check
// re-estimates the claims on all rows), else what.
func (a *Analysis) dataBasis(what string) string {
	d := a.Study.Data
	if d == nil || d.Kind == DataSummary || len(d.Columns) == 0 {
		return what
	}
	m, err := a.moments()
	if err != nil || m.N >= len(d.Columns[0]) {
		return what
	}
	return fmt.Sprintf("the %d complete rows (of %d)", m.N, len(d.Columns[0]))
}

// oddsRatioFinding gives a binary outcome's odds ratio between the 10th
// and 90th percentile of the predictor (raw rows, logistic estimate).
func (a *Analysis) oddsRatioFinding(i int, c Claim, decl est) []Finding {
	m, err := a.moments()
	if err != nil || m.Rows == nil || decl.method != MethodLogit || !decl.ok() {
		return nil
	}
	from := a.Study.Index[c.From]
	col := mat.Col(nil, from, m.Rows)
	sort.Float64s(col)
	p10, p90 := stat.Quantile(0.1, stat.Empirical, col, nil), stat.Quantile(0.9, stat.Empirical, col, nil)
	beta, lo, hi := decl.additive, decl.value, decl.value
	if decl.scale == "odds_ratio" {
		lo, hi = math.Log(decl.lo), math.Log(decl.hi)
	} else {
		lo, hi = decl.lo, decl.hi
	}
	span := p90 - p10
	r := &OddsRatioRange{PerUnit: finite(math.Exp(beta)), P10: round(p10), P90: round(p90), Predictor: c.From,
		Range: finite(math.Exp(beta * span))}
	if l, h := finite(math.Exp(lo*span)), finite(math.Exp(hi*span)); l != nil && h != nil && span > 0 {
		r.RangeCI = []float64{*l, *h}
	}
	a.Claims[i].OddsRatio = r
	if span == 0 || r.Range == nil {
		return nil
	}
	ci := ""
	if r.RangeCI != nil {
		ci = fmt.Sprintf(" (%g%% interval %.2f to %.2f)", 100*claimLevel(c), r.RangeCI[0], r.RangeCI[1])
	}
	return []Finding{{Severity: SeverityInfo, Claim: c.ID, Topic: "odds-range", Message: fmt.Sprintf(
		"For %s: from the 10th to the 90th percentile of %s (%g to %g), the odds of %s change by a factor of %.2f%s.",
		c.ID, c.From, r.P10, r.P90, c.To, *r.Range, ci)}}
}
