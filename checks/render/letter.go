package render

import (
	"fmt"
	"io"
	"strings"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/review"
)

// DefaultLetter is a report's letter with nobody's decisions: every fail
// and warn finding asked, every info finding noted (the offline page and
// the command line, which know no reviewer).
func DefaultLetter(r *checks.Report) review.Letter {
	return review.Compose(r, review.Decide(r, nil))
}

// WriteLetter writes the letter for the authors as Markdown, ready to
// paste into a decision letter: a greeting, what was screened, the
// caution, the asked items (each naming its claims with their text, the
// findings and the question), and the package's hash. It has no score or
// band and names no part of the report, which the authors do not see;
// noted items are not in it. Everything from the package goes through
// MarkdownText.
func WriteLetter(w io.Writer, l review.Letter) error {
	var b strings.Builder
	b.WriteString("Dear authors,\n\n")
	fmt.Fprintf(&b, "We screened the statistical analysis of “%s”%s with pathvet %s, an automated screen, "+
		"on %s. Please answer each point that follows in your response, and in the manuscript where it calls "+
		"for a change.\n\n", MarkdownText(l.Title), manuscriptText(l.ManuscriptID), l.ToolVersion,
		l.Screened.UTC().Format("2 January 2006"))
	fmt.Fprintf(&b, "> **Caution.** %s\n\n", MarkdownText(l.Caution))
	if len(l.Items) == 0 {
		b.WriteString("The screen raised no point that we ask you to answer.\n\n")
	}
	for _, it := range l.Items {
		writeItem(&b, it)
	}
	fmt.Fprintf(&b, "The screen read the package whose SHA-256 is `%s`.\n", l.PackageSHA256)
	_, err := io.WriteString(w, b.String())
	return err
}

func manuscriptText(id string) string {
	if id == "" {
		return ""
	}
	return " (manuscript " + MarkdownText(id) + ")"
}

// writeItem writes one numbered point: its claims, its one finding inline
// with the question, or its findings as a list with the question after.
func writeItem(b *strings.Builder, it review.Item) {
	head := ClaimsText(it.Claims, "**")
	q := MarkdownText(Prose(it.Question))
	if len(it.Findings) == 1 {
		fmt.Fprintf(b, "%d. %s%s %s\n\n", it.N, headText(head), MarkdownText(Prose(it.Findings[0])), q)
		return
	}
	fmt.Fprintf(b, "%d. %s\n\n", it.N, strings.TrimSuffix(headText(head), " "))
	for _, f := range it.Findings {
		fmt.Fprintf(b, "   - %s\n", MarkdownText(Prose(f)))
	}
	if q != "" {
		fmt.Fprintf(b, "\n   %s\n", q)
	}
	b.WriteString("\n")
}

func headText(head string) string {
	if head == "" {
		return ""
	}
	return head + ": "
}

// ClaimsText names an item's claims with their text, escaped for
// Markdown, each id between mark (for instance "**"): "Claim C3, “…”",
// "Claims C1, “…” (a headline claim); C2, “…”; and C3, “…”".
func ClaimsText(cs []review.ClaimRef, mark string) string {
	esc := make([]review.ClaimRef, len(cs))
	for i, c := range cs {
		esc[i] = review.ClaimRef{ID: MarkdownText(c.ID), Text: MarkdownText(c.Text), Headline: c.Headline}
	}
	return ClaimsTextPlain(esc, mark, mark)
}

// ClaimsTextPlain names claims whose ids and texts are already escaped for
// where they go, each id between open and close.
func ClaimsTextPlain(cs []review.ClaimRef, open, close string) string {
	parts := make([]string, len(cs))
	for i, c := range cs {
		parts[i] = open + c.ID + close + ", “" + c.Text + "”"
		if c.Headline {
			parts[i] += " (a headline claim)"
		}
	}
	switch len(parts) {
	case 0:
		return ""
	case 1:
		return "Claim " + parts[0]
	case 2:
		return "Claims " + parts[0] + "; and " + parts[1]
	}
	return "Claims " + strings.Join(parts[:len(parts)-1], "; ") + "; and " + parts[len(parts)-1]
}
