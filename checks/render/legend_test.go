package render

import (
	"regexp"
	"slices"
	"strings"
	"testing"
)

var (
	arcKindRe = regexp.MustCompile(`<path class="arc ([a-z]+)" data-from="[^"]+"`)
	keyKindRe = regexp.MustCompile(`data-kind="([a-z]+)"`)
)

// drawnKinds are the kinds of arrow, variable, tier and tag the SVGs
// show, sorted.
func drawnKinds(svgs ...string) []string {
	set := map[string]bool{}
	for _, svg := range svgs {
		for _, m := range arcKindRe.FindAllStringSubmatch(svg, -1) {
			set[m[1]] = true
		}
		set["exogenous"] = set["exogenous"] || strings.Contains(svg, `class="node exogenous`)
		set["latent"] = set["latent"] || strings.Contains(svg, ` latent" data-name=`)
		set["tier"] = set["tier"] || strings.Contains(svg, `class="tierband"`)
		set["tag"] = set["tag"] || strings.Contains(svg, `<g class="tag `)
	}
	var out []string
	for k, v := range set {
		if v {
			out = append(out, k)
		}
	}
	slices.Sort(out)
	return out
}

func legendKinds(t *testing.T, es []LegendEntry) []string {
	var out []string
	for _, e := range es {
		m := keyKindRe.FindStringSubmatch(string(e.Key))
		if m == nil || m[1] != e.Kind || e.Term == "" || e.Meaning == "" {
			t.Errorf("legend entry %+v: its sample, words or meaning missing", e)
		}
		out = append(out, e.Kind)
	}
	slices.Sort(out)
	return out
}

// TestLegendMatchesDrawing: for every demo and calibration package, the
// legend under the declared graph and the CPDAG lists exactly the kinds
// those two drawings show, and the legend under the edited drawings
// exactly theirs: nothing drawn without an entry, no entry for anything
// not drawn.
func TestLegendMatchesDrawing(t *testing.T) {
	for name, r := range reportsToDraw(t) {
		v, err := graphView(r)
		if err != nil || v == nil || v.Declared == "" {
			continue
		}
		drawn, listed := drawnKinds(string(v.Declared), string(v.Other)), legendKinds(t, v.Legend)
		if !slices.Equal(drawn, listed) {
			t.Errorf("%s: the drawings show %v, the legend lists %v", name, drawn, listed)
		}
		var nearby []string
		for _, n := range v.Nearby {
			nearby = append(nearby, string(n.SVG))
		}
		if len(nearby) == 0 {
			if len(v.NearbyLegend) > 0 {
				t.Errorf("%s: a legend of edits without edited drawings", name)
			}
			continue
		}
		if drawn, listed := drawnKinds(nearby...), legendKinds(t, v.NearbyLegend); !slices.Equal(drawn, listed) {
			t.Errorf("%s: the edited drawings show %v, their legend lists %v", name, drawn, listed)
		}
	}
}

// TestLegendOfSyntheticDrawing: constructs, tiers and every arrow kind
// get their entries, and the reversible entry says so when no equivalent
// graph respects the background knowledge.
func TestLegendOfSyntheticDrawing(t *testing.T) {
	in := LayoutInput{Nodes: []string{"a", "b", "c"}, Tiers: [][]string{{"a", "b"}, {"c"}},
		Latents: []Latent{{Name: "c", Items: []string{"c1", "c2"}}}}
	var arcs []drawnArc
	for i, k := range []string{arcCompelled, arcReversible, arcOpen} {
		a := [][2]string{{"a", "b"}, {"a", "c"}, {"b", "c"}}[i]
		arcs = append(arcs, drawnArc{From: a[0], To: a[1], Kind: k})
	}
	in.Arcs = layoutArcs(arcs)
	l, err := LayOut(in)
	if err != nil {
		t.Fatal(err)
	}
	svg := string(drawing{l: l, arcs: arcs, exo: map[string]bool{"a": true}, id: "s"}.svg())
	es := legend(l, map[string]bool{"a": true}, true, false, arcs)
	if drawn, listed := drawnKinds(svg), legendKinds(t, es); !slices.Equal(drawn, listed) {
		t.Errorf("drawn %v, listed %v", drawn, listed)
	}
	for _, e := range es {
		if e.Kind == arcReversible && e.Meaning != noPlausibleMeaning {
			t.Errorf("reversible entry %q without a plausible graph", e.Meaning)
		}
	}
}
