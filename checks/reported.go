package checks

import (
	"encoding/json"
	"fmt"
	"math"
	"strconv"
)

// A claim's reported estimate beside the data (effect-reporting): outside
// the recomputed interval, or of the other direction on any scale. Where
// the data hold likely missing codes (Dataset.Suspects with Code), every
// such comparison is made both ways, with the codes counted as real
// values (as the data are read) and read as missing, and the sentence says
// which reading the reported figure matches.

// How a reported estimate stands beside one recomputed estimate.
type standing int

const (
	// standsInside: same scale, inside the recomputed interval.
	standsInside standing = iota
	// standsUncontradicted: another scale, and no significant estimate of
	// the other direction.
	standsUncontradicted
	// standsOutside: same scale, outside the recomputed interval.
	standsOutside
	// standsOpposite: the recomputed estimate is significant with the
	// other sign than a reported estimate that shows a direction.
	standsOpposite
)

func (s standing) bad() bool { return s >= standsOutside }

// Sentences of the comparisons (reportedFinding).
const (
	reportedOutsideFormat  = "%s reports %s, but %s give %s with %s."
	reportedOppositeFormat = "%s reports %s, a %s estimate, but %s give a %s one, %s, with %s: the data " +
		"contradict the reported direction."
	codesMatchMissingFormat = "%s reports %s, which the data %s with %s read as missing: %s. With %s " +
		"counted as real values, the data give another figure: %s. Declare %s in /data/missing_codes, so that " +
		"every estimate reads %s as missing."
	codesMatchValuesFormat = "%s reports %s, which the data %s with %s counted as real values: %s. With %s " +
		"read as missing, the data give another figure: %s. If %s, the reported figure appears to count %s as " +
		"%s."
	codesMatchNeitherFormat = "%s reports %s, but the data give %s with %s counted as real values, and %s with " +
		"%s read as missing (both with %s)."
)

// reportedFinding compares claim i's reported estimate with its
// recomputed estimate decl, and, where the data hold likely missing codes,
// with its estimate on the data with those codes read as missing (only
// the first where that estimate cannot be made).
func (a *Analysis) reportedFinding(i int, c Claim, decl est) []Finding {
	if c.Estimate == nil {
		return nil
	}
	asRead := a.standing(c, decl)
	codes := a.likelyCodes()
	var rec est
	if len(codes) > 0 {
		rec = a.recodedEstimate(i)
	}
	if !decl.ok() || decl.method == MethodZero || !rec.ok() || rec.method == MethodZero || len(codes) == 0 {
		if !asRead.bad() {
			return nil
		}
		return []Finding{a.singleFinding(i, c, decl, asRead)}
	}
	if f := a.codesFinding(i, c, decl, rec, codes); f != nil {
		return []Finding{*f}
	}
	return nil
}

// codesFinding holds claim i's reported estimate to both readings of the
// likely codes, decl as the data are read and rec with the codes read as
// missing, and says which reading it matches; nil where it matches both.
func (a *Analysis) codesFinding(i int, c Claim, decl, rec est, codes []Suspect) *Finding {
	asRead, recoded := a.standing(c, decl), a.standing(c, rec)
	fa, fr := directed(recomputedFigure(c, decl), asRead), directed(recomputedFigure(c, rec), recoded)
	f := &Finding{Severity: StatusWarn, Claim: c.ID, Topic: "reported-figure"}
	switch ph := codesPhrases(codes); {
	case !asRead.bad() && !recoded.bad():
		return nil
	case !recoded.bad():
		f.Severity, f.Message = SeverityInfo, fmt.Sprintf(codesMatchMissingFormat, c.ID, a.reportedFigure(i, c),
			matchVerb(recoded), ph.codes, fr, ph.theCodes, fa, ph.declare, ph.pronoun)
	case !asRead.bad():
		f.ask = "reported-figure-codes"
		f.Message = fmt.Sprintf(codesMatchValuesFormat, c.ID, a.reportedFigure(i, c), matchVerb(asRead), ph.codes,
			fa, ph.theCodes, fr, ph.ifCodes, ph.pronoun, ph.measured)
	default:
		if asRead == standsOpposite || recoded == standsOpposite {
			f.Severity = headlineSeverity(c)
		}
		f.Message = fmt.Sprintf(codesMatchNeitherFormat, c.ID, a.reportedFigure(i, c), fa, ph.codes, fr,
			ph.theCodes, a.adjustmentName(c))
	}
	return f
}

// singleFinding is the finding of a reported estimate outside the
// recomputed interval, or of the other direction, where the data hold no
// likely code.
func (a *Analysis) singleFinding(i int, c Claim, e est, s standing) Finding {
	if s == standsOpposite {
		return Finding{Severity: headlineSeverity(c), Claim: c.ID, Topic: "reported-figure",
			Message: fmt.Sprintf(reportedOppositeFormat,
				c.ID, a.reportedFigure(i, c), direction(reportedAdditive(c)), a.dataBasis("the data"),
				direction(e.additive), recomputedFigure(c, e), a.adjustmentName(c))}
	}
	return Finding{Severity: StatusWarn, Claim: c.ID, Topic: "reported-figure",
		Message: fmt.Sprintf(reportedOutsideFormat, c.ID,
			a.reportedFigure(i, c), a.dataBasis("the data"), recomputedFigure(c, e), a.adjustmentName(c))}
}

