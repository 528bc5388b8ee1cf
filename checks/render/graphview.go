package render

import (
	"fmt"
	"html/template"
	"slices"
	"strings"

	"github.com/pathvet/pathvet/checks"
)

// GraphView is the drawn-graph section of the page: the declared graph
// beside the CPDAG of its plausible equivalents, with the arrows in words.
type GraphView struct {
	Declared     template.HTML
	Other        template.HTML
	OtherCaption string
	Arrows       []string // the declared arrows in words, for readers who cannot see the drawing
	Note         string
	Nearby       []NearbyDrawing // the near-equivalent classes and the search's end point, edits drawn
}

// graphView draws the report's graph; nil when no graph was declared.
func graphView(r *checks.Report) (*GraphView, error) {
	g := r.Graph
	if g == nil {
		return nil, nil
	}
	if len(g.Declared) == 0 {
		return &GraphView{Note: "This report does not list the declared arrows, so the graph is not drawn."}, nil
	}
	l, err := LayOut(g.Nodes, g.Declared)
	if err != nil {
		return nil, err
	}
	exo := map[string]bool{}
	for _, v := range g.Exogenous {
		exo[v] = true
	}
	arcs := declaredArcs(g, r.Claims)
	v := &GraphView{Arrows: arrowWords(arcs, exo)}
	v.Declared = drawGraph(l, arcs, exo, "declared-graph", "The declared graph", strings.Join(v.Arrows, "; "))
	other, caption := g.PlausibleCPDAG, "The plausible equivalents: the CPDAG with background knowledge applied"
	if other == nil {
		other, caption = &g.CPDAG, "The whole equivalence class (no equivalent graph respects the background knowledge)"
	}
	oa := cpdagArcs(other)
	v.Other, v.OtherCaption = drawGraph(l, oa, exo, "plausible-cpdag", caption, cpdagWords(oa)), caption
	v.Nearby = nearbyDrawings(l, g, arcs, exo)
	if !g.Acyclic {
		v.Note = "The declared graph has a cycle, so some arrows point upwards."
	}
	return v, nil
}

// arrowWords says each declared arrow and what kind it is.
func arrowWords(arcs []drawnArc, exo map[string]bool) []string {
	out := make([]string, 0, len(arcs))
	for _, a := range arcs {
		s := arrow([2]string{a.From, a.To})
		if a.Kind == arcReversible {
			s += ", can point the other way in an equivalent graph"
		} else {
			s += ", the same in every equivalent graph"
		}
		if a.Fixed {
			s += ", fixed by background knowledge"
		}
		if a.Label != "" {
			s += fmt.Sprintf(", claim %s", a.Label)
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
		if a.Kind == arcLine {
			out[i] = a.From + " and " + a.To + " joined, direction open"
		} else {
			out[i] = arrow([2]string{a.From, a.To}) + " in every plausible graph"
		}
	}
	return strings.Join(out, "; ")
}
