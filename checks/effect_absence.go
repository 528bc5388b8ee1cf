package checks

import (
	"fmt"
	"math"

	"github.com/pathvet/pathvet/checks/effects"
)

// AbsenceTest weighs a claim that there is no effect.
type AbsenceTest struct {
	Margin float64 `json:"margin"` // the smallest effect of interest
	// TOSTP is the p-value of the two one-sided tests against ±Margin;
	// Power the power the study had to detect an effect of Margin.
	TOSTP   *float64 `json:"tost_p_value"`
	Power   *float64 `json:"power"`
	Verdict string   `json:"verdict"` // excludes_meaningful_effects, does_not_tell, effect_found
	Source  string   `json:"source"`  // recomputed or reported
	// Distribution is what the significance test, the TOST and the power
	// are taken under: "t(df)" for an OLS estimate, "normal" for Fisher's z
	// or a reported estimate the data cannot re-estimate by OLS.
	Distribution string `json:"distribution"`
}

// absenceFinding weighs a claim of no effect: the recomputed (or
// reported) estimate against the smallest effect of interest by two
// one-sided tests, and the power the study had, all three under the
// claim's one test distribution (testDF).
func (a *Analysis) absenceFinding(i int, c Claim, decl est) []Finding {
	b, se, delta, df, source, ok := a.absenceInputs(c, decl)
	if !ok {
		return []Finding{{Severity: StatusWarn, Claim: c.ID, Message: fmt.Sprintf(
			"%s says there is no effect, but neither the data nor the reported figures give a standardized estimate with its uncertainty to test that against the smallest effect of interest (%g).",
			c.ID, a.Study.SmallestEffect())}}
	}
	t := &AbsenceTest{Margin: a.Study.SmallestEffect(), Source: source, Distribution: distName(df)}
	tp, pw, p := effects.TOST(b, se, delta, df), effects.Power(delta, se, a.Alpha, df), effects.PFromT(b, se, df)
	t.TOSTP, t.Power = finite(tp), finite(pw)
	a.Claims[i].Absence = t
	switch {
	case p < a.Alpha:
		t.Verdict = "effect_found"
		shown := b
		if source == "recomputed" && decl.scale == "correlation" {
			shown = math.Tanh(b)
		}
		return []Finding{{Severity: headlineSeverity(c), Claim: c.ID, Message: fmt.Sprintf(
			"%s says there is no effect, but the %s estimate is %.2f (%s, %s): the data show an effect.",
			c.ID, source, shown, pText(p), t.Distribution)}}
	case tp < a.Alpha:
		t.Verdict = "excludes_meaningful_effects"
		return []Finding{{Severity: SeverityInfo, Claim: c.ID, Message: fmt.Sprintf(
			"%s says there is no effect, and the data exclude effects larger than %g (equivalence test %s, %s).",
			c.ID, t.Margin, pText(tp), t.Distribution)}}
	}
	t.Verdict = "does_not_tell"
	return []Finding{{Severity: headlineSeverity(c), Claim: c.ID, Message: fmt.Sprintf(
		"%s says there is no effect, but its interval includes effects of %g and more (equivalence test %s, %s; the study had %.0f%% power to detect an effect of that size): the data do not tell.",
		c.ID, t.Margin, pText(tp), t.Distribution, 100*pw)}}
}

// absenceInputs is the estimate, SE, margin and test df an absence claim
// is weighed with: the recomputed standardized estimate (a correlation on
// Fisher's z scale, normal), else the reported standardized one.
func (a *Analysis) absenceInputs(c Claim, decl est) (b, se, delta, df float64, source string, ok bool) {
	delta, df = a.Study.SmallestEffect(), testDF(c, decl)
	switch {
	case decl.ok() && decl.method != MethodZero && (decl.scale == "standardized" || decl.scale == "correlation") && !math.IsNaN(decl.lo):
		b, se = decl.value, decl.se
		if decl.scale == "correlation" {
			return math.Atanh(b), 1 / math.Sqrt(float64(decl.n-len(decl.adjusted)-3)), math.Atanh(delta), effects.Normal, "recomputed", true
		}
		if math.IsNaN(se) {
			se = effects.SEFromTCI(decl.lo, decl.hi, claimLevel(c), df)
		}
		return b, se, delta, df, "recomputed", true
	case c.Estimate != nil && c.StdError != nil && claimScale(c) == "standardized":
		return *c.Estimate, *c.StdError, delta, df, "reported", true
	}
	return 0, 0, 0, 0, "", false
}