// standing says how claim c's reported estimate stands beside e; a
// comparison that cannot be made (no estimate, zero by the graph, no
// interval on another scale) contradicts nothing.
func (a *Analysis) standing(c Claim, e est) standing {
	if !e.ok() || e.method == MethodZero {
		return standsUncontradicted
	}
	if r := reportedAdditive(c); a.reportedDirection(c) && e.category(a.Alpha) != 0 && r*e.additive < 0 {
		return standsOpposite
	}
	if e.scale != claimScale(c) || math.IsNaN(e.lo) || math.IsNaN(e.hi) {
		return standsUncontradicted
	}
	if *c.Estimate < e.lo || *c.Estimate > e.hi {
		return standsOutside
	}
	return standsInside
}

// reportedAdditive is the reported estimate on a scale where 0 is no
// effect (the log of an odds ratio); NaN where there is none.
func reportedAdditive(c Claim) float64 {
	if c.Estimate == nil {
		return math.NaN()
	}
	if claimScale(c) == "odds_ratio" {
		if *c.Estimate <= 0 {
			return math.NaN()
		}
		return math.Log(*c.Estimate)
	}
	return *c.Estimate
}

// reportedDirection says whether the reported figures show a direction:
// a nonzero estimate whose interval excludes no effect or whose reported
// p-value is below alpha, in a claim that does not assert no effect.
func (a *Analysis) reportedDirection(c Claim) bool {
	r := reportedAdditive(c)
	if c.AssertsAbsence || math.IsNaN(r) || r == 0 {
		return false
	}
	if len(c.CI) == 2 {
		null := zeroOnScale(claimScale(c))
		return c.CI[0] > null || c.CI[1] < null
	}
	return c.PValue != nil && *c.PValue < a.Alpha && c.PRelation != ">"
}

func direction(x float64) string {
	if x < 0 {
		return "negative"
	}
	return "positive"
}

func matchVerb(s standing) string {
	if s == standsInside {
		return "give"
	}
	return "do not contradict"
}

// reportedFigure writes claim i's reported estimate as the package prints
// it, with its interval where given, else its p-value: "0.39 (95% interval
// 0.21 to 0.57)", "an odds ratio of 0.80 (p < 0.001)".
func (a *Analysis) reportedFigure(i int, c Claim) string {
	var pr Printed
	if i < len(a.Study.Printed) {
		pr = a.Study.Printed[i]
	}
	s := printedOr(pr.Estimate, *c.Estimate)
	if claimScale(c) == "odds_ratio" {
		s = "an odds ratio of " + s
	}
	switch {
	case len(c.CI) == 2 && len(pr.CI) == 2:
		s += fmt.Sprintf(" (%g%% interval %s to %s)", 100*claimLevel(c), pr.CI[0], pr.CI[1])
	case len(c.CI) == 2:
		s += fmt.Sprintf(" (%g%% interval %g to %g)", 100*claimLevel(c), c.CI[0], c.CI[1])
	case c.PValue != nil:
		s += " (" + reportedP(c) + ")"
	}
	return s
}

// printedOr is a number as printed, or x where it was not.
func printedOr(n json.Number, x float64) string {
	if n != "" {
		return string(n)
	}
	return strconv.FormatFloat(x, 'g', -1, 64)
}

// recomputedFigure writes a recomputed estimate with its p-value and
// interval, naming its scale where it is not the claim's.
func recomputedFigure(c Claim, e est) string {
	if !e.ok() || e.method == MethodZero {
		return "no estimate"
	}
	out := fmt.Sprintf("%s (%s, %g%% interval %s to %s)", figure(e.value), pText(e.p), 100*claimLevel(c),
		figure(e.lo), figure(e.hi))
	if e.isIndirect() {
		out = fmt.Sprintf("%s (%g%% %s interval %s to %s)", figure(e.value), 100*claimLevel(c),
			intervalName(e.intervals[len(e.intervals)-1].method), figure(e.lo), figure(e.hi))
	}
	if e.scale != claimScale(c) {
		out = scaleNoun(e.scale) + " " + out
	}
	return out
}

// directed adds to a recomputed figure that it is of the other direction
// than the reported one, where it is.
func directed(figure string, s standing) string {
	if s == standsOpposite {
		return figure + ", the other direction"
	}
	return figure
}

// scaleNoun names an estimate's scale before its value.
func scaleNoun(scale string) string {
	switch scale {
	case "odds_ratio":
		return "an odds ratio of"
	case "log_odds":
		return "a log-odds coefficient of"
	case "correlation":
		return "a partial correlation of"
	case "unstandardized":
		return "an unstandardized coefficient of"
	}
	return "a standardized coefficient of"
}

// adjustmentName says which adjustment set a recomputed estimate used.
func (a *Analysis) adjustmentName(c Claim) string {
	if a.Study.Declared == nil || !a.claimInGraph(c) || c.Kind == KindAssociation {
		return "the claim's own adjustment set"
	}
	return "the declared graph's adjustment set"
}
