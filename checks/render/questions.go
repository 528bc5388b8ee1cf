package render

import (
	"html/template"
	"strings"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/review"
)

// ItemView is a point of the letter as a page shows it: the claims it is
// about, its findings and its question, with minus signs set.
type ItemView struct {
	N        int
	Claims   template.HTML // the claims with their text ("" for none)
	Findings []string
	Question string
	Severity string
	Keys     []string
}

// Questions are the points of a report's letter with nobody's decisions
// (DefaultLetter), for a page.
func Questions(r *checks.Report) []ItemView { return ItemViews(DefaultLetter(r).Items) }

// ItemViews makes the letter's items ready for a page.
func ItemViews(items []review.Item) []ItemView {
	out := make([]ItemView, len(items))
	for i, it := range items {
		v := ItemView{N: it.N, Claims: claimsHTML(it.Claims), Question: Prose(it.Question), Severity: it.Severity,
			Keys: it.Keys}
		for _, f := range it.Findings {
			v.Findings = append(v.Findings, Prose(f))
		}
		out[i] = v
	}
	return out
}

// claimsHTML names claims with their text, as ClaimsText does, in HTML.
func claimsHTML(cs []review.ClaimRef) template.HTML {
	if len(cs) == 0 {
		return ""
	}
	esc := make([]review.ClaimRef, len(cs))
	for i, c := range cs {
		esc[i] = review.ClaimRef{ID: template.HTMLEscapeString(c.ID), Text: template.HTMLEscapeString(c.Text),
			Headline: c.Headline}
	}
	var b strings.Builder
	b.WriteString(ClaimsTextPlain(esc, "<strong>", "</strong>"))
	return template.HTML(b.String()) // every part escaped above
}
