package checks

import (
	"fmt"
	"math"
	"slices"
	"strings"
)

// nearbyFindings word what the check found: an overview, each claim that
// changes in a close class or the search's best, the search, classes left
// unexamined, and the linear score's approximation for binary variables.
func (a *Analysis) nearbyFindings(run *nearbyRun) []Finding {
	fs := []Finding{overviewFinding(run, knowledgeKinds(a.Study))}
	seen := map[string]bool{}
	for _, c := range run.listed {
		if c.claims != nil {
			seen[c.key] = true
			fs = append(fs, a.classFindings(c)...)
		}
	}
	if run.best != nil && !seen[run.best.key] {
		fs = append(fs, a.classFindings(run.best)...)
	}
	fs = append(fs, a.searchFinding(run))
	if left := run.near - run.examined; left > 0 {
		fs = append(fs, Finding{Severity: StatusWarn, Topic: "unexamined", Message: fmt.Sprintf(unexaminedFormat,
			count(left, "more class fits", "more classes fit"), run.examined)})
	}
	if left := run.better - run.examinedBetter; left > 0 {
		fs = append(fs, Finding{Severity: StatusWarn, Topic: "unexamined-better",
			Message: fmt.Sprintf(unexaminedBetterFormat,
				count(left, "more class fits", "more classes fit"), run.examinedBetter)})
	}
	fs = append(fs, a.unlistedFinding(run)...)
	return append(fs, a.binaryScoreFinding()...)
}

// Long message formats of the nearby-graphs findings.
const (
	unexaminedFormat = "%s within ΔBIC 2 of the declared graph beyond the %d examined; their claims were not " +
		"re-estimated, so this check cannot say that every claim holds in them."
	unexaminedBetterFormat = "%s better than the declared graph by 2 or more beyond the %d that fit best; their " +
		"claims were not re-estimated (only the search's end point among them may be), so this check cannot say " +
		"that every claim holds in them."
	overviewFormat = "%s one edit from the declared graph within the background knowledge; %s%s. " +
		"Each is compared with the declared graph by BIC (χ² + free parameters · ln N), refitting only the equations " +
		"whose parents change."
	searchFormat = "A greedy search from the declared graph (%s that lowers BIC most%s) " +
		"ends at the graphs %s (%s). A search result is a hint, not a discovery: one greedy path through many " +
		"candidate edits also finds chance improvements, so it says where to look, not which graph is true."
	binaryScoreFormat = "%s: binary. The graphs one edit away are compared by a linear BIC, like the chi-square " +
		"test of fit, which treats %s as continuous: where an edit changes a binary variable's equation its ΔBIC " +
		"is approximate, and a headline claim that changes there is warned about, not failed (the claims " +
		"themselves are estimated as in the rest of the screen)."
	noNeighbourFormat = "No graph lies one edit from the declared one within the background knowledge (%s)."
	differsFormat     = "%s is %s under the declared graph, but its sign or significance differs in %d of %s " +
		"(%s; in the one nearest zero it is %s)"
	coveredText = " It already changes among the declared graph's own equivalent graphs, which fit the data " +
		"exactly as well, and is weighed with them rather than here."
	approximateText = " The edit changes the equation of a binary variable, which the linear BIC treats as " +
		"continuous, so this ΔBIC is approximate; the paper neither states nor discusses this graph."
	undiscussedText = " The paper neither states nor discusses this graph, so the data do not decide this claim; " +
		"the choice of graph does."
	notComputedNearFormat = "%s could not be re-estimated in the graphs %s (%s): %s, so whether its conclusion " +
		"holds there is not known."
	noSearchStepText = "A greedy search from the declared graph finds no single edit that lowers BIC: " +
		"the declared graph is a local optimum of BIC."
)

func overviewFinding(run *nearbyRun, kinds string) Finding {
	nb := run.nb
	if nb.DAGs == 0 {
		return Finding{Severity: SeverityInfo, Topic: "overview", Message: fmt.Sprintf(noNeighbourFormat, kinds)}
	}
	own := "none is Markov equivalent to the declared graph"
	switch {
	case nb.Equivalent == nb.DAGs && nb.DAGs == 1:
		own = "it is Markov equivalent to the declared graph (a reversible arrow reversed)"
	case nb.Equivalent > 0:
		own = fmt.Sprintf("%d %s Markov equivalent to the declared graph (a reversible arrow reversed)",
			nb.Equivalent, plural(nb.Equivalent, "is", "are"))
	}
	others := ""
	if n := nb.DAGs - nb.Equivalent; n > 0 && n < nb.DAGs {
		others = fmt.Sprintf("; the %s in %s", plural(n, "other falls", "others fall"), classesText(run))
	} else if n > 0 {
		others = fmt.Sprintf("; they fall in %s", classesText(run))
	}
	return Finding{Severity: SeverityInfo, Topic: "overview", Message: fmt.Sprintf(overviewFormat,
		count(nb.DAGs, "graph lies", "graphs lie"), own, others)}
}

// classesText counts the neighbours' classes and how they fit.
func classesText(run *nearbyRun) string {
	return fmt.Sprintf("%s: %d within ΔBIC 2 of the declared graph, %d fitting better by 2 or more",
		count(len(run.nb.Classes), "equivalence class", "equivalence classes"), run.near, run.better)
}

// plural picks the singular or plural word for a count.
func plural(n int, one, many string) string {
	if n == 1 {
		return one
	}
	return many
}

