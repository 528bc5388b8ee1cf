package checks

import (
	"fmt"
	"math"
	"math/big"
	"strings"
)

// The sentences of the equivalence check, each true in every branch: the
// class counted with and without the declared graph, claimed arrows that
// can point the other way, claims that could not be estimated.

// unstableText says in one sentence how a claim depends on the choice
// among equivalent graphs.
func (a *Analysis) unstableText(c Claim, decl est, across *AcrossEquivalents) string {
	ct := across.Contrast
	other := closeAside(contrastText(c, ct.Estimate))
	where := ""
	switch {
	case len(ct.ReversedArrows) > 0:
		parts := make([]string, 0, 3)
		for _, r := range ct.ReversedArrows[:min(3, len(ct.ReversedArrows))] {
			parts = append(parts, r[0]+" → "+r[1])
		}
		where = ", for instance if " + strings.Join(parts, " and ")
	case ct.ParentSet != nil:
		node := c.To
		if c.Kind == KindTotal {
			node = c.From
		}
		where = fmt.Sprintf(", for instance if the parents of %s are {%s}", node, strings.Join(ct.ParentSet, ", "))
	}
	scope := fmt.Sprintf("in %d of the %d plausible members of the declared graph's class",
		across.Differing, across.Estimates)
	if across.Method == AcrossParentSets {
		scope = fmt.Sprintf("under %d of the %d locally valid parent sets (the class is too large to list)",
			across.Differing, across.Estimates)
	}
	return fmt.Sprintf("%s is %s under the declared graph but %s %s%s; the data fit those graphs exactly as well, so "+
		"the data do not decide this claim, the choice of graph does.",
		c.ID, valueText(decl), other, scope, where)
}

// contrastText writes the estimate of a claim in the graph that differs
// most: its value with its p-value, or with the interval that judges an
// indirect effect; or no effect, saying for an indirect effect that the
// graph has no directed path through its mediators (a parenthetical
// phrase: inside a sentence it needs the comma of closeAside after it).
func contrastText(c Claim, e *Estimate) string {
	switch {
	case e.Method == MethodZero && c.Kind == KindIndirect:
		return "zero, with " + strings.TrimSuffix(e.StructuralZero, " in this graph")
	case e.Method == MethodZero || e.Estimate == nil:
		return noEffect(claimScale(c))
	case e.Significance != nil && len(e.Significance.CI) == 2:
		return fmt.Sprintf("%s (%g%% %s interval %s to %s)", estText(*e.Estimate), 100*e.Significance.Level,
			intervalName(e.Significance.Method), estText(e.Significance.CI[0]), estText(e.Significance.CI[1]))
	}
	p := math.NaN()
	if e.PValue != nil {
		p = *e.PValue
	}
	return fmt.Sprintf("%s (%s)", estText(*e.Estimate), pText(p))
}

// closeAside ends with a comma a contrast that opens an aside ("zero,
// with no directed path ..."), where more of the sentence follows.
func closeAside(s string) string {
	if strings.HasPrefix(s, "zero, with ") {
		return s + ","
	}
	return s
}

// verb picks the singular or plural form for a count.
func verb(n *big.Int, one, many string) string {
	if n != nil && n.Cmp(big.NewInt(1)) == 0 {
		return one
	}
	return many
}

func countText(n *big.Int) string {
	if n == nil {
		return "(uncounted)"
	}
	return n.String()
}

func discussionFinding(s *Study, eq *equivalenceResult) []Finding {
	if eq.size.Cmp(big.NewInt(1)) <= 0 {
		return nil
	}
	if s.Package.Graph.EquivalentsDiscussed {
		return []Finding{{Severity: SeverityInfo, Topic: "discussion", Message: fmt.Sprintf(
			"The authors say they discussed the graphs equivalent to theirs (the class has %s members, the declared "+
				"graph among them).", eq.size)}}
	}
	if onlyDeclared(eq) { // nothing plausible to discuss: a warning would ask for nothing
		return []Finding{{Severity: SeverityInfo, Topic: "discussion",
			Message: fmt.Sprintf(ruledOutFormat, otherGraphs(eq.size), knowledgeKinds(s))}}
	}
	return []Finding{{Severity: StatusWarn, Topic: "discussion", Message: fmt.Sprintf(
		"%s fit any data exactly as well as the declared one (%s), and the authors do not discuss them.",
		otherGraphs(eq.size), plausibleOthers(eq.plausible))}}
}

