package review

import (
	"fmt"
	"slices"
	"strings"

	"github.com/pathvet/pathvet/checks"
)

// arrowChanges: the declared graph's arrows, its fixed arrows, the
// exogenous variables, the discussion of equivalent graphs and the
// alternatives.
func arrowChanges(prev, cur *checks.Package) []string {
	switch {
	case prev.Graph == nil && cur.Graph != nil:
		return append([]string{"A causal graph is now declared."}, alternativeChanges(prev, cur)...)
	case prev.Graph != nil && cur.Graph == nil:
		return append([]string{"The causal graph is no longer declared."}, alternativeChanges(prev, cur)...)
	}
	var out []string
	if prev.Graph != nil {
		out = append(out, edgeChanges(prev.Graph.Edges, cur.Graph.Edges, "the declared graph")...)
		out = append(out, edgeChanges(prev.Graph.FixedEdges, cur.Graph.FixedEdges, "the fixed arrows")...)
		if prev.Graph.EquivalentsDiscussed != cur.Graph.EquivalentsDiscussed {
			now := map[bool]string{true: "now say", false: "no longer say"}[cur.Graph.EquivalentsDiscussed]
			out = append(out, "The authors "+now+" that they discussed the graphs equivalent to theirs.")
		}
	}
	out = append(out, exogenousChanges(prev, cur)...)
	return append(out, alternativeChanges(prev, cur)...)
}

func edgeChanges(prev, cur []checks.Edge, where string) []string {
	var out []string
	for _, e := range cur {
		if !slices.Contains(prev, e) {
			out = append(out, fmt.Sprintf("The arrow %s → %s is added to %s.", e.From, e.To, where))
		}
	}
	for _, e := range prev {
		if !slices.Contains(cur, e) {
			out = append(out, fmt.Sprintf("The arrow %s → %s is removed from %s.", e.From, e.To, where))
		}
	}
	return out
}

func exogenousChanges(prev, cur *checks.Package) []string {
	was := map[string]bool{}
	for _, v := range prev.Variables {
		was[v.Name] = v.Exogenous
	}
	var out []string
	for _, v := range cur.Variables {
		if old, ok := was[v.Name]; ok && old != v.Exogenous {
			out = append(out, fmt.Sprintf("%s is %s declared exogenous.", v.Name,
				map[bool]string{true: "now", false: "no longer"}[v.Exogenous]))
		}
	}
	return out
}

func alternativeChanges(prev, cur *checks.Package) []string {
	before := map[string]checks.Alternative{}
	for _, a := range prev.Alternatives {
		before[a.Name] = a
	}
	var out []string
	for _, a := range cur.Alternatives {
		old, ok := before[a.Name]
		switch {
		case !ok:
			out = append(out, fmt.Sprintf("The alternative “%s” is new.", a.Name))
		case !sameEdges(old.Edges, a.Edges):
			out = append(out, fmt.Sprintf("The alternative “%s” has other arrows.", a.Name))
		}
	}
	for _, a := range prev.Alternatives {
		if !slices.ContainsFunc(cur.Alternatives, func(n checks.Alternative) bool { return n.Name == a.Name }) {
			out = append(out, fmt.Sprintf("The alternative “%s” is withdrawn.", a.Name))
		}
	}
	return out
}

func sameEdges(a, b []checks.Edge) bool {
	return len(a) == len(b) && !slices.ContainsFunc(a, func(e checks.Edge) bool { return !slices.Contains(b, e) })
}

// dataChanges: the kind of data, the data themselves, the variables and
// the declared missing-value codes.
func dataChanges(prev, cur *checks.Package, pd, cd DataFacts) []string {
	var out []string
	kinds := map[string]string{checks.DataRows: "raw rows", checks.DataSummary: "summary statistics"}
	unit := unitOf(cur.Data.Kind)
	switch {
	case prev.Data.Kind != cur.Data.Kind:
		out = append(out, fmt.Sprintf("The data are now %s (%s), then %s (%s).", kinds[cur.Data.Kind],
			count(cd.Rows, unit), kinds[prev.Data.Kind], count(pd.Rows, unitOf(prev.Data.Kind))))
	case pd.Digest == cd.Digest:
		out = append(out, "The data are the same as before.")
	case pd.Rows < 0 || cd.Rows < 0:
		out = append(out, "The data changed.")
	case pd.Rows == cd.Rows:
		out = append(out, fmt.Sprintf("The data changed; both versions have %s.", count(cd.Rows, unit)))
	default:
		out = append(out, fmt.Sprintf("The data changed: %s then, %d now.", count(pd.Rows, unit), cd.Rows))
	}
	out = append(out, variableChanges(prev, cur)...)
	if a, b := strings.Join(prev.Data.MissingCodes, ", "), strings.Join(cur.Data.MissingCodes, ", "); a != b {
		out = append(out, fmt.Sprintf("The declared missing-value codes changed: %s then, %s now.", orNone(a),
			orNone(b)))
	}
	return out
}

// unitOf is what a kind of data counts: rows, or the cases of summary
// statistics.
func unitOf(kind string) [2]string {
	if kind == checks.DataSummary {
		return [2]string{"case", "cases"}
	}
	return [2]string{"row", "rows"}
}

func count(n int, unit [2]string) string {
	if n == 1 {
		return "1 " + unit[0]
	}
	return fmt.Sprintf("%d %s", n, unit[1])
}

func orNone(s string) string {
	if s == "" {
		return "none"
	}
	return s
}

func variableChanges(prev, cur *checks.Package) []string {
	has := func(vs []checks.Variable, name string) bool {
		return slices.ContainsFunc(vs, func(v checks.Variable) bool { return v.Name == name })
	}
	var out []string
	for _, v := range cur.Variables {
		if !has(prev.Variables, v.Name) {
			out = append(out, fmt.Sprintf("The variable %s is new.", v.Name))
		}
	}
	for _, v := range prev.Variables {
		if !has(cur.Variables, v.Name) {
			out = append(out, fmt.Sprintf("The variable %s is no longer in the package.", v.Name))
		}
	}
	return out
}
