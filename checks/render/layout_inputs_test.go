package render

import (
	"fmt"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/checks"
)

// TestLatentsDrawn: a construct is one ellipse with its items listed as
// text beside it, never as boxes of their own, and its arrows meet the
// ellipse.
func TestLatentsDrawn(t *testing.T) {
	in := LayoutInput{Nodes: []string{"tutoring", "anxiety", "score"},
		Arcs:    []LayoutArc{{From: "tutoring", To: "anxiety", Tags: []string{"C1"}}, {From: "anxiety", To: "score"}},
		Latents: []Latent{{Name: "anxiety", Items: []string{"worry_1", "worry_2", "tension_3"}}}}
	l, err := LayOut(in)
	if err != nil {
		t.Fatal(err)
	}
	arcs := []drawnArc{{From: "tutoring", To: "anxiety", Kind: arcCompelled, Tag: "C1"},
		{From: "anxiety", To: "score", Kind: arcReversible}}
	svg := string(drawing{l: l, arcs: arcs, id: "lv"}.svg())
	d := checkDrawing(t, "constructs", svg)
	if len(d.nodes) != 3 {
		t.Fatalf("%d variables drawn, want 3 (items are not variables)", len(d.nodes))
	}
	for _, n := range d.nodes {
		if n.ellipse != (n.name == "anxiety") || (n.name == "anxiety") != (len(n.items) == 3) {
			t.Errorf("%s: ellipse %v, %d items", n.name, n.ellipse, len(n.items))
		}
	}
	if !strings.Contains(svg, "anxiety is a construct measured by worry_1, worry_2, tension_3</desc>") {
		t.Errorf("the drawing's words do not name the construct's items")
	}
	for _, it := range in.Latents[0].Items {
		if !strings.Contains(svg, `<text class="item"`) || !strings.Contains(svg, ">"+it+"</text>") ||
			strings.Contains(svg, `data-name="`+it+`"`) {
			t.Errorf("item %s is not listed beside its construct as text", it)
		}
	}
}

// TestTiersDrawn: tiers in their labelled rows, earliest first; an arrow
// within a tier is an arch above its row inside the tier's band; an arrow
// into an earlier tier runs upwards.
func TestTiersDrawn(t *testing.T) {
	in := LayoutInput{Nodes: []string{"y3", "x1", "m2", "x1b", "m2b"},
		Tiers:      [][]string{{"x1", "x1b"}, {"m2", "m2b"}, {"y3"}},
		TierLabels: []string{"wave 1", "wave 2"},
		Arcs: []LayoutArc{{From: "x1", To: "x1b", Tags: []string{"C1"}}, {From: "x1", To: "m2"},
			{From: "m2", To: "m2b"}, {From: "m2b", To: "y3"}, {From: "y3", To: "x1b"}, {From: "x1", To: "y3"}}}
	l, err := LayOut(in)
	if err != nil {
		t.Fatal(err)
	}
	checkTiers(t, "waves", l, in)
	if got := []string{l.Tiers[0].Label, l.Tiers[1].Label, l.Tiers[2].Label}; strings.Join(got, "|") !=
		"wave 1|wave 2|tier 3" {
		t.Errorf("tier labels %v", got)
	}
	for _, flat := range [][2]string{{"x1", "x1b"}, {"m2", "m2b"}} {
		r, _ := l.RouteOf(flat[0], flat[1])
		u, _ := l.At(flat[0])
		band := l.Tiers[u.Row].Band
		for _, p := range r.Sample(8) {
			if p.Y > u.Shape.Y+0.01 || !strictlyIn(p, band, 0) {
				t.Errorf("%s → %s leaves the band above its row at (%.1f, %.1f)", flat[0], flat[1], p.X, p.Y)
				break
			}
		}
	}
	if r, _ := l.RouteOf("y3", "x1b"); r.here().Y >= r.Start.Y {
		t.Errorf("y3 → x1b, into an earlier tier, does not run upwards")
	}
	var arcs []drawnArc
	for _, a := range in.Arcs {
		arcs = append(arcs, drawnArc{From: a.From, To: a.To, Kind: arcOpen, Tag: strings.Join(a.Tags, "")})
	}
	svg := string(drawing{l: l, arcs: arcs, id: "w"}.svg())
	checkDrawing(t, "waves", svg)
	if !strings.Contains(svg, "wave 1: x1, x1b; wave 2: m2, m2b; tier 3: y3</desc>") {
		t.Errorf("the drawing's words do not name the tiers")
	}
	if strings.Count(svg, `class="tierlabel"`) != 3 || !strings.Contains(svg, ">wave 2</text>") {
		t.Errorf("tier labels not drawn")
	}
}