// ruledOutFormat: the class has other members, but the background
// knowledge rules every one out, so the directions rest on that knowledge.
const ruledOutFormat = "%s fit any data exactly as well as the declared one, and the authors do not discuss them; " +
	"the stated background knowledge (%s) rules them all out, so the arrows it orients rest on that knowledge, " +
	"not on the data."

// knowledgeKinds names the kinds of background knowledge a package can
// state, the time order of tiers among them where it has one.
func knowledgeKinds(s *Study) string {
	if s.Tiers != nil {
		return "exogenous variables, fixed arrows, the time order of tiers"
	}
	return "exogenous variables, fixed arrows"
}

// otherGraphs counts the members of a class besides the declared graph.
func otherGraphs(size *big.Int) string {
	n := new(big.Int).Sub(size, big.NewInt(1))
	return n.String() + verb(n, " other graph", " other graphs")
}

// plausibleOthers says how many of the other members respect the
// background knowledge.
func plausibleOthers(plausible *big.Int) string {
	if plausible == nil {
		return "how many of them respect the stated background knowledge could not be counted"
	}
	n := new(big.Int).Sub(plausible, big.NewInt(1))
	return fmt.Sprintf("%s of them %s the stated background knowledge", n, verb(n, "respects", "respect"))
}

// equivalenceTally is what the summary of the check rests on.
type equivalenceTally struct {
	unstable, reversible, claimWarnings int
}

func equivalenceSummary(s *Study, eq *equivalenceResult, status string, t equivalenceTally) string {
	switch {
	case status == StatusFail && t.unstable > 0:
		return fmt.Sprintf("A headline claim changes sign or significance among the %s plausible members of the "+
			"declared graph's class, which fit the data exactly as well, and the paper does not discuss them; ask "+
			"the authors to justify the arrows it rests on or to report it under every equivalent "+
			"graph.", countText(eq.plausible))
	case status == StatusFail:
		return fmt.Sprintf("A headline claim rests on an arrow the data cannot orient, in a class of %s plausible "+
			"members the paper does not discuss; ask the authors to justify its direction or report the claim under "+
			"every equivalent graph.", countText(eq.plausible))
	case t.unstable > 0:
		return fmt.Sprintf("%s %s sign or significance among the equivalent graphs; the paper should justify the "+
			"arrows they rest on or show them under every equivalent graph.",
			count(t.unstable, "claim", "claims"), map[bool]string{true: "changes", false: "change"}[t.unstable == 1])
	case eq.size.Cmp(big.NewInt(1)) == 0:
		return "The declared graph is the only member of its equivalence class: the data could in principle tell it " +
			"from every other graph on its skeleton."
	case t.claimWarnings > 0:
		return fmt.Sprintf("%s fit any data exactly as well as the declared one; the findings about %s need attention.",
			otherGraphs(eq.size), count(t.claimWarnings, "claim", "claims"))
	case status == StatusWarn && onlyDeclared(eq):
		return fmt.Sprintf("%s fit any data exactly as well as the declared one, and the paper does not discuss "+
			"them; the stated background knowledge rules them all out.", otherGraphs(eq.size))
	case status == StatusWarn:
		return fmt.Sprintf("%s fit any data exactly as well as the declared one, and the paper does not discuss "+
			"them; %s.",
			otherGraphs(eq.size), reversibleText(t.reversible))
	}
	if onlyDeclared(eq) {
		return fmt.Sprintf("%s fit any data exactly as well as the declared one, and the stated background knowledge "+
			"rules them all out.", otherGraphs(eq.size))
	}
	return fmt.Sprintf("%s fit any data exactly as well as the declared one (%s); %s.",
		otherGraphs(eq.size), plausibleOthers(eq.plausible), reversibleText(t.reversible))
}

// onlyDeclared: the background knowledge leaves only the declared graph.
func onlyDeclared(eq *equivalenceResult) bool {
	return eq.plausible != nil && eq.plausible.Cmp(big.NewInt(1)) == 0
}

// reversibleText says whether claimed arrows can point the other way; it
// is used only where no claim's conclusion changes across the class.
func reversibleText(n int) string {
	if n == 0 {
		return "no claim's conclusion changes among the plausible ones, and no claimed arrow can point the other way " +
			"in them"
	}
	return fmt.Sprintf("%s can point the other way in some of them, but no claim's conclusion changes among the "+
		"plausible ones",
		count(n, "claimed arrow", "claimed arrows"))
}
