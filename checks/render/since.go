package render

import (
	"html/template"

	"github.com/pathvet/pathvet/checks/review"
)

// Since is what a newer version of a manuscript changed, near the top of
// its page: first what the authors changed in the package (claims, arrows,
// data, method), then what became of each point asked of the previous
// version, then what the screen raises for the first time, then how the
// claims' estimates moved.
type Since struct {
	PrevID, Received string
	NoReport         bool // the previous version has no report to compare
	NoAsked          bool // the page shows no review (a submitter's): no points asked
	Changes          []ChangePart
	Asked            []AskedRow
	Raised           []AskedRow
	Moved            []ClaimMove
}

// ChangePart is what changed in one part of the package.
type ChangePart struct {
	Part  string
	Lines []string
}

// AskedRow is a point asked before (or raised now) with what became of it.
type AskedRow struct {
	State, Verdict string
	Claim          template.HTML
	Question       string
	Was, Now       string
}

// partWords name the parts of a package.
var partWords = map[string]string{review.PartClaims: "Claims", review.PartArrows: "The graph and its alternatives",
	review.PartData: "Data", review.PartMethod: "Method"}

// NewSince puts a comparison into words.
func NewSince(prevID, received string, changes []review.PackageChange, cmp review.Comparison,
	moved []ClaimMove) Since {
	s := Since{PrevID: prevID, Received: received, Moved: moved}
	for _, c := range changes {
		if n := len(s.Changes); n == 0 || s.Changes[n-1].Part != partWords[c.Part] {
			s.Changes = append(s.Changes, ChangePart{Part: partWords[c.Part]})
		}
		s.Changes[len(s.Changes)-1].Lines = append(s.Changes[len(s.Changes)-1].Lines, c.Text)
	}
	for _, o := range cmp.Asked {
		row := AskedRow{State: o.State, Verdict: verdictOf(o), Question: Prose(o.Question), Was: Prose(o.Was),
			Now: Prose(o.Now)}
		if o.Claim != nil {
			row.Claim = claimsHTML([]review.ClaimRef{*o.Claim})
		}
		s.Asked = append(s.Asked, row)
	}
	for _, d := range cmp.Raised {
		s.Raised = append(s.Raised, AskedRow{State: "raised", Verdict: "Raised for the first time, as a " +
			severityWords[d.Severity] + ".", Question: Prose(d.Question), Now: Prose(d.Message)})
	}
	return s
}

// verdictOf says what became of a point asked before.
func verdictOf(o review.Outcome) string {
	switch {
	case o.State == review.Answered && o.Now == "":
		return "Answered: the screen of this version no longer raises it."
	case o.State == review.Answered:
		return "Answered: the screen of this version mentions it as information only."
	case o.State == review.Open:
		return "Still open: the screen raises it as before, as a " + severityWords[o.NowSev] + "."
	}
	return "Changed: the screen still raises it, as a " + severityWords[o.NowSev] + " where it was a " +
		severityWords[o.WasSev] + "."
}
