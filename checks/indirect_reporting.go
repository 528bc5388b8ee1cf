package checks

import (
	"fmt"
	"math"

	"github.com/pathvet/pathvet/checks/mediation"
)

// effect-reporting for indirect effects: a normal-theory p-value or a
// symmetric interval reported for one (Preacher & Hayes 2008), the
// proportion mediated, and a claim of no indirect effect weighed by its
// intervals.

// ProportionMediated is an indirect effect as a share of the total effect
// of its from on its to, given only where the total effect is significant
// with the indirect effect's sign.
type ProportionMediated struct {
	Proportion  *float64  `json:"proportion"`
	TotalEffect *Estimate `json:"total_effect"`
	Note        string    `json:"note"`
}

// Sentences of effect-reporting about indirect effects.
const (
	skewFormat = "%s reports %s. A test or interval that takes the product of coefficients as normally " +
		"distributed is inaccurate for an indirect effect, whose sampling distribution is skewed, most often with " +
		"too little power (Preacher & Hayes 2008; MacKinnon, Lockwood & Williams 2004). A percentile bootstrap or " +
		"Monte Carlo interval follows the skew; %s."
	skewPFormat = "a p-value (%s) for an indirect effect, which comes from Sobel's test or another normal-theory " +
		"test"
	skewCIFormat = "an interval symmetric about its estimate to the rounding of its figures (%g to %g around " +
		"%g), as a normal-theory interval (the estimate ± a multiple of its SE) is, though a percentile interval " +
		"can be as nearly symmetric at these digits"
	proportionFormat = "%s: the indirect effect is %.0f%% of the total effect of %s on %s (%s of %s; the total " +
		"effect is the coefficient of %s when %s is regressed on %s, %s). " + proportionCaution
	proportionCaution = "A proportion mediated is a ratio of two estimates and is unstable: it moves far when the " +
		"total effect is small or uncertain, it passes 100%% or falls below 0 where the direct effect has the " +
		"other sign, and no interval is given for it here."
	noProportionFormat = "No proportion mediated is given for %s: the total effect of %s on %s is %s, %s, so a " +
		"share of it would mean little."
	proportionNote = "indirect / total; the total effect is the coefficient of from when to is regressed on from " +
		"and from's parents in the declared graph; unstable, and without an interval"
	absenceIndirectFound = "%s says there is no indirect effect, but its %s excludes zero: the data do not support " +
		"\"no effect\"."
	absenceIndirectExcludes = "%s says there is no indirect effect, and its %g%% %s interval (%s to %s) lies " +
		"within ±%g, so the data exclude indirect effects of that size at α = %g (the interval form of two " +
		"one-sided tests%s)."
	absenceIndirectUnclear = "%s says there is no indirect effect, but its %g%% %s interval (%s to %s) reaches " +
		"effects of ±%g or beyond%s: the data do not tell."
)

// indirectReporting is effect-reporting's word on an indirect claim
// beyond what every claim gets.
func (a *Analysis) indirectReporting(i int, c Claim, pr printed, decl est) []Finding {
	var fs []Finding
	if f := skewFinding(c, pr, decl); f != nil {
		fs = append(fs, *f)
	}
	if c.AssertsAbsence {
		return append(fs, a.indirectAbsence(i, c, decl))
	}
	return append(fs, a.proportionFinding(i, c, decl)...)
}

// skewFinding is the note for a p-value or a symmetric interval reported
// for an indirect effect; nil when neither is.
func skewFinding(c Claim, pr printed, decl est) *Finding {
	what, sev := "", StatusWarn
	switch {
	case c.PValue != nil:
		what = fmt.Sprintf(skewPFormat, reportedP(c))
	case symmetricCI(c, pr):
		// a percentile interval may be as symmetric at the printed digits
		what, sev = fmt.Sprintf(skewCIFormat, c.CI[0], c.CI[1], *c.Estimate), SeverityInfo
	default:
		return nil
	}
	re := "the screen could not recompute one from the data"
	if decl.ok() && decl.method != MethodZero {
		re = "from the data, the screen gets a " + decl.judgedText()
	}
	return &Finding{Severity: sev, Claim: c.ID, Topic: "normal-theory-indirect", Message: fmt.Sprintf(skewFormat,
		c.ID, what, re), Details: map[string]any{skewKey: true}}
}

// skewKey marks the findings about normal-theory tests of indirect
// effects in their details.
const skewKey = "normal_theory_indirect"

// skewOnly lists the claims of the skew warnings when they are the only
// warnings or failures among fs; nil otherwise.
func skewOnly(fs []Finding) []string {
	var ids []string
	for _, f := range fs {
		switch {
		case f.Severity != StatusWarn && f.Severity != StatusFail:
		case f.Details[skewKey] == true:
			ids = append(ids, f.Claim)
		default:
			return nil
		}
	}
	return ids
}

// skewSummary is effect-reporting's summary when its only warnings are
// p-values reported for indirect effects.
func skewSummary(ids []string) string {
	return fmt.Sprintf("%s reported with a normal-theory p-value, which misjudges a product of coefficients "+
		"(Preacher & Hayes 2008); otherwise the reported figures raise no question. See the findings.",
		plural(len(ids), "The indirect effect "+ids[0]+" is", "The indirect effects "+joinAnd(ids)+" are"))
}

