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
	m, _ := a.moments()
	in, ok := a.absenceInputs(c, decl, m)
	if !ok {
		return []Finding{{Severity: StatusWarn, Claim: c.ID, Topic: "absence", ask: "absence-untested",
			Message: a.noAbsenceTest(c, decl)}}
	}
	t := &AbsenceTest{Margin: a.Study.SmallestEffect(), Source: in.source, Distribution: distName(in.df)}
	tp, pw := effects.TOST(in.b, in.se, in.delta, in.df), effects.Power(in.delta, in.se, a.Alpha, in.df)
	p := effects.PFromT(in.b, in.se, in.df)
	t.TOSTP, t.Power = finite(tp), finite(pw)
	t.Verdict = a.absenceVerdict(p, tp)
	a.Claims[i].Absence = t
	var f Finding
	switch t.Verdict {
	case "effect_found":
		f = Finding{Severity: headlineSeverity(c), Claim: c.ID, Topic: "absence", ask: "absence-contradicted",
			Message: fmt.Sprintf("%s says there is no effect, but the %s is %.2f (%s, %s), significant at α = %g: the data do not "+
				"support \"no effect\".",
				c.ID, a.sourceText(in.source), in.shown, pText(p), t.Distribution, a.Alpha)}
	case "excludes_meaningful_effects":
		f = Finding{Severity: SeverityInfo, Claim: c.ID, Topic: "absence", Message: fmt.Sprintf(
			"%s says there is no effect, and the data exclude effects of ±%g or larger at α = %g (equivalence test "+
				"%s, "+
				"%s%s).", c.ID, t.Margin, a.Alpha, pText(tp), t.Distribution, a.marginSource(t.Margin))}
	default:
		f = Finding{Severity: headlineSeverity(c), Claim: c.ID, Topic: "absence", ask: "absence-undecided",
			Message: fmt.Sprintf("%s says there is no effect, but its %g%% interval reaches effects of ±%g or beyond (equivalence test %s, "+
				"%s; the study had %.0f%% power to detect an effect of that size%s): the data do not tell.",
				c.ID, 100*(1-2*a.Alpha), t.Margin, pText(tp), t.Distribution, 100*pw, a.marginSource(t.Margin))}
	}
	if in.source == "recomputed" {
		f.Message += a.absenceRecoded(i, c, t.Verdict)
	}
	return []Finding{f}
}

// absenceVerdict is the verdict on a claim of no effect from the
// significance test's p and the equivalence test's tp.
func (a *Analysis) absenceVerdict(p, tp float64) string {
	switch {
	case p < a.Alpha:
		return "effect_found"
	case tp < a.Alpha:
		return "excludes_meaningful_effects"
	}
	return "does_not_tell"
}

// absenceVerdictText words a verdict for absenceRecoded.
var absenceVerdictText = map[string]string{
	"effect_found":                "a significant effect, against \"no effect\"",
	"excludes_meaningful_effects": "which excludes effects of the margin's size",
	"does_not_tell":               "which does not tell",
}

// absenceRecoded is, where the data hold likely missing codes, the
// verdict on claim i's "no effect" with the codes read as missing, when it
// differs from verdict (the data as read); "" otherwise.
func (a *Analysis) absenceRecoded(i int, c Claim, verdict string) string {
	codes := a.likelyCodes()
	if len(codes) == 0 {
		return ""
	}
	rec := a.recodedEstimate(i)
	m, err := a.recodedMoments()
	if err != nil {
		return ""
	}
	in, ok := a.absenceInputs(c, rec, m)
	if !ok || in.source != "recomputed" {
		return ""
	}
	v := a.absenceVerdict(effects.PFromT(in.b, in.se, in.df), effects.TOST(in.b, in.se, in.delta, in.df))
	if v == verdict {
		return ""
	}
	return fmt.Sprintf(" With %s read as missing, the data give %.2f (%s) instead, %s.",
		codesPhrases(codes).codes, in.shown, pText(effects.PFromT(in.b, in.se, in.df)), absenceVerdictText[v])
}

// sourceText names the weighed estimate and where it comes from.
func (a *Analysis) sourceText(source string) string {
	if b := a.dataBasis(""); source == "recomputed" && b != "" {
		return "estimate recomputed from " + b
	}
	return source + " estimate"
}

