package render

import (
	"fmt"
	"sort"
	"strings"

	"github.com/pathvet/pathvet/checks"
)

// NearbyRow is one class of graphs one edit from the declared graph, or
// the end point of the greedy search, as the page lists them.
type NearbyRow struct {
	Edits, DeltaBIC, Evidence, Class, Changed string
	Search                                    bool
}

// editWords says an edit of the declared graph in words.
var editWords = map[string]string{"add": "add", "remove": "remove", "reverse": "reverse"}

// nearbyRows lists graph.nearby_graphs, best first, then the search's end
// point.
func nearbyRows(g *checks.GraphReport) []NearbyRow {
	if g == nil {
		return nil
	}
	var out []NearbyRow
	for _, n := range g.NearbyGraphs {
		out = append(out, nearbyRow(n))
	}
	if g.SearchBest != nil {
		r := nearbyRow(*g.SearchBest)
		r.Search = true
		out = append(out, r)
	}
	return out
}

func nearbyRow(n checks.NearbyGraph) NearbyRow {
	edits := make([]string, len(n.Edits))
	for i, e := range n.Edits {
		op, ok := editWords[e.Op]
		if !ok {
			op = Words(e.Op)
		}
		edits[i] = op + " " + e.From + " → " + e.To
	}
	var changed []string
	for id, c := range n.Claims {
		if c.Changed {
			changed = append(changed, id)
		}
	}
	sort.Strings(changed)
	r := NearbyRow{Edits: strings.Join(edits, ", "), DeltaBIC: signedNum(n.DeltaBIC), Evidence: evidenceWords(n),
		Class: classWords(n), Changed: strings.Join(changed, ", ")}
	switch {
	case len(n.Claims) == 0:
		r.Changed = "not re-estimated"
	case r.Changed == "":
		r.Changed = "none"
	}
	return r
}

// signedNum prints a ΔBIC with its sign (+ or −), two decimals.
func signedNum(p *float64) string {
	if p == nil {
		return notAvailable
	}
	if s := Num(*p, 2); !strings.HasPrefix(s, Minus) && s != "0.00" {
		return "+" + s
	}
	return Num(*p, 2)
}

func evidenceWords(n checks.NearbyGraph) string {
	s := Words(n.Evidence)
	switch n.Favours {
	case "declared":
		s += ", for the declared graph"
	case "nearby":
		s += ", for this graph"
	}
	return s
}

// classWords says the size of a class and of its plausible part: "1
// graph, 1 plausible", "24 graphs, plausible ones not counted".
func classWords(n checks.NearbyGraph) string {
	size, plausible := countWords(n.EquivalenceClassSize), countWords(n.PlausibleClassSize)
	switch {
	case n.EquivalenceClassSize == nil:
		size = "graphs not counted"
	case size == "1":
		size += " graph"
	default:
		size += " graphs"
	}
	if n.PlausibleClassSize == nil {
		return size + ", plausible ones not counted"
	}
	return size + ", " + plausible + " plausible"
}

// countWords prints an exact count from the report (a number, or a
// decimal string past 2^53), or says it was not counted.
func countWords(v any) string {
	switch x := v.(type) {
	case nil:
		return "uncounted"
	case float64:
		return fmt.Sprintf("%.0f", x)
	}
	return fmt.Sprint(v)
}
