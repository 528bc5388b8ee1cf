package checks

import (
	"context"
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"

	"github.com/pathvet/pathvet/checks/effects"
)

// weakEValue: an interval-limit E-value below it means that a confounder
// associated with treatment and outcome by a risk ratio under 1.5 could
// move the interval to the null. No source fixes such a line; it is common
// practice to read E-values near 1 as fragile.
const weakEValue = 1.5

// rareOutcome is the prevalence below which an odds ratio approximates a
// risk ratio (VanderWeele & Ding 2017).
const rareOutcome = 0.15

// confounding-sensitivity: how strong would unmeasured confounding have
// to be to explain each causal claim away? (checks.md)
var confoundingCheck = Check{
	ID:    "confounding-sensitivity",
	Title: "Sensitivity to unmeasured confounding",
	Run:   runConfounding,
	Summaries: map[string]string{
		StatusPass:          "An unmeasured confounder would need to be strongly associated with both cause and outcome to explain the causal claims away.",
		StatusWarn:          "Modest unmeasured confounding could explain some causal claims away, and the paper's design does not rule it out; see the E-values.",
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
		return CheckResult{Status: StatusNotApplicable, Summary: "The design is randomized, so confounding of the randomized comparison is ruled out by design."}, nil
	}
	var fs []Finding
	computed := 0
	for i, c := range s.Package.Claims {
		ce := a.eValues()[i] // shared with causal-language (shared.go)
		ev, note := ce.ev, ce.why
		if ev == nil && note == "" {
			continue // an association, or a claim of no effect, has nothing to explain away
		}
		if ev == nil {
			sev := map[bool]string{true: SeverityInfo, false: StatusWarn}[ce.contradicted]
			fs = append(fs, Finding{Severity: sev, Claim: c.ID, Message: fmt.Sprintf("No E-value for %s: %s.", c.ID, note)})
			continue
		}
		computed++
		a.Claims[i].EValue = ev
		fs = append(fs, eValueFinding(c, ev))
		if err := ctx.Err(); err != nil {
			return CheckResult{}, err
		}
	}
	if len(fs) == 0 {
		return CheckResult{Status: StatusNotApplicable}, nil
	}
	res := CheckResult{Findings: fs, Status: statusOf(fs), Metrics: map[string]any{"claims_with_e_value": computed, "weak_e_value_below": weakEValue}}
	if computed == 0 && res.Status == StatusPass { // only claims the declared graph gives no effect
		res.Status, res.Summary = StatusNotApplicable, "No causal claim is left to explain away: the declared graph gives each no effect (see graph-declared)."
	}
	return res, nil
}

// eValue converts the claim to the risk-ratio scale and computes its
// E-values, from the reported figures where they allow it, else from the
// recomputed estimate.
func (a *Analysis) eValue(i int, c Claim) (*EValue, string) {
	if c.Estimate != nil && (c.StdError != nil || len(c.CI) == 2) {
		if ev := a.convert(c, *c.Estimate, c.StdError, c.CI, "reported"); ev != nil {
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
	if ev := a.convert(c, d.value, se, []float64{d.lo, d.hi}, "recomputed"); ev != nil {
		return ev, ""
	}
	return nil, "its scale has no conversion to risk ratios"
}

func (a *Analysis) convert(c Claim, b float64, se *float64, ci []float64, source string) *EValue {
	ev := &EValue{Source: source}
	var rr, limit float64
	switch scale := claimScale(c); scale {
	case "odds_ratio", "log_odds":
		or, lo, hi := b, ci[0], ci[1]
		if scale == "log_odds" {
			or, lo, hi = math.Exp(b), math.Exp(ci[0]), math.Exp(ci[1])
		}
		rare, known := a.prevalenceRare(c)
		ev.Conversion = "odds ratio taken as a risk ratio (outcome rarer than 15%)"
		if !rare {
			ev.Conversion = "risk ratio ≈ sqrt(odds ratio) (outcome not rare)"
			if !known {
				ev.Conversion = "risk ratio ≈ sqrt(odds ratio) (outcome prevalence unknown, taken as common)"
			}
		}
		rr = effects.RRFromOR(or, rare)
		limit = effects.EValueCI(effects.RRFromOR(lo, rare), effects.RRFromOR(hi, rare))
		ev.CILimit = finite(limit)
	default: // standardized, correlation, unstandardized: as a standardized difference
		d, s := b, math.NaN()
		if se != nil {
			s = *se
		} else if len(ci) == 2 {
			s = effects.SEFromCI(ci[0], ci[1], claimLevel(c))
		}
		if scale == "unstandardized" {
			return nil
		}
		rr, limit = effects.RRFromD(d, s)
		ev.Conversion = "standardized effect d as risk ratio exp(0.91 d), interval limit exp(0.91 d ∓ 1.78 SE)"
		ev.CILimit = finite(effects.EValue(limit))
	}
	ev.RiskRatio, ev.Estimate = finite(rr), finite(effects.EValue(rr))
	if ev.Estimate == nil || ev.CILimit == nil {
		return nil
	}
	return ev
}

// prevalenceRare says whether a binary outcome is rarer than 15%, from
// raw rows; known is false without them.
func (a *Analysis) prevalenceRare(c Claim) (rare, known bool) {
	m, err := a.moments()
	if err != nil || m.Rows == nil {
		return false, false
	}
	col := mat.Col(nil, a.Study.Index[c.To], m.Rows)
	ones := 0.0
	for _, v := range col {
		ones += v
	}
	p := ones / float64(len(col))
	return math.Min(p, 1-p) < rareOutcome, true
}

func eValueFinding(c Claim, ev *EValue) Finding {
	sev := SeverityInfo
	if *ev.CILimit < weakEValue {
		sev = StatusWarn
	}
	how := fmt.Sprintf("an unmeasured confounder associated with both %s and %s by a risk ratio of %.2f each could explain the estimate away, and one of %.2f could move its interval to include no effect",
		c.From, c.To, *ev.Estimate, *ev.CILimit)
	if *ev.CILimit == 1 {
		how = fmt.Sprintf("an unmeasured confounder of strength %.2f could explain the estimate away, and the interval already includes no effect", *ev.Estimate)
	}
	return Finding{Severity: sev, Claim: c.ID, Message: fmt.Sprintf("E-value for %s (%s figures; %s): %s.", c.ID, ev.Source, ev.Conversion, how)}
}
