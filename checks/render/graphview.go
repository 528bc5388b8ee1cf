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

// layoutInput is what the report's drawings are laid out from. Tiers and
// constructs are left empty until the report carries them.
func layoutInput(g *checks.GraphReport, drawings [][]drawnArc) LayoutInput {
	return LayoutInput{Nodes: g.Nodes, Arcs: layoutArcs(drawings...)}
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
