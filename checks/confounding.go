package checks

import (
	"context"
	"fmt"
	"math"

	"github.com/pathvet/pathvet/checks/effects"
)

// weakEValue: an interval-limit E-value below it means that a confounder
// associated with treatment and outcome by a risk ratio under 1.5 could
// move the interval to the null. No source fixes such a line; it is common
// practice to read E-values near 1 as fragile.
const weakEValue = 1.5

// rareOutcome is the prevalence below which an odds ratio approximates a
// risk ratio (VanderWeele & Ding 2017). The rule is about the outcome
// being rare, so a prevalence of 0.9 is common, not rare.
const rareOutcome = 0.15

// confounding-sensitivity: how strong would unmeasured confounding have
// to be to explain each causal claim away? (README, "Checks")
var confoundingCheck = Check{
	ID:    "confounding-sensitivity",
	Title: "Sensitivity to unmeasured confounding",
	Run:   runConfounding,
	Summaries: map[string]string{
		StatusPass: "For each causal claim, an unmeasured confounder would need a risk-ratio association of at least 1.5 " +
			"with both cause and outcome to move the interval to include no effect; see the E-values.",
		StatusWarn: "Unmeasured confounding of modest strength could move some causal claims' intervals to include no " +
			"effect, or some claims have no E-value; see the findings.",
		StatusNotApplicable: "The paper makes no causal claim, so there is nothing to explain away.",
	},
}

// EValue is a causal claim's E-values (VanderWeele & Ding 2017).
type EValue struct {
	Estimate   *float64 `json:"estimate"`
	CILimit    *float64 `json:"ci_limit"`
	RiskRatio  *float64 `json:"risk_ratio"`
	Conversion string   `json:"conversion"`
	Source     string   `json:"source"` // reported or recomputed
}

func runConfounding(ctx context.Context, a *Analysis) (CheckResult, error) {
	s := a.Study
	if s.Package.Design == "randomized" {
		return CheckResult{Status: StatusNotApplicable, Summary: "The design is randomized, so confounding of the " +
			"randomized comparison is ruled out by design."}, nil
	}
	var fs []Finding
	var g eValueGroups
	for i, c := range s.Package.Claims {
		if c.Kind == KindIndirect && !c.AssertsAbsence {
			f, ok := a.mediatorFinding(i, c)
			fs = append(fs, f)
			if ok {
				g.rho = append(g.rho, c.ID)
			} else {
				g.noRho = append(g.noRho, c.ID)
			}
			continue
		}
		ce := a.eValues()[i] // shared with causal-language (shared.go)
		ev, note := ce.ev, ce.why
		if ev == nil && note == "" {
			if Causal(c.Kind) { // a claim of no effect has nothing to explain away
				g.absent = append(g.absent, c.ID)
			}
			continue
		}
		if ev == nil {
			sev := map[bool]string{true: SeverityInfo, false: StatusWarn}[ce.contradicted]
			fs = append(
				fs,
				Finding{Severity: sev, Claim: c.ID, Topic: "e-value", ask: "e-value-missing",
					Message: fmt.Sprintf("No E-value for %s: %s.", c.ID, note)},
			)
			if ce.contradicted {
				g.contradicted = append(g.contradicted, c.ID)
			} else {
				g.missing = append(g.missing, c.ID)
			}
			continue
		}
		g.computed = append(g.computed, c.ID)
		if *ev.CILimit < weakEValue {
			g.weak = append(g.weak, c.ID)
		}
		a.Claims[i].EValue = ev
		f := eValueFinding(c, ev)
		f.Message += a.directionCaution(i, c)
		fs = append(fs, f)
		if err := ctx.Err(); err != nil {
			return CheckResult{}, err
		}
	}
	if len(fs) == 0 {
		res := CheckResult{Status: StatusNotApplicable, Summary: "The paper makes no causal claim, so there is " +
			"nothing to explain away."}
		if len(g.absent) > 0 {
			res.Summary = fmt.Sprintf("The only causal %s no effect, so there is nothing for confounding to "+
				"explain away.", plural(len(g.absent), "claim, "+g.absent[0]+", asserts",
				"claims, "+joinAnd(g.absent)+", assert"))
		}
		return res, nil
	}
	res := CheckResult{Findings: fs, Status: statusOf(fs),
		Metrics: map[string]any{"claims_with_e_value": len(g.computed), "weak_e_value_below": weakEValue}}
	res.Summary = confoundingSummary(g)
	if len(g.computed) == 0 && len(g.missing) == 0 && len(g.rho)+len(g.noRho) == 0 {
		// only claims the declared graph gives no effect
		res.Status, res.Summary = StatusNotApplicable, "No causal claim is left to explain away: "+
			"the declared graph gives each no effect (see graph-declared)."+g.absentText()
	}
	return res, nil
}

