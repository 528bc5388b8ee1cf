package checks

import (
	"fmt"
	"strings"

	"github.com/pathvet/pathvet/checks/dag"
)

// The time order of graph.tiers in the equivalence check: the tiers orient
// every arrow between them (they are background knowledge, dag.TierArcs),
// and what they leave open is said in words.

// Sentences about the tiers.
const (
	tiersAllFormat = "The time order (%s) orients every arrow between tiers, and with the data and the other " +
		"background knowledge it orients every arrow of the declared graph: no line is left open."
	tiersOpenFormat = "The time order (%s) orients every arrow between tiers; the data and the background " +
		"knowledge leave %s open: %s. Which way %s the data cannot tell, and no tier says."
)

// tierNames lists the tiers by the names of the graph's variables in them.
func tierNames(s *Study) [][]string {
	if s.Tiers == nil {
		return nil
	}
	out := make([][]string, len(s.Tiers))
	for k, tier := range s.Tiers {
		out[k] = []string{}
		for _, v := range tier {
			if s.InGraph[v] {
				out[k] = append(out[k], s.Names[v])
			}
		}
	}
	return out
}

// tierFinding says which edges of the maximally oriented graph the tiers
// leave open: those within a tier, and those touching a variable in no
// tier. Nil without tiers, or when the knowledge contradicts the class.
func (a *Analysis) tierFinding(eq *equivalenceResult) []Finding {
	s := a.Study
	if s.Tiers == nil || eq.plausible == nil || eq.plausible.Sign() == 0 {
		return nil
	}
	m, ok, err := dag.MaximallyOriented(eq.cpdag, s.Background)
	if err != nil || !ok {
		return nil
	}
	lines, err := dag.OpenLines(m, s.Tiers)
	if err != nil {
		return nil
	}
	order := count(len(s.Tiers), "tier", "tiers")
	if len(lines) == 0 {
		return []Finding{{Severity: SeverityInfo, Topic: "tiers", Message: fmt.Sprintf(tiersAllFormat, order)}}
	}
	var parts []string
	for _, l := range lines {
		where := fmt.Sprintf("within tier %d", l.Tier+1)
		if l.Tier == dag.NoTier {
			where = "a variable in no tier"
		}
		parts = append(parts, fmt.Sprintf("%s — %s (%s)", s.Names[l.U], s.Names[l.V], where))
	}
	return []Finding{{Severity: SeverityInfo, Topic: "tiers", Message: fmt.Sprintf(tiersOpenFormat, order,
		count(len(lines), "edge", "edges"), strings.Join(parts, ", "), plural(len(lines), "it points", "they point"))}}
}
