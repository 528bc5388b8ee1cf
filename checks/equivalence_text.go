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
	other := noEffect(claimScale(c))
	if ct.Estimate.Method != MethodZero && ct.Estimate.Estimate != nil {
		p := math.NaN()
		if ct.Estimate.PValue != nil {
			p = *ct.Estimate.PValue
		}
		other = fmt.Sprintf("%s (%s)", estText(*ct.Estimate.Estimate), pText(p))
	}
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
			Message: fmt.Sprintf(ruledOutFormat, otherGraphs(eq.size))}}
	}
	return []Finding{{Severity: StatusWarn, Topic: "discussion", Message: fmt.Sprintf(
		"%s fit any data exactly as well as the declared one (%s), and the authors do not discuss them.",
		otherGraphs(eq.size), plausibleOthers(eq.plausible))}}
}

// ruledOutFormat: the class has other members, but the background
// knowledge rules every one out, so the directions rest on that knowledge.
const ruledOutFormat = "%s fit any data exactly as well as the declared one, and the authors do not discuss them; " +
	"the stated background knowledge (exogenous variables, fixed arrows) rules them all out, so the arrows it " +
	"orients rest on that knowledge, not on the data."

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