// eValue converts the claim to the risk-ratio scale and computes its
// E-values, from the reported figures where they allow it, else from the
// recomputed estimate.
func (a *Analysis) eValue(i int, c Claim) (*EValue, string) {
	if c.Estimate != nil && (c.StdError != nil || len(c.CI) == 2) {
		if ev := a.convert(c, claimScale(c), *c.Estimate, c.StdError, c.CI, "reported"); ev != nil {
			return ev, ""
		}
	}
	d := a.declaredEstimate(i)
	if !d.ok() || d.method == MethodZero {
		return nil, "neither the reported figures nor the data give an estimate with its uncertainty"
	}
	var se *float64
	if !math.IsNaN(d.se) {
		se = &d.se
	}
	if ev := a.convert(c, d.scale, d.value, se, []float64{d.lo, d.hi}, "recomputed"); ev != nil {
		return ev, ""
	}
	if a.Study.Package.Variables[a.Study.Index[c.To]].Scale == ScaleBinary {
		return nil, "the outcome is binary, and without raw rows its re-estimate is a linear coefficient, " +
			"which has no conversion to risk ratios; report the odds ratio with its interval"
	}
	return nil, "its scale has no conversion to risk ratios"
}

// convert takes an estimate b on the given scale (the claim's for the
// reported figures, the re-estimate's for the recomputed ones) to E-values.
// A linear coefficient of a binary outcome has no conversion.
func (a *Analysis) convert(c Claim, scale string, b float64, se *float64, ci []float64, source string) *EValue {
	var ev *EValue
	binary := a.Study.Package.Variables[a.Study.Index[c.To]].Scale == ScaleBinary
	switch {
	case scale == "odds_ratio" || scale == "log_odds":
		ev = a.convertOddsRatio(c, scale, b, se, ci)
	case scale == "unstandardized" || binary:
		return nil
	default: // standardized or correlation: as a standardized difference
		ev = a.convertStandardized(c, scale, b, se, ci)
	}
	if ev == nil || ev.Estimate == nil || ev.CILimit == nil {
		return nil
	}
	ev.Source = source
	return ev
}

// convertOddsRatio takes an odds ratio (or log-odds) to the risk-ratio
// scale by the outcome's prevalence. Its interval is the given one, or,
// for log-odds with an SE, the Wald interval b ± z SE; an odds ratio with
// an SE but no interval gives none (the SE's scale is not stated).
func (a *Analysis) convertOddsRatio(c Claim, scale string, b float64, se *float64, ci []float64) *EValue {
	var lo, hi float64
	switch {
	case len(ci) == 2:
		lo, hi = ci[0], ci[1]
	case scale == "log_odds" && se != nil:
		z := effects.TQuantile(0.5+claimLevel(c)/2, effects.Normal)
		lo, hi = b-z**se, b+z**se
	default:
		return nil
	}
	or := b
	if scale == "log_odds" {
		or, lo, hi = math.Exp(b), math.Exp(lo), math.Exp(hi)
	}
	prev, known := a.prevalence(c)
	rare := known && prev < rareOutcome
	ev := &EValue{Conversion: fmt.Sprintf("odds ratio taken as a risk ratio (outcome prevalence %.2f, rarer than "+
		"15%%)", prev)}
	switch {
	case !known:
		ev.Conversion = "risk ratio ≈ sqrt(odds ratio) (outcome prevalence unknown, taken as common)"
	case !rare:
		ev.Conversion = fmt.Sprintf("risk ratio ≈ sqrt(odds ratio) (outcome prevalence %.2f, not rare)", prev)
	}
	rr := effects.RRFromOR(or, rare)
	ev.RiskRatio, ev.Estimate = finite(rr), finite(effects.EValue(rr))
	ev.CILimit = finite(effects.EValueCI(effects.RRFromOR(lo, rare), effects.RRFromOR(hi, rare)))
	return ev
}

