package checks

import (
	"fmt"
	"slices"
	"strings"

	"github.com/pathvet/pathvet/checks/dag"
)

// unlistedFormat is the finding on claims that a class's parent sets
// were too many to re-estimate over: who, where, then what is not known.
const unlistedFormat = "%s could not be re-estimated in %s: there the variable whose parents the estimate uses " +
	"has more than %s locally valid parent sets (IDA's local criterion; a dense undirected neighbourhood of 13 or " +
	"more variables has that many), too many to list, so this check cannot say that %s there (the report's " +
	"nearby graphs name, class by class, the claims and their variables)."

// unlistedTally counts the examined classes, those in which some claim
// was not re-estimated (too many parent sets), and those claims.
type unlistedTally struct {
	examined, classes int
	claims            []int // claim indices, in order
}

// unlisted tallies the classes whose claims were re-estimated: the
// listed ones and the search's end point, each class once.
func (run *nearbyRun) unlisted() unlistedTally {
	var t unlistedTally
	seen, claims := map[string]bool{}, map[int]bool{}
	for _, c := range append(append([]*nearClass(nil), run.listed...), run.best) {
		if c == nil || c.claims == nil || seen[c.key] {
			continue
		}
		seen[c.key] = true
		t.examined++
		if len(c.unlisted) > 0 {
			t.classes++
		}
		for _, i := range c.unlisted {
			claims[i] = true
		}
	}
	for i := range claims {
		t.claims = append(t.claims, i)
	}
	slices.Sort(t.claims)
	return t
}

// unlistedFinding warns about the claims some examined class could not
// re-estimate; none when every claim was.
func (a *Analysis) unlistedFinding(run *nearbyRun) []Finding {
	t := run.unlisted()
	n := len(t.claims)
	if n == 0 {
		return nil
	}
	holds := "the claim holds"
	if n > 1 {
		holds = "these claims hold"
	}
	return []Finding{{Severity: StatusWarn, Topic: "unlisted",
		Message: fmt.Sprintf(unlistedFormat, a.claimIDsText(t.claims),
			unlistedWhere(t, n), thousands(dag.MaxParentSets), holds),
		Details: map[string]any{"claims": n, "classes": t.classes}}}
}

// unlistedWhere names the classes the claims were not re-estimated in.
func unlistedWhere(t unlistedTally, n int) string {
	const examined = "classes examined"
	each := ""
	if n > 1 && t.classes > 1 {
		each = " (each claim in at least one of them)"
	}
	switch {
	case t.examined == 1:
		return "the one class examined"
	case t.classes == t.examined && each == "":
		return fmt.Sprintf("each of the %d %s", t.examined, examined)
	case t.classes == t.examined:
		return fmt.Sprintf("the %d %s%s", t.examined, examined, each)
	}
	return fmt.Sprintf("%d of the %d %s%s", t.classes, t.examined, examined, each)
}

// claimIDsText names claims by id: "claim C1", "2 claims (C1 and C2)",
// "134 claims (C1, C2, C4, C5, C7 and 129 more)", capitalized.
func (a *Analysis) claimIDsText(idx []int) string {
	const shown = 5
	var ids []string
	for _, i := range idx[:min(shown, len(idx))] {
		ids = append(ids, a.Study.Package.Claims[i].ID)
	}
	switch {
	case len(idx) == 1:
		return "Claim " + ids[0]
	case len(idx) > shown:
		return fmt.Sprintf("%d claims (%s and %d more)", len(idx), strings.Join(ids, ", "), len(idx)-shown)
	}
	return fmt.Sprintf("%d claims (%s and %s)", len(idx), strings.Join(ids[:len(ids)-1], ", "), ids[len(ids)-1])
}
