package render

import (
	"fmt"
	"html/template"
	"strings"
)

// LegendEntry is one line of a drawing's legend: a sample drawn by the
// drawing's own code, what it looks like in words, and what it means.
type LegendEntry struct {
	Kind          string
	Key           template.HTML
	Term, Meaning string
}

// legendWords are the entries by kind, in the order a legend lists them.
var legendWords = []struct{ kind, term, meaning string }{
	{arcCompelled, "solid line, filled head",
		"the same direction in every graph that fits the data exactly as well (the whole equivalence class)"},
	{arcSettled, "double line, filled head",
		"points the other way in some graph that fits exactly as well, but not in one that respects the " +
			"background knowledge (stated, or following from what is stated)"},
	{arcReversible, "dashed line, open head",
		"points the other way in some graph that fits the data exactly as well and respects the background knowledge"},
	{arcOpen, "wide grey line, no head", "joined in every plausible graph, direction open"},
	{arcKept, "thin grey line, filled head", "an arrow the edit leaves as declared"},
	{arcAdded, "thick dash-dot line, filled head, tag “added”", "an arrow the edit adds"},
	{arcRemoved, "dotted line, no head, a cross, tag “removed”", "a declared arrow the edit takes away"},
	{arcReversed, "long-dash line, filled head, tag “reversed”",
		"a declared arrow the edit turns round; its head shows the new direction"},
	{"exogenous", "double border", "an exogenous variable: nothing in the graph causes it"},
	{"latent", "ellipse, items listed beside it", "a construct, measured by the items listed"},
	{"tier", "shaded band, label at the left", "a tier: its variables in one row, earlier tiers above later ones; " +
		"an arrow within a tier is an arch above its row"},
	{"tag", "tag on an arrow", "the claims about that direct effect"},
}

// noPlausibleMeaning replaces the reversible entry's meaning when no
// equivalent graph respects the background knowledge.
const noPlausibleMeaning = "points the other way in some graph that fits the data exactly as well " +
	"(no such graph respects all the background knowledge)"

// nearbyTagMeaning is the tag entry's meaning under the edited drawings.
const nearbyTagMeaning = "the edit's word, with the claims about that direct effect in brackets"

// legend lists exactly what the drawings on layout l show: the kind of
// every arrow drawn, and the marks of the variables, tiers and tags.
func legend(l *Layout, exo map[string]bool, noPlausible, nearby bool, drawings ...[]drawnArc) []LegendEntry {
	shown := map[string]bool{}
	for _, arcs := range drawings {
		for _, a := range arcs {
			if r, ok := l.RouteOf(a.From, a.To); ok {
				shown[a.Kind] = true
				shown["tag"] = shown["tag"] || (a.Tag != "" && r.Tag != nil)
			}
		}
	}
	for _, n := range l.Nodes {
		shown["exogenous"] = shown["exogenous"] || exo[n.Name]
		shown["latent"] = shown["latent"] || n.Latent
	}
	shown["tier"] = len(l.Tiers) > 0
	var out []LegendEntry
	for _, w := range legendWords {
		if !shown[w.kind] {
			continue
		}
		e := LegendEntry{Kind: w.kind, Key: legendKey(w.kind), Term: w.term, Meaning: w.meaning}
		if w.kind == arcReversible && noPlausible {
			e.Meaning = noPlausibleMeaning
		}
		if w.kind == "tag" && nearby {
			e.Meaning = nearbyTagMeaning
		}
		out = append(out, e)
	}
	return out
}

// legendKey is a small sample of a kind, drawn by the drawing's code.
func legendKey(kind string) template.HTML {
	var b strings.Builder
	fmt.Fprintf(&b, `<svg class="key" viewBox="0 0 60 18" aria-hidden="true" data-kind="%s">`, kind)
	switch kind {
	case "exogenous":
		drawNode(&b, Placed{Shape: Box{X: 10, Y: 2, W: 40, H: 14}}, true)
	case "latent":
		b.WriteString(`<ellipse class="keyshape" cx="20" cy="9" rx="17" ry="7"/>` +
			`<path class="bracket" d="M37,9 H44 M44,3 V15 M46,5 H56 M46,9 H56 M46,13 H56"/>`)
	case "tier":
		b.WriteString(`<rect class="tierband" x="1" y="2" width="58" height="14" rx="4"/>`)
	case "tag":
		b.WriteString(`<path class="arc kept" d="M10,0 V18"/><path class="pole" d="M10,9 H18"/>` +
			`<rect class="keytag" x="18" y="3" width="34" height="12" rx="3"/>`)
	default:
		r := Route{Start: Pt{4, 9}, Segs: []Seg{{To: Pt{54, 9}}}, Pole: Pt{29, 9}}
		drawArc(&b, drawnArc{Kind: kind}, r)
		if kind == arcRemoved {
			fmt.Fprintf(&b, `<path class="strike" d="M25,5 l8,8 m0,-8 l-8,8"/>`)
		}
	}
	b.WriteString(`</svg>`)
	return template.HTML(b.String())
}
