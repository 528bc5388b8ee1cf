package render

import (
	"slices"
	"sort"
	"strings"

	"github.com/pathvet/pathvet/checks"
)

// Arc kinds: each arrow of a drawing has exactly one, and each kind has a
// line style, a head and a legend entry of its own, so that colour is
// never the only cue. The first four are the declared graph's and the
// CPDAG's; the last four those of a nearby graph drawn on the declared
// one.
const (
	arcCompelled  = "compelled"  // this way round in every equivalent graph
	arcSettled    = "settled"    // reversible in the class, but not by the background knowledge
	arcReversible = "reversible" // the other way round in some plausible equivalent graph
	arcOpen       = "open"       // an undirected edge of a CPDAG
	arcKept       = "kept"       // a declared arrow an edit leaves alone
	arcAdded      = "added"      // an arrow the edit adds
	arcRemoved    = "removed"    // a declared arrow the edit takes away
	arcReversed   = "reversed"   // a declared arrow the edit turns round
)

// drawnArc is one arrow of a drawing.
type drawnArc struct {
	From, To string
	Kind     string
	Stated   bool   // named by the background knowledge itself
	Against  bool   // every plausible graph has it the other way round
	Tag      string // the claims on it, or the edit's word
}

// declaredArcs gives each declared arrow its one kind: compelled when the
// CPDAG directs it; settled when the CPDAG leaves it open but the CPDAG
// of the plausible members (background knowledge applied) directs it;
// reversible when that one leaves it open too (or when no member is
// plausible).
func declaredArcs(g *checks.GraphReport, claims []checks.ClaimReport) []drawnArc {
	open := pairSet(g.CPDAG.Undirected, true)
	stated := pairSet(g.Background, false)
	tags := claimLabels(claims)
	out := make([]drawnArc, len(g.Declared))
	for i, a := range g.Declared {
		d := drawnArc{From: a[0], To: a[1], Kind: arcCompelled, Stated: stated[a], Tag: tags[a]}
		switch p := g.PlausibleCPDAG; {
		case !open[a]:
		case p == nil || pairSet(p.Undirected, true)[a]:
			d.Kind = arcReversible
		case pairSet(p.Directed, false)[[2]string{a[1], a[0]}]:
			d.Kind, d.Against = arcReversible, true
		default:
			d.Kind = arcSettled
		}
		out[i] = d
	}
	return out
}

// cpdagArcs lists a CPDAG's arrows, compelled or settled as the whole
// class's CPDAG says, and its open edges.
func cpdagArcs(es, class *checks.EdgeSets) []drawnArc {
	compelled := pairSet(class.Directed, false)
	var out []drawnArc
	for _, a := range es.Directed {
		k := arcSettled
		if compelled[a] {
			k = arcCompelled
		}
		out = append(out, drawnArc{From: a[0], To: a[1], Kind: k})
	}
	for _, a := range es.Undirected {
		out = append(out, drawnArc{From: a[0], To: a[1], Kind: arcOpen})
	}
	return out
}

func pairSet(ps [][2]string, both bool) map[[2]string]bool {
	m := make(map[[2]string]bool, len(ps))
	for _, p := range ps {
		m[p] = true
		if both {
			m[[2]string{p[1], p[0]}] = true
		}
	}
	return m
}

// claimLabels names the direct-effect claims on each arc.
func claimLabels(claims []checks.ClaimReport) map[[2]string]string {
	ids := map[[2]string][]string{}
	for _, c := range claims {
		if c.Kind == checks.KindDirect {
			a := [2]string{c.From, c.To}
			ids[a] = append(ids[a], c.ID)
		}
	}
	out := make(map[[2]string]string, len(ids))
	for a, v := range ids {
		sort.Strings(v)
		out[a] = strings.Join(v, ", ")
	}
	return out
}

// layoutArcs are the arrows of every drawing that shares one layout, each
// pair once (in the direction first drawn), with every tag it carries.
func layoutArcs(drawings ...[]drawnArc) []LayoutArc {
	var out []LayoutArc
	at := map[[2]string]int{}
	for _, arcs := range drawings {
		for _, a := range arcs {
			k, ok := at[[2]string{a.From, a.To}]
			if !ok {
				k, ok = at[[2]string{a.To, a.From}]
			}
			if !ok {
				k = len(out)
				at[[2]string{a.From, a.To}] = k
				out = append(out, LayoutArc{From: a.From, To: a.To})
			}
			if a.Tag != "" && !slices.Contains(out[k].Tags, a.Tag) {
				out[k].Tags = append(out[k].Tags, a.Tag)
			}
		}
	}
	return out
}
