package render

import (
	"fmt"
	"io"
	"math"
	"sort"
	"strings"

	"github.com/pathvet/pathvet/checks"
)

// TextWidth is the width the text report is wrapped to.
const TextWidth = 100

// WriteText writes the report as plain text for a terminal or an e-mail:
// the score and band first, then one block per check, worst first.
func WriteText(w io.Writer, r *checks.Report) error {
	var b strings.Builder
	fmt.Fprintf(&b, "Score %d/100: %s\n", r.Score, r.Band)
	if r.ScoreCap != nil {
		wrap(&b, "", r.ScoreCap.Reason)
	}
	wrap(&b, "", r.Title)
	if r.ManuscriptID != "" {
		fmt.Fprintf(&b, "Manuscript %s. ", r.ManuscriptID)
	}
	fmt.Fprintf(&b, "Design: %s. Significance level %g. pathvet %s.\n", r.Design, r.SignificanceLevel, r.ToolVersion)
	wrap(&b, "", r.Caution)
	for _, c := range ByConcern(r.Checks) {
		b.WriteString("\n")
		head := fmt.Sprintf("%-4s  %s (%s)", statusLabel(c.Status), c.Title, c.ID)
		if c.Deduction > 0 {
			head += fmt.Sprintf("  -%d", c.Deduction)
		}
		b.WriteString(head + "\n")
		wrap(&b, "      ", c.Summary)
		if c.RunError != "" {
			wrap(&b, "      ", "Reason: "+c.RunError)
		}
		for _, f := range c.Findings {
			wrapHanging(&b, "      ", fmt.Sprintf("- %s: ", statusLabel(f.Severity)), f.Message)
		}
	}
	writeNearby(&b, r.Graph)
	writeIndirect(&b, r)
	b.WriteString("\nPackage sha256 " + r.PackageSHA256 + "\n")
	_, err := io.WriteString(w, b.String())
	return err
}

func statusLabel(s string) string {
	switch s {
	case checks.StatusNotApplicable:
		return "n/a"
	}
	return strings.ToUpper(s)
}

// ByConcern returns the checks worst first (fail, warn, pass, not
// applicable), keeping pipeline order among equals, each with its
// findings worst first.
func ByConcern(cs []checks.CheckResult) []checks.CheckResult {
	out := append([]checks.CheckResult(nil), cs...)
	sort.SliceStable(out, func(i, j int) bool { return rank(out[i].Status) > rank(out[j].Status) })
	for i := range out {
		out[i].Findings = byConcernFindings(out[i].Findings)
	}
	return out
}

func byConcernFindings(fs []checks.Finding) []checks.Finding {
	out := append([]checks.Finding(nil), fs...)
	sort.SliceStable(out, func(i, j int) bool { return rank(out[i].Severity) > rank(out[j].Severity) })
	return out
}

// rank orders statuses and severities by concern.
func rank(s string) int {
	switch s {
	case checks.StatusFail:
		return 4
	case checks.StatusWarn:
		return 3
	case checks.StatusPass:
		return 2
	case checks.SeverityInfo:
		return 1
	}
	return 0
}

func wrap(b *strings.Builder, indent, text string) { wrapHanging(b, indent, "", text) }

// wrapHanging writes text wrapped at TextWidth, the first line after
// indent+lead, the rest indented to line up under the text.
func wrapHanging(b *strings.Builder, indent, lead, text string) {
	prefix := indent + lead
	pad := strings.Repeat(" ", len([]rune(prefix)))
	line := prefix
	width := len([]rune(line))
	for _, word := range strings.Fields(text) {
		n := len([]rune(word))
		if width > len([]rune(pad)) && width+1+n > TextWidth {
			b.WriteString(strings.TrimRight(line, " ") + "\n")
			line, width = pad, len([]rune(pad))
		}
		if width > len([]rune(pad)) {
			line += " "
			width++
		}
		line += word
		width += n
	}
	b.WriteString(line + "\n")
}

// writeNearby lists graph.nearby_graphs and graph.search_best, one line
// each: ΔBIC, Raftery's band, the edits, the class sizes, changed claims.
func writeNearby(b *strings.Builder, g *checks.GraphReport) {
	if g == nil || (len(g.NearbyGraphs) == 0 && g.SearchBest == nil) {
		return
	}
	b.WriteString("\nGraphs one edit away, best first (ΔBIC against the declared graph; negative fits better):\n")
	line := func(lead string, n checks.NearbyGraph) {
		var edits, changed []string
		for _, e := range n.Edits {
			edits = append(edits, e.Op+" "+e.From+" → "+e.To)
		}
		for id, c := range n.Claims {
			if c.Changed {
				changed = append(changed, id)
			}
		}
		sort.Strings(changed)
		ev := strings.ReplaceAll(n.Evidence, "_", " ")
		if n.Favours == "declared" || n.Favours == "nearby" {
			ev += map[string]string{"declared": ", for the declared graph", "nearby": ", for this graph"}[n.Favours]
		}
		text := fmt.Sprintf("%s (%s); class of %v, %v plausible", strings.Join(edits, ", "),
			ev, n.EquivalenceClassSize, orDash(n.PlausibleClassSize))
		if len(changed) > 0 {
			text += "; changed: " + strings.Join(changed, ", ")
		}
		wrapHanging(b, "  ", fmt.Sprintf("%-6s %+8.2f  ", lead, deref(n.DeltaBIC)), text)
	}
	for _, n := range g.NearbyGraphs {
		line("", n)
	}
	if g.SearchBest != nil {
		line("search", *g.SearchBest)
		wrap(b, "  ", "(the search's end point is a hint, not a discovery)")
	}
}

func orDash(v any) any {
	if v == nil {
		return "uncounted"
	}
	return v
}

func deref(x *float64) float64 {
	if x == nil {
		return math.NaN()
	}
	return *x
}
