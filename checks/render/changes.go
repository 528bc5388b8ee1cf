package render

import (
	"math"

	"github.com/pathvet/pathvet/checks"
)

// Change is how the claims' estimates moved from one version of a
// manuscript to the next (what became of the findings is the review's:
// review.Compare).
type Change struct {
	Moved []ClaimMove
}

// ClaimMove is a claim whose estimate under the declared graph moved.
type ClaimMove struct {
	ID, From, To, Note string
}

// movedBy is the least change of a declared estimate that counts as a
// move: one unit of the second decimal the page prints.
const movedBy = 0.01

// Changes compares the report of a previous version with the current one.
func Changes(prev, cur *checks.Report) Change {
	var ch Change
	before := map[string]checks.ClaimReport{}
	for _, c := range prev.Claims {
		before[c.ID] = c
	}
	for _, c := range cur.Claims {
		if m, ok := claimMove(before, c, cur.SignificanceLevel); ok {
			ch.Moved = append(ch.Moved, m)
		}
	}
	return ch
}

func claimMove(before map[string]checks.ClaimReport, c checks.ClaimReport, alpha float64) (ClaimMove, bool) {
	old, ok := before[c.ID]
	if !ok {
		return ClaimMove{ID: c.ID, From: "not in the previous version", To: numPtr(estOf(c.Declared), 2)}, true
	}
	a, b := fromEstimate(old.Declared), fromEstimate(c.Declared)
	m := ClaimMove{ID: c.ID, From: numPtr(a.Est, 2), To: numPtr(b.Est, 2), Note: shift(a, b, alpha)}
	moved := a.Est != nil && b.Est != nil && math.Abs(*a.Est-*b.Est) >= movedBy
	return m, moved || m.Note != "" || (a.Est == nil) != (b.Est == nil)
}

func estOf(e *checks.Estimate) *float64 {
	if e == nil {
		return nil
	}
	return e.Estimate
}