// TestNearbyReusesLayout: the edited drawings place every variable where
// the declared drawing does.
func TestNearbyReusesLayout(t *testing.T) {
	for name, r := range reportsToDraw(t) {
		v, err := graphView(r)
		if err != nil || v == nil || len(v.Nearby) == 0 {
			continue
		}
		base := parseDrawing(t, string(v.Declared)).nodes
		for i, n := range v.Nearby {
			got := parseDrawing(t, string(n.SVG)).nodes
			for k := range base {
				if k >= len(got) || got[k].name != base[k].name || got[k].shape != base[k].shape {
					t.Errorf("%s nearby %d: %s not where the declared drawing has it", name, i+1, base[k].name)
				}
			}
		}
	}
}

// TestLayOutSmall: no variables, or variables without arrows, lay out
// inside a viewBox of their own.
func TestLayOutSmall(t *testing.T) {
	for _, in := range []LayoutInput{{}, {Nodes: []string{"lonely"}}, {Nodes: []string{"a", "b"}, Tiers: [][]string{{}, {"a", "b"}}}} {
		l, err := LayOut(in)
		if err != nil {
			t.Fatalf("%+v: %v", in, err)
		}
		checkDrawing(t, strings.Join(in.Nodes, ","), string(drawing{l: l, id: "s"}.svg()))
		if l.Width <= 0 || l.Height <= 0 {
			t.Errorf("%+v: a drawing %g × %g", in, l.Width, l.Height)
		}
	}
}

// TestDrawingDeterministic: the same report draws the same bytes.
func TestDrawingDeterministic(t *testing.T) {
	for name, r := range reportsToDraw(t) {
		a, err1 := graphView(r)
		b, err2 := graphView(r)
		if err1 != nil || err2 != nil || (a != nil && (a.Declared != b.Declared || a.Other != b.Other)) {
			t.Errorf("%s: two drawings of one report differ", name)
		}
	}
}

// TestTooLargeToDraw: a graph past MaxLayoutItems is not laid out; the
// page says why and lists its arrows in words instead.
func TestTooLargeToDraw(t *testing.T) {
	r := loadGolden(t, "coding-club")
	g := *r.Graph
	g.Nodes, g.Declared, g.NearbyGraphs, g.SearchBest = nil, nil, nil, nil
	g.CPDAG, g.PlausibleCPDAG, g.Exogenous, g.Background = checks.EdgeSets{}, nil, nil, nil
	for i := range 90 {
		g.Nodes = append(g.Nodes, fmt.Sprintf("v%02d", i))
		for j := range i {
			if (i+j)%3 == 0 {
				g.Declared = append(g.Declared, [2]string{fmt.Sprintf("v%02d", j), fmt.Sprintf("v%02d", i)})
			}
		}
	}
	r.Graph = &g
	v, err := graphView(r)
	if err != nil {
		t.Fatal(err)
	}
	if v.Declared != "" || !strings.Contains(v.Note, "90 variables and") || len(v.Arrows) != len(g.Declared) {
		t.Fatalf("a graph of %d arrows: drawn %v, note %q", len(g.Declared), v.Declared != "", v.Note)
	}
	var b strings.Builder
	if err := WritePage(&b, r, PageOptions{}); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(b.String(), "<li>v00 → v03, ") {
		t.Errorf("the page does not list the arrows in words")
	}
}
