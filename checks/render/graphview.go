package render

import (
	"errors"
	"fmt"
	"html/template"
	"slices"
	"strings"

	"github.com/pathvet/pathvet/checks"
)

// GraphView is the drawn-graph section of the page: the declared graph
// beside the CPDAG of its plausible equivalents, with the arrows in words
// and a legend of exactly what the drawings show.
type GraphView struct {
	Declared     template.HTML
	Other        template.HTML
	OtherCaption string
	Arrows       []string // the declared arrows in words, for readers who cannot see the drawing
	Note         string
	Legend       []LegendEntry
	Nearby       []NearbyDrawing // the near-equivalent classes and the search's end point, edits drawn
	NearbyLegend []LegendEntry
}

// graphView draws the report's graph; nil when no graph was declared.
// Every drawing shares one layout, laid out from all their arrows.
func graphView(r *checks.Report) (*GraphView, error) {
	g := r.Graph
	if g == nil {
		return nil, nil
	}
	if len(g.Declared) == 0 {
		return &GraphView{Note: "This report does not list the declared arrows, so the graph is not drawn."}, nil
	}
	exo := map[string]bool{}
	for _, v := range g.Exogenous {
		exo[v] = true
	}
	arcs := declaredArcs(g, r.Claims)
	other, caption := g.PlausibleCPDAG, plausibleCaption
	if other == nil {
		other, caption = &g.CPDAG, wholeClassCaption
	}
	oa := cpdagArcs(other, &g.CPDAG)
	cs, search := drawnClasses(g)
	edited := make([][]drawnArc, len(cs))
	for i, n := range cs {
		edited[i] = editedArcs(arcs, n.Edits, g.Nodes)
	}
	v := &GraphView{Arrows: arrowWords(arcs, exo), OtherCaption: caption}
	l, err := LayOut(layoutInput(g, append([][]drawnArc{arcs, oa}, edited...)))
	if errors.Is(err, ErrTooLarge) {
		v.Note = fmt.Sprintf(tooLargeNote, len(g.Nodes), len(g.Declared))
		return v, nil
	}
	if err != nil {
		return nil, err
	}
	v.Declared = drawing{l: l, arcs: arcs, exo: exo, id: "declared-graph", title: "The declared graph",
		description: strings.Join(v.Arrows, "; ")}.svg()
	v.Other = drawing{l: l, arcs: oa, exo: exo, id: "plausible-cpdag", title: caption,
		description: cpdagWords(oa)}.svg()
	v.Legend = legend(l, exo, g.PlausibleCPDAG == nil, false, arcs, oa)
	v.Nearby = nearbyDrawings(l, cs, search, edited, exo)
	if len(edited) > 0 {
		v.NearbyLegend = legend(l, exo, false, true, edited...)
	}
	if !g.Acyclic {
		v.Note = "The declared graph has a cycle, so some arrows point upwards."
	}
	return v, nil
}

// Captions of the right-hand drawing.
const (
	plausibleCaption  = "The plausible equivalents: the CPDAG with background knowledge applied"
	wholeClassCaption = "The whole equivalence class (no equivalent graph respects the background knowledge)"
	againstWords      = ", the other way round in every graph that respects the background knowledge"
	tooLargeNote      = "The declared graph, %d variables and %d arrows, is too dense to draw legibly here; " +
		"its arrows are listed in words below."
)

// layoutInput is what the report's drawings are laid out from: the
// graph's variables and every drawing's arrows, and its tiers, each its
// own labelled row (tierRows). Constructs are left empty until the report
// carries them.
func layoutInput(g *checks.GraphReport, drawings [][]drawnArc) LayoutInput {
	arcs := layoutArcs(drawings...)
	tiers, labels := tierRows(g.Tiers, g.Nodes, arcs)
	return LayoutInput{Nodes: g.Nodes, Arcs: arcs, Tiers: tiers, TierLabels: labels}
}

// Labels of the tier rows.
const (
	tierLabel   = "tier %d"
	firstLabel  = "tier %d, earliest"
	lastLabel   = "tier %d, latest"
	noTierLabel = "in no tier"
)

// tierRows are the report's tiers as rows of the drawing, earliest first,
// each labelled with its number (a tier without a variable of the graph is
// left out, the others keep their numbers), and the graph's variables in
// no tier in a row of their own: above the first tier when no arrow comes
// into them from a tier, else below the last. Nil without tiers.
func tierRows(tiers [][]string, nodes []string, arcs []LayoutArc) ([][]string, []string) {
	if len(tiers) == 0 {
		return nil, nil
	}
	var rows [][]string
	var labels []string
	tiered := map[string]bool{}
	for k, t := range tiers {
		for _, v := range t {
			tiered[v] = true
		}
		if len(t) == 0 {
			continue
		}
		label := fmt.Sprintf(tierLabel, k+1)
		switch {
		case k == 0:
			label = fmt.Sprintf(firstLabel, k+1)
		case k == len(tiers)-1:
			label = fmt.Sprintf(lastLabel, k+1)
		}
		rows, labels = append(rows, t), append(labels, label)
	}
	var rest []string
	for _, v := range nodes {
		if !tiered[v] {
			rest = append(rest, v)
		}
	}
	if len(rest) == 0 {
		return rows, labels
	}
	into := slices.ContainsFunc(arcs, func(a LayoutArc) bool { return tiered[a.From] && !tiered[a.To] })
	if into {
		return append(rows, rest), append(labels, noTierLabel)
	}
	return append([][]string{rest}, rows...), append([]string{noTierLabel}, labels...)
}

// kindWords say what each kind of declared arrow means, after the arrow.
var kindWords = map[string]string{
	arcCompelled:  ", the same in every equivalent graph",
	arcSettled:    ", the other way round in some equivalent graph, but fixed by background knowledge",
	arcReversible: ", can point the other way in an equivalent graph that respects the background knowledge",
}

// arrowWords says each declared arrow and its one kind.
func arrowWords(arcs []drawnArc, exo map[string]bool) []string {
	out := make([]string, 0, len(arcs))
	for _, a := range arcs {
		s := arrow([2]string{a.From, a.To}) + kindWords[a.Kind]
		switch {
		case a.Against:
			s = arrow([2]string{a.From, a.To}) + againstWords
		case a.Kind == arcSettled && a.Stated:
			s += " (stated)"
		case a.Kind == arcSettled:
			s += " (it follows from what is stated)"
		}
		if a.Tag != "" {
			s += fmt.Sprintf(", claim %s", a.Tag)
		}
		out = append(out, s)
	}
	for v := range exo {
		out = append(out, v+" is exogenous")
	}
	slices.Sort(out[len(arcs):])
	return out
}

// cpdagWords says a CPDAG's arrows and open edges.
func cpdagWords(arcs []drawnArc) string {
	out := make([]string, len(arcs))
	for i, a := range arcs {
		switch a.Kind {
		case arcOpen:
			out[i] = a.From + " and " + a.To + " joined, direction open"
		case arcSettled:
			out[i] = arrow([2]string{a.From, a.To}) + " in every plausible graph, by background knowledge"
		default:
			out[i] = arrow([2]string{a.From, a.To}) + " in every equivalent graph"
		}
	}
	return strings.Join(out, "; ")
}
