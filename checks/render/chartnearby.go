package render

import (
	"fmt"
	"strings"

	"github.com/pathvet/pathvet/checks"
)

// nearbyChartRows are a claim's ranges, lowest to highest across the
// plausible members, in each class of drawnClasses; the last is the
// search's end point when search is set.
func nearbyChartRows(id string, cs []checks.NearbyGraph, search bool) []chartRow {
	rows := make([]chartRow, 0, len(cs))
	for i, n := range cs {
		label := shortEdits(n.Edits) + ", ΔBIC " + signedNum(n.DeltaBIC)
		if search && i == len(cs)-1 {
			label = "search end: " + label
		}
		r := chartRow{Label: label}
		if c, ok := n.Claims[id]; ok {
			r.Lo, r.Hi = c.Min, c.Max
			if c.Changed {
				r.Shift = "changes"
			}
		}
		rows = append(rows, r)
	}
	return rows
}

// shortEdits names edits briefly for a chart row: "without a → b",
// "added a → b", "b → a reversed"; past the first, how many more.
func shortEdits(edits []checks.GraphEdit) string {
	const shown = 1
	var parts []string
	for _, e := range edits[:min(shown, len(edits))] {
		switch e.Op {
		case "add":
			parts = append(parts, "added "+e.From+" → "+e.To)
		case "remove":
			parts = append(parts, "without "+e.From+" → "+e.To)
		case "reverse":
			parts = append(parts, e.To+" → "+e.From+" reversed")
		default:
			parts = append(parts, Words(e.Op)+" "+e.From+" → "+e.To)
		}
	}
	if len(edits) > shown {
		parts = append(parts, fmt.Sprintf("%d more", len(edits)-shown))
	}
	return strings.Join(parts, " + ")
}
