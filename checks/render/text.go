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
// the level of concern in words and what was taken off first, then one
// block per check, worst first, each headed by the check's title and its
// verdict in words, its findings grouped under what fails, what warns and
// the notes.
func WriteText(w io.Writer, r *checks.Report) error {
	var b strings.Builder
	c := concernOf(r)
	fmt.Fprintf(&b, "pathvet screening report: %s\n", c.Level)
	wrap(&b, "", r.Title)
	if r.ManuscriptID != "" {
		fmt.Fprintf(&b, "Manuscript %s. ", r.ManuscriptID)
	}
	fmt.Fprintf(&b, "Design: %s. Significance level %g. pathvet %s.\n", Words(r.Design), r.SignificanceLevel,
		r.ToolVersion)
	wrap(&b, "", r.Caution)
	writeConcern(&b, c)
	for _, ch := range ByConcern(r.Checks) {
		writeCheck(&b, ch)
	}
	writeNearby(&b, r.Graph)
	writeIndirect(&b, r)
	b.WriteString("\nPackage sha256 " + r.PackageSHA256 + "\n")
	_, err := io.WriteString(w, b.String())
	return err
}

// writeConcern writes the concern in words and the ledger: each check
// that took something off, the points first, and the sum.
func writeConcern(b *strings.Builder, c Concern) {
	b.WriteString("\n")
	wrap(b, "", strings.Join(nonEmpty(upperFirst(c.Level)+".", c.Gist, c.Capped, c.Headline, c.Unfinished, c.Rest), " "))
	if len(c.Lines) == 0 {
		return
	}
	b.WriteString("\nPoints taken off, by check:\n")
	width := len(fmt.Sprint(c.Off))
	for _, l := range c.Lines {
		wrapHanging(b, "  ", fmt.Sprintf("%*d  ", width, l.Off), l.Title+" ("+l.Verdict+")")
	}
	fmt.Fprintf(b, "  %*d  in all\n", width, c.Off)
	wrap(b, "", c.Scale)
}

// findingGroups are the headings the text view gathers findings under.
var findingGroups = []struct{ severity, heading string }{
	{checks.StatusFail, "Failures:"}, {checks.StatusWarn, "Warnings:"}, {checks.SeverityInfo, "Notes:"},
}

// findingGroup is the group a finding's severity falls in: a severity
// other than fail or warn is a note.
func findingGroup(severity string) string {
	if severity == checks.StatusFail || severity == checks.StatusWarn {
		return severity
	}
	return checks.SeverityInfo
}

// writeCheck writes one check: its title and verdict, its summary, why it
// could not finish, and its findings by severity.
func writeCheck(b *strings.Builder, c checks.CheckResult) {
	b.WriteString("\n")
	head := fmt.Sprintf("%s (%s): %s", c.Title, c.ID, verdict(c.Status))
	if c.Deduction > 0 {
		head += fmt.Sprintf(", %s taken off", plural(c.Deduction, "point", "points"))
	}
	wrap(b, "", head)
	wrap(b, "    ", c.Summary)
	if c.RunError != "" {
		wrap(b, "    ", "It could not run to the end: "+c.RunError)
	}
	for _, g := range findingGroups {
		first := true
		for _, f := range c.Findings {
			if findingGroup(f.Severity) != g.severity {
				continue
			}
			if first {
				wrap(b, "    ", g.heading)
				first = false
			}
			wrapHanging(b, "      ", "· ", f.Message)
		}
	}
}

// nonEmpty drops the empty strings.
func nonEmpty(s ...string) []string {
	var out []string
	for _, x := range s {
		if x != "" {
			out = append(out, x)
		}
	}
	return out
}

// upperFirst capitalises the first letter.
func upperFirst(s string) string {
	if s == "" {
		return s
	}
	r := []rune(s)
	return strings.ToUpper(string(r[0])) + string(r[1:])
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