// marginSource says where the equivalence margin comes from: the package's
// smallest effect of interest, or the default the author can replace.
func (a *Analysis) marginSource(margin float64) string {
	if a.Study.Package.SmallestEffectOfInterest != nil {
		return fmt.Sprintf("; ±%g is the package's smallest effect of interest", margin)
	}
	return fmt.Sprintf("; ±%g, standardized, is the default smallest effect of interest, as the package sets "+
		"no smallest_effect_of_interest", margin)
}

// absenceInput is what an absence claim is weighed with: the estimate
// and SE on the scale of the margin, the margin, the test df, and the
// estimate as the sentence shows it.
type absenceInput struct {
	b, se, delta, df, shown float64
	source                  string
}

// absenceInputs gives the recomputed standardized estimate (a correlation
// on Fisher's z scale, under the normal; an unstandardized one rescaled by
// the SDs), else the reported one, standardized or rescaled likewise.
func (a *Analysis) absenceInputs(c Claim, decl est, m *Moments) (absenceInput, bool) {
	in := absenceInput{delta: a.Study.SmallestEffect(), df: testDF(c, decl), source: "recomputed"}
	k, scaled := a.sdRatio(c, m)
	switch {
	case !decl.ok() || decl.method == MethodZero || math.IsNaN(decl.lo):
	case decl.scale == "correlation":
		in.b, in.shown = math.Atanh(decl.value), decl.value
		in.se, in.delta, in.df = 1/math.Sqrt(float64(decl.n-len(decl.adjusted)-3)), math.Atanh(in.delta), effects.Normal
		return in, true
	case decl.scale == "standardized" || (decl.scale == "unstandardized" && scaled):
		if decl.scale == "standardized" {
			k = 1
		}
		in.b, in.se = decl.value*k, decl.se*k
		if math.IsNaN(in.se) {
			in.se = effects.SEFromTCI(decl.lo, decl.hi, claimLevel(c), in.df) * k
		}
		in.shown = in.b
		return in, true
	}
	if c.Estimate == nil || c.StdError == nil {
		return in, false
	}
	switch claimScale(c) {
	case "unstandardized":
		if !scaled {
			return in, false
		}
	case "standardized":
		k = 1
	default:
		return in, false
	}
	in.b, in.se, in.shown, in.source = *c.Estimate*k, *c.StdError*k, *c.Estimate*k, "reported"
	return in, true
}

// sdRatio is SD(from)/SD(to) in the moments m, which turns an
// unstandardized coefficient into a standardized one; ok is false without
// SDs.
func (a *Analysis) sdRatio(c Claim, m *Moments) (k float64, ok bool) {
	if m == nil || m.SD == nil {
		return math.NaN(), false
	}
	from, to := a.Study.Index[c.From], a.Study.Index[c.To]
	k = m.SD[from] / m.SD[to]
	return k, k > 0 && !math.IsInf(k, 0) && !math.IsNaN(k)
}

// noAbsenceTest says why a claim of no effect could not be tested.
func (a *Analysis) noAbsenceTest(c Claim, decl est) string {
	delta := a.Study.SmallestEffect()
	m, _ := a.moments()
	_, scaled := a.sdRatio(c, m)
	switch scale := claimScale(c); {
	case scale == "odds_ratio" || scale == "log_odds":
		return fmt.Sprintf("%s says there is no effect, but an odds ratio cannot be set against the smallest effect "+
			"of interest (%g, a standardized coefficient); report the interval, so that readers can see which odds "+
			"ratios it excludes.", c.ID, delta)
	case decl.ok() && decl.method == MethodZero:
		return fmt.Sprintf("%s says there is no effect, and the declared graph makes it zero, so there is no "+
			"re-estimate to test against the smallest effect of interest (%g); the graph-fit check tests the graph's "+
			"implications.", c.ID, delta)
	case scale == "unstandardized" && !scaled && c.StdError != nil:
		return fmt.Sprintf("%s says there is no effect, but without the SDs of %s and %s its unstandardized "+
			"estimate cannot be set against the smallest effect of interest (%g, standardized); report the SDs or a "+
			"standardized estimate with its SE.", c.ID, c.From, c.To, delta)
	case !decl.ok():
		return fmt.Sprintf("%s says there is no effect, but the data give no estimate (%v) and the claim reports no "+
			"standardized estimate with its SE, so nothing can be tested against the smallest effect of interest "+
			"(%g).", c.ID, decl.err, delta)
	}
	return fmt.Sprintf("%s says there is no effect, but neither the data nor the reported figures give a "+
		"standardized estimate with its SE to test against the smallest effect of interest (%g).", c.ID, delta)
}