// classFindings: one finding per claim that changes sign or significance
// somewhere in the class.
func (a *Analysis) classFindings(c *nearClass) []Finding {
	var fs []Finding
	near := math.Abs(c.delta) < weakBIC
	idx := make([]int, 0, len(c.claims))
	for i := range c.claims {
		idx = append(idx, i)
	}
	slices.Sort(idx)
	for _, i := range idx {
		ae, cl := c.claims[i], a.Study.Package.Claims[i]
		if ae.NotComputed != "" {
			fs = append(fs, Finding{Severity: StatusWarn, Claim: cl.ID, Topic: topic("nearby", a.editsSubject(c.edits)),
				ask: "nearby-indirect-unlisted", Message: fmt.Sprintf(notComputedNearFormat,
					cl.ID, a.editsText(c.edits), deltaText(c.delta), ae.NotComputed)})
		}
		if !ae.Unstable {
			continue
		}
		sev := StatusWarn
		switch {
		case a.unstableAmongEquivalents(i): // shared.go, not the equivalence check's output
			sev = SeverityInfo // the equivalence check already weighs it
		case near && cl.Headline && c.alternative == "" && !c.approximate:
			sev = StatusFail
		}
		fs = append(fs, Finding{Severity: sev, Claim: cl.ID, Topic: topic("nearby", a.editsSubject(c.edits)),
			Message: a.changedText(c, i, ae, sev),
			Details: map[string]any{"delta_bic": num(c.delta), "graphs": ae.Estimates,
				"graphs_differing": ae.Differing, "method": ae.Method}})
	}
	return fs
}

// changedText says in one sentence how a claim fares in a nearby class.
func (a *Analysis) changedText(c *nearClass, i int, ae *AcrossEquivalents, sev string) string {
	cl, decl := a.Study.Package.Claims[i], a.declaredEstimate(i)
	other := noEffect(claimScale(cl))
	if ct := ae.Contrast; ct != nil {
		other = contrastText(cl, ct.Estimate)
	}
	edits := a.editsText(c.edits)
	graphs := fmt.Sprintf("the %d plausible graphs %s", ae.Estimates, edits)
	switch {
	case ae.Method == AcrossParentSets:
		graphs = fmt.Sprintf("the %d locally valid parent sets of the graphs %s", ae.Estimates, edits)
	case ae.Estimates == 1:
		graphs = "the one plausible graph " + edits
	}
	var b strings.Builder
	switch {
	case ae.Estimates == 1:
		fmt.Fprintf(&b, "%s is %s under the declared graph but %s in %s (%s)",
			cl.ID, valueText(decl), closeAside(other), graphs, deltaText(c.delta))
	case ae.Differing == 1:
		fmt.Fprintf(&b, "%s is %s under the declared graph but %s in one of %s (%s)",
			cl.ID, valueText(decl), closeAside(other), graphs, deltaText(c.delta))
	default:
		fmt.Fprintf(&b, differsFormat,
			cl.ID, valueText(decl), ae.Differing, graphs, deltaText(c.delta), other)
	}
	if ae.Estimates > 1 {
		fmt.Fprintf(&b, "; across them it ranges from %s to %s and is significant with the declared sign in %s of them",
			boundText(ae.Min, claimScale(cl), ae.zero), boundText(ae.Max, claimScale(cl), ae.zero),
			shareText(ae.ShareSignificantSameSign))
	}
	b.WriteString(".")
	switch {
	case sev == SeverityInfo:
		b.WriteString(coveredText)
	case c.alternative != "":
		fmt.Fprintf(&b, " The authors state this graph as the alternative %q.", c.alternative)
	case c.approximate && cl.Headline && math.Abs(c.delta) < weakBIC && c.alternative == "":
		b.WriteString(approximateText)
	case sev == StatusFail:
		b.WriteString(undiscussedText)
	}
	return b.String()
}

func numText(x *float64) string {
	if x == nil {
		return "n/a"
	}
	return fmt.Sprintf("%.2f", *x)
}

func shareText(x *float64) string {
	if x == nil {
		return "an unknown share"
	}
	return fmt.Sprintf("%.0f%%", 100**x)
}

func (a *Analysis) searchFinding(run *nearbyRun) Finding {
	sr := run.sr
	if sr.Steps == 0 {
		return Finding{Severity: SeverityInfo, Topic: "search", Message: noSearchStepText}
	}
	sev := SeverityInfo
	if sr.DeltaBIC < clearlyBetterBIC {
		sev = StatusWarn
	}
	stopped := ""
	if sr.Stopped {
		stopped = ", stopped at its step limit"
	}
	return Finding{Severity: sev, Topic: "search", Message: fmt.Sprintf(searchFormat,
		count(sr.Steps, "step: the single edit", "steps, each the single edit"), stopped, a.editsText(sr.Edits),
		deltaText(sr.DeltaBIC))}
}

// binaryScoreFinding says where the linear score treats a binary
// variable as continuous.
func (a *Analysis) binaryScoreFinding() []Finding {
	var names []string
	for i, v := range a.Study.Package.Variables {
		if v.Scale == ScaleBinary && a.Study.InGraph[i] {
			names = append(names, v.Name)
		}
	}
	if len(names) == 0 {
		return nil
	}
	return []Finding{{Severity: SeverityInfo, Topic: "binary-approximation", Message: fmt.Sprintf(binaryScoreFormat,
		strings.Join(names, ", "), them(len(names)))}}
}