// symmetricCI reports whether a reported interval is symmetric about the
// reported estimate within the rounding of the printed figures.
func symmetricCI(c Claim, pr printed) bool {
	if c.Estimate == nil || len(c.CI) != 2 || c.CI[1] <= c.CI[0] {
		return false
	}
	// up − down = hi − 2·estimate + lo, so rounding moves it by at most the
	// half units of hi and lo and twice that of the estimate
	slack := 2 * halfUnit(pr.Estimate)
	if len(pr.CI) == 2 {
		slack += halfUnit(pr.CI[0]) + halfUnit(pr.CI[1])
	}
	up, down := c.CI[1]-*c.Estimate, *c.Estimate-c.CI[0]
	return math.Abs(up-down) <= slack+1e-12*math.Abs(c.CI[1]-c.CI[0])
}

// proportionFinding gives the proportion mediated where the total effect
// is significant with the indirect effect's sign, and says why not
// otherwise.
func (a *Analysis) proportionFinding(i int, c Claim, decl est) []Finding {
	if !decl.ok() || decl.method == MethodZero {
		return nil
	}
	tc := Claim{ID: c.ID, Kind: KindTotal, From: c.From, To: c.To, EstimateScale: decl.scale, CILevel: c.CILevel}
	tot := a.estimateClaim(tc, a.declaredParentsFor(c))
	switch {
	case !tot.ok():
		return []Finding{{Severity: SeverityInfo, Claim: c.ID, Topic: "proportion-mediated",
			Message: fmt.Sprintf(noProportionFormat, c.ID, c.From, c.To, "not known", "as it could not be estimated ("+tot.err.Error()+")")}}
	case tot.method == MethodZero || tot.category(a.Alpha) == 0:
		return []Finding{{Severity: SeverityInfo, Claim: c.ID, Topic: "proportion-mediated",
			Message: fmt.Sprintf(noProportionFormat, c.ID, c.From, c.To, "not significant", valueText(tot))}}
	case tot.scale != decl.scale || math.Signbit(tot.additive) != math.Signbit(decl.additive):
		return []Finding{{Severity: SeverityInfo, Claim: c.ID, Topic: "proportion-mediated",
			Message: fmt.Sprintf(noProportionFormat, c.ID, c.From, c.To,
				"significant with the other sign than the indirect effect", valueText(tot))}}
	}
	share := decl.value / tot.value
	a.Claims[i].ProportionMediated = &ProportionMediated{Proportion: finite(share), TotalEffect: a.report(tot),
		Note: proportionNote}
	on := c.From + " alone"
	if len(tot.adjusted) > 0 {
		on = joinAnd(append([]string{c.From}, a.names(tot.adjusted)...))
	}
	return []Finding{{Severity: SeverityInfo, Claim: c.ID, Topic: "proportion-mediated", Message: fmt.Sprintf(
		proportionFormat, c.ID,
		100*share, c.From, c.To, estText(decl.value), estText(tot.value), c.From, c.To, on, valueText(tot))}}
}

// indirectAbsence weighs a claim of no indirect effect by its intervals:
// an effect where the interval that judges it excludes zero; effects of
// the smallest size of interest excluded where its 1 − 2α interval lies
// within ±margin (standardized; the interval form of two one-sided tests,
// Schuirmann 1987); else the data do not tell.
func (a *Analysis) indirectAbsence(i int, c Claim, decl est) Finding {
	m, _ := a.moments()
	k, scaled := a.sdRatio(c, m)
	if decl.scale == "standardized" {
		k, scaled = 1, true
	}
	if !decl.ok() || decl.method == MethodZero || decl.judge == nil || !scaled || len(decl.draws) < 2 {
		return Finding{Severity: StatusWarn, Claim: c.ID, Topic: "absence", ask: "absence-untested",
			Message: a.noAbsenceTest(c, decl)}
	}
	margin, method := a.Study.SmallestEffect(), decl.judge.method
	t := &AbsenceTest{Margin: margin, Source: "recomputed", Distribution: method}
	lo, hi := k*mediation.Percentile(decl.draws, a.Alpha), k*mediation.Percentile(decl.draws, 1-a.Alpha)
	level := 100 * (1 - 2*a.Alpha)
	name := intervalName(method)
	if decl.scale != "standardized" {
		name += " (standardized)"
	}
	var f Finding
	switch {
	case decl.category(a.Alpha) != 0:
		t.Verdict = "effect_found"
		f = Finding{Severity: headlineSeverity(c), Claim: c.ID, Topic: "absence", ask: "absence-contradicted",
			Message: fmt.Sprintf(absenceIndirectFound, c.ID, decl.judgedText())}
	case lo > -margin && hi < margin:
		t.Verdict = "excludes_meaningful_effects"
		f = Finding{Severity: SeverityInfo, Claim: c.ID, Topic: "absence", Message: fmt.Sprintf(absenceIndirectExcludes,
			c.ID,
			level, name, estText(lo), estText(hi), margin, a.Alpha, a.marginSource(margin))}
	default:
		t.Verdict = "does_not_tell"
		f = Finding{Severity: headlineSeverity(c), Claim: c.ID, Topic: "absence", ask: "absence-undecided",
			Message: fmt.Sprintf(absenceIndirectUnclear, c.ID,
				level, name, estText(lo), estText(hi), margin, a.marginSource(margin))}
	}
	a.Claims[i].Absence = t
	return f
}