// convertStandardized takes a standardized estimate d (a correlation r
// first to d = 2r/√(1 − r²), Borenstein et al. 2009, eq. 7.5) to the
// risk-ratio scale by exp(0.91 d) (VanderWeele & Ding 2017), and the
// interval's limit nearer the null the same way: the given interval, or
// b ± z SE at the claim's level (their exp(0.91 d ∓ 1.78 SE) at 95%),
// each limit converted, so that a correlation's interval is not taken as
// one of d. The conversion text says what the approximation was made for.
func (a *Analysis) convertStandardized(c Claim, scale string, b float64, se *float64, ci []float64) *EValue {
	var lo, hi float64
	switch {
	case len(ci) == 2 && !math.IsNaN(ci[0]) && !math.IsNaN(ci[1]):
		lo, hi = ci[0], ci[1]
	case se != nil && !math.IsNaN(*se):
		z := effects.TQuantile(0.5+claimLevel(c)/2, effects.Normal)
		lo, hi = b-z**se, b+z**se
	default:
		return nil
	}
	toD, note := func(x float64) float64 { return x }, ""
	if scale == "correlation" {
		toD, note = dFromR, "d = 2r/√(1 − r²) from the correlation r (Borenstein et al. 2009); "
	}
	rr := math.Exp(0.91 * toD(b))
	ev := &EValue{Conversion: "risk ratio ≈ exp(0.91 d), an approximation made for a binary exposure with d the " +
		"difference in outcome SDs between its groups (VanderWeele & Ding 2017); " + note + a.exposureNote(c)}
	ev.RiskRatio, ev.Estimate = finite(rr), finite(effects.EValue(rr))
	ev.CILimit = finite(effects.EValueCI(math.Exp(0.91*toD(lo)), math.Exp(0.91*toD(hi))))
	return ev
}

// dFromR converts a correlation to a standardized difference,
// d = 2r/√(1 − r²) (Borenstein et al. 2009, Introduction to Meta-Analysis,
// eq. 7.5); ±Inf at |r| ≥ 1 (an interval limit past ±1).
func dFromR(r float64) float64 {
	if math.Abs(r) >= 1 {
		return math.Copysign(math.Inf(1), r)
	}
	return 2 * r / math.Sqrt(1-r*r)
}

// exposureNote says how far a claim's standardized estimate is from the d
// the exp(0.91 d) approximation was made for.
func (a *Analysis) exposureNote(c Claim) string {
	if a.Study.Package.Variables[a.Study.Index[c.From]].Scale == ScaleBinary {
		return c.From + " is binary, but a coefficient standardized on both variables is about d times its SD " +
			"(at most d/2), so this E-value is likely too small"
	}
	return c.From + " is not binary, so d is taken per SD of it and the E-value is a rough guide"
}

// prevalence is a binary outcome's prevalence, the mean of its 0/1 values:
// from the raw rows or from data.means of a summary package; known is
// false when the outcome is not binary, no mean is given, or the mean is
// not a proportion.
func (a *Analysis) prevalence(c Claim) (p float64, known bool) {
	to := a.Study.Index[c.To]
	if a.Study.Package.Variables[to].Scale != ScaleBinary {
		return math.NaN(), false
	}
	m, err := a.moments()
	if err != nil || m.Means == nil || to >= len(m.Means) {
		return math.NaN(), false
	}
	p = m.Means[to]
	return p, p >= 0 && p <= 1
}

func eValueFinding(c Claim, ev *EValue) Finding {
	sev := SeverityInfo
	if *ev.CILimit < weakEValue {
		sev = StatusWarn
	}
	how := fmt.Sprintf("an unmeasured confounder associated with both %s and %s by a risk ratio of %.2f each "+
		"could explain the estimate away, and one of %.2f could move its interval to include no effect",
		c.From, c.To, *ev.Estimate, *ev.CILimit)
	if *ev.CILimit == 1 {
		how = fmt.Sprintf("an unmeasured confounder of strength %.2f could explain the estimate away, and the "+
			"interval already includes no effect", *ev.Estimate)
	}
	return Finding{Severity: sev, Claim: c.ID, Topic: "e-value",
		Message: fmt.Sprintf("E-value for %s (%s figures; %s): %s.", c.ID, ev.Source, ev.Conversion, how)}
}
