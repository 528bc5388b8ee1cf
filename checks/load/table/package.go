package table

import (
	"fmt"
	"maps"
	"slices"
	"strings"

	"github.com/pathvet/pathvet/checks"
)

// PackageVariables are the table's variables as a package declares them:
// the name; the label, when it says more than the name; the scale
// continuous (a printed table does not show a variable's scale); and the
// reliability printed on its diagonal, when it has one.
func (t *Table) PackageVariables() []checks.Variable {
	out := make([]checks.Variable, len(t.Variables))
	for i, v := range t.Variables {
		out[i] = checks.Variable{Name: v.Name, Scale: checks.ScaleContinuous}
		if v.Label != v.Name {
			out[i].Label = v.Label
		}
		if t.Reliabilities != nil && t.Reliabilities[i] > 0 {
			r := t.Reliabilities[i]
			out[i].Reliability = &r
		}
	}
	return out
}

// MarkCounts words the counts of the significance marks stripped from
// the figures: `"*" 3 times, "**" once`; "" when there were none.
func (t *Table) MarkCounts() string {
	var parts []string
	for _, m := range slices.Sorted(maps.Keys(t.Marks)) {
		times := fmt.Sprintf("%d times", t.Marks[m])
		if t.Marks[m] == 1 {
			times = "once"
		}
		parts = append(parts, fmt.Sprintf("%q %s", m, times))
	}
	return strings.Join(parts, ", ")
}
