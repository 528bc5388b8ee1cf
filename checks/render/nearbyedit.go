package render

import (
	"strings"

	"github.com/pathvet/pathvet/checks"
)

// editedArcs applies edits, in order, to the declared arcs: a removed
// arrow stays, drawn as removed; a reversed one points its new way; an
// added one joins in its own style; the rest are kept. Arcs whose ends
// are not among the nodes are left out of the drawing (the caption still
// names them).
func editedArcs(base []drawnArc, edits []checks.GraphEdit, nodes []string) []drawnArc {
	arcs := make([]drawnArc, len(base))
	for i, a := range base {
		arcs[i] = drawnArc{From: a.From, To: a.To, Kind: arcKept, Tag: a.Tag}
	}
	for _, e := range edits {
		arcs = applyEdit(arcs, e)
	}
	known := map[string]bool{}
	for _, n := range nodes {
		known[n] = true
	}
	out := arcs[:0]
	for _, a := range arcs {
		if known[a.From] && known[a.To] {
			out = append(out, a)
		}
	}
	return out
}

// applyEdit applies one edit to the arcs drawn so far. Adding the
// reverse of an arrow removed before turns that arrow round instead.
func applyEdit(arcs []drawnArc, e checks.GraphEdit) []drawnArc {
	i := findArc(arcs, e.From, e.To)
	switch {
	case e.Op == "add":
		if j := findRemoved(arcs, e.To, e.From); j >= 0 {
			arcs[j].Kind, arcs[j].From, arcs[j].To = arcReversed, e.From, e.To
			arcs[j].Tag = "reversed" + strings.TrimPrefix(arcs[j].Tag, "removed")
			return arcs
		}
		return append(arcs, drawnArc{From: e.From, To: e.To, Kind: arcAdded, Tag: "added"})
	case i < 0:
		return arcs
	case e.Op == "remove" && arcs[i].Kind == arcAdded:
		return append(arcs[:i], arcs[i+1:]...)
	case e.Op == "remove":
		arcs[i].Kind, arcs[i].Tag = arcRemoved, editLabel("removed", arcs[i].Tag)
	case e.Op == "reverse":
		a := &arcs[i]
		a.From, a.To = a.To, a.From
		if a.Kind != arcAdded {
			a.Kind, a.Tag = arcReversed, editLabel("reversed", a.Tag)
		}
	}
	return arcs
}

// findRemoved is the index of the removed arc from → to, or −1.
func findRemoved(arcs []drawnArc, from, to string) int {
	for i, a := range arcs {
		if a.From == from && a.To == to && a.Kind == arcRemoved {
			return i
		}
	}
	return -1
}

// findArc is the index of the drawn (not removed) arc from → to, or −1.
func findArc(arcs []drawnArc, from, to string) int {
	for i, a := range arcs {
		if a.From == from && a.To == to && a.Kind != arcRemoved {
			return i
		}
	}
	return -1
}

// editLabel puts the edit's word before the claims on an arc.
func editLabel(word, claims string) string {
	if claims == "" {
		return word
	}
	return word + " (" + claims + ")"
}

// editPhrase says one edit in words: "without the arrow a → b".
func editPhrase(e checks.GraphEdit) string {
	switch e.Op {
	case "add":
		return "with an added arrow " + e.From + " → " + e.To
	case "remove":
		return "without the arrow " + e.From + " → " + e.To
	case "reverse":
		return "with the arrow " + e.From + " → " + e.To + " reversed to " + e.To + " → " + e.From
	}
	return "with the edit " + Words(e.Op) + " " + e.From + " → " + e.To
}

// editsPhrase says a class's edits in words, joined by "and".
func editsPhrase(edits []checks.GraphEdit) string {
	if len(edits) == 0 {
		return "unchanged"
	}
	parts := make([]string, len(edits))
	for i, e := range edits {
		parts[i] = editPhrase(e)
	}
	return strings.Join(parts, " and ")
}
