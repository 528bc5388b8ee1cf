package render

import (
	"fmt"
	"html/template"
	"math"

	"github.com/pathvet/pathvet/checks"
)

// NearbyDrawing is the declared graph with one nearby class's edits drawn
// on it, and a caption in words.
type NearbyDrawing struct {
	SVG     template.HTML
	Caption string
	Search  bool
}

// nearEquivalent says whether a class is within Raftery's (1995) first
// band, |ΔBIC| < 2, where the data do not tell it from the declared graph.
func nearEquivalent(n checks.NearbyGraph) bool {
	return n.DeltaBIC != nil && math.Abs(*n.DeltaBIC) < 2
}

// drawnClasses are the classes the page draws and charts: each class
// within |ΔBIC| < 2, then the search's end point; search marks the last.
func drawnClasses(g *checks.GraphReport) (cs []checks.NearbyGraph, search bool) {
	if g == nil {
		return nil, false
	}
	for _, n := range g.NearbyGraphs {
		if nearEquivalent(n) {
			cs = append(cs, n)
		}
	}
	if g.SearchBest != nil && len(g.SearchBest.Edits) > 0 {
		cs = append(cs, *g.SearchBest)
		search = true
	}
	return cs, search
}

// nearbyDrawings draws each class of drawnClasses, its arcs edited
// (editedArcs), on the declared graph's layout l.
func nearbyDrawings(l *Layout, cs []checks.NearbyGraph, search bool, edited [][]drawnArc,
	exo map[string]bool) []NearbyDrawing {
	out := make([]NearbyDrawing, len(cs))
	for i, n := range cs {
		d := NearbyDrawing{Caption: nearbyCaption(n), Search: search && i == len(cs)-1}
		d.SVG = drawing{l: l, arcs: edited[i], exo: exo, id: fmt.Sprintf("nearby-%d", i+1),
			title: "The declared graph " + editsPhrase(n.Edits), description: d.Caption}.svg()
		out[i] = d
	}
	return out
}

// evidenceBands are Raftery's (1995) bands of |ΔBIC| in words.
var evidenceBands = map[string]string{
	"indistinguishable": "|ΔBIC| below 2: the data do not tell the two graphs apart",
	"positive":          "positive evidence (|ΔBIC| 2 to 6)",
	"strong":            "strong evidence (|ΔBIC| 6 to 10)",
	"very_strong":       "very strong evidence (|ΔBIC| above 10)",
}

// evidencePhrase is a class's band of evidence and the graph it favours.
func evidencePhrase(n checks.NearbyGraph) string {
	s, ok := evidenceBands[n.Evidence]
	if !ok {
		s = "evidence: " + Words(n.Evidence)
	}
	switch n.Favours {
	case "declared":
		s += " for the declared graph"
	case "nearby":
		s += " for the edited graph"
	}
	return s
}

// nearbyCaption says in words what an edited drawing shows: the edits,
// ΔBIC with its band, and the claims that change.
func nearbyCaption(n checks.NearbyGraph) string {
	s := "The declared graph " + editsPhrase(n.Edits) + ": ΔBIC " + signedNum(n.DeltaBIC) + ", " +
		evidencePhrase(n) + "."
	if r := nearbyRow(n); len(n.Claims) == 0 {
		s += " Claims not re-estimated."
	} else if r.Changed == "none" {
		s += " No claim changes sign or significance."
	} else {
		s += " Claims whose sign or significance changes in some plausible graph: " + r.Changed + "."
	}
	return s
}
