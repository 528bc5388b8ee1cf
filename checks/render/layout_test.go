package render

import (
	"encoding/json"
	"math/rand/v2"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/checks"
)

var layoutCases = []struct {
	name  string
	nodes []string
	arcs  [][2]string
}{
	{"chain", []string{"a", "b", "c"}, [][2]string{{"a", "b"}, {"b", "c"}}},
	{"diamond", []string{"d", "c", "b", "a"}, [][2]string{{"a", "b"}, {"a", "c"}, {"b", "d"}, {"c", "d"}}},
	{"complete", []string{"w", "x", "y", "z"},
		[][2]string{{"w", "x"}, {"w", "y"}, {"w", "z"}, {"x", "y"}, {"x", "z"}, {"y", "z"}}},
	{"two roots", []string{"p", "q", "r", "s", "t"}, [][2]string{{"p", "r"}, {"q", "r"}, {"r", "s"}, {"q", "t"}}},
}

func plainInput(nodes []string, arcs [][2]string) LayoutInput {
	in := LayoutInput{Nodes: nodes}
	for _, a := range arcs {
		in.Arcs = append(in.Arcs, LayoutArc{From: a[0], To: a[1]})
	}
	return in
}

// TestLayOut: every variable is in one row, every arrow of an acyclic
// graph runs from a higher row to a lower one, its route from the tail's
// bottom to the head's top.
func TestLayOut(t *testing.T) {
	for _, tc := range layoutCases {
		l, err := LayOut(plainInput(tc.nodes, tc.arcs))
		if err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		for _, a := range tc.arcs {
			u, _ := l.At(a[0])
			v, _ := l.At(a[1])
			r, _ := l.RouteOf(a[0], a[1])
			end := r.here()
			if u.Row >= v.Row || r.Start.Y != u.Shape.Y+u.Shape.H || end.Y != v.Shape.Y {
				t.Errorf("%s: %s from row %d to row %d, route from y %g to y %g", tc.name, arrow(a), u.Row, v.Row,
					r.Start.Y, end.Y)
			}
		}
	}
}

// TestLayOutCycle: on a cycle, one arrow (the one closing it in input
// order) runs upwards and none stays within a row.
func TestLayOutCycle(t *testing.T) {
	arcs := [][2]string{{"a", "b"}, {"b", "c"}, {"c", "d"}, {"d", "a"}, {"b", "d"}}
	l, err := LayOut(plainInput([]string{"a", "b", "c", "d"}, arcs))
	if err != nil {
		t.Fatal(err)
	}
	up := 0
	for _, a := range arcs {
		r, _ := l.RouteOf(a[0], a[1])
		u, _ := l.At(a[0])
		v, _ := l.At(a[1])
		if u.Row == v.Row {
			t.Errorf("%s stays within a row", arrow(a))
		}
		if r.here().Y < r.Start.Y {
			up++
		}
	}
	if up != 1 {
		t.Errorf("%d arrows run upwards, want 1 (d → a)", up)
	}
}

// TestLayOutRejects: bad inputs are errors that name what is wrong.
func TestLayOutRejects(t *testing.T) {
	ab := []string{"a", "b"}
	for _, tc := range []struct {
		in   LayoutInput
		want string
	}{
		{plainInput([]string{"a"}, [][2]string{{"a", "b"}}), "a → b names a variable"},
		{plainInput(ab, [][2]string{{"a", "a"}}), "joins one to itself"},
		{plainInput(ab, [][2]string{{"a", "b"}, {"a", "b"}}), "listed twice"},
		{plainInput([]string{"a", "a"}, nil), "variable a listed twice"},
		{LayoutInput{Nodes: ab, Tiers: [][]string{{"a"}}}, "the tiers leave out b"},
		{LayoutInput{Nodes: ab, Tiers: [][]string{{"a"}, {"a", "b"}}}, "tier 2 names a"},
		{LayoutInput{Nodes: ab, Tiers: [][]string{{"a", "b", "c"}}}, "tier 1 names c"},
		{LayoutInput{Nodes: ab, Latents: []Latent{{Name: "c", Items: []string{"x"}}}}, "construct c"},
		{LayoutInput{Nodes: ab, Latents: []Latent{{Name: "a"}}}, "construct a"},
		{LayoutInput{Nodes: ab, Latents: []Latent{{Name: "a", Items: []string{"b"}}}}, "item b of construct a"},
	} {
		if _, err := LayOut(tc.in); err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%+v: error %v, want one saying %q", tc.in, err, tc.want)
		}
	}
}

// TestCrossingsOfTrees: an out-tree can always be drawn without
// crossings, and the ordering finds such a drawing for seeded random
// trees whose variables come in a shuffled order.
func TestCrossingsOfTrees(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 7))
	for n := 2; n <= 40; n++ {
		names := make([]string, n)
		for i := range names {
			names[i] = randomName(rng, i)
		}
		var arcs [][2]string
		for i := 1; i < n; i++ {
			arcs = append(arcs, [2]string{names[rng.IntN(i)], names[i]})
		}
		rng.Shuffle(n, func(i, j int) { names[i], names[j] = names[j], names[i] })
		p := properOf(t, plainInput(names, arcs))
		p.order()
		if c := p.crossings(); c != 0 {
			t.Errorf("a tree of %d variables drawn with %d crossings", n, c)
		}
	}
}

// TestCrossingsReduced: on seeded random DAGs the ordering never ends
// with more crossings than the order it started from.
func TestCrossingsReduced(t *testing.T) {
	rng := rand.New(rand.NewPCG(8, 8))
	for n := 4; n <= 40; n += 3 {
		in, _ := randomGraph(rng, n, 2.5, false, false, false)
		p := properOf(t, in)
		before := p.crossings()
		p.order()
		if after := p.crossings(); after > before {
			t.Errorf("%d variables: %d crossings after ordering, %d before", n, after, before)
		}
	}
}

// properOf builds the layered graph of an input without ordering it.
func properOf(t *testing.T, in LayoutInput) *proper {
	t.Helper()
	l, err := newLayout(in)
	if err != nil {
		t.Fatal(err)
	}
	arcs, err := l.arcIndices(in.Arcs)
	if err != nil {
		t.Fatal(err)
	}
	rank, rev := ranks(len(l.Nodes), arcs, nil)
	l.sizeNodes(arcs, rank, rev)
	p := buildProper(l, arcs, rank, rev, in.Arcs)
	return p
}

// TestInversions against counting every pair.
func TestInversions(t *testing.T) {
	rng := rand.New(rand.NewPCG(9, 9))
	for range 200 {
		n := 1 + rng.IntN(12)
		xs := make([]int, rng.IntN(30))
		for i := range xs {
			xs[i] = rng.IntN(n)
		}
		want := 0
		for i := range xs {
			for j := i + 1; j < len(xs); j++ {
				if xs[i] > xs[j] {
					want++
				}
			}
		}
		if got := inversions(xs, n); got != want {
			t.Fatalf("inversions(%v) = %d, want %d", xs, got, want)
		}
	}
}

func loadGolden(t *testing.T, demo string) *checks.Report {
	t.Helper()
	b, err := os.ReadFile(filepath.Join("..", "..", "testdata", "demo", demo, "report.golden.json"))
	if err != nil {
		t.Fatal(err)
	}
	var r checks.Report
	if err := json.Unmarshal(b, &r); err != nil {
		t.Fatal(err)
	}
	return &r
}

var nodeRe = regexp.MustCompile(`<g class="node[^"]*" data-name="([^"]+)"`)

// TestDeclaredDrawing draws each demo's declared graph: one variable per
// graph variable, every declared arrow once, pointing down (or level,
// within a tier's row), in exactly one kind: compelled when the CPDAG directs it, settled when only the
// background knowledge does (the plausible CPDAG directs it), reversible
// when the plausible CPDAG leaves it open. (The drawing used to mark an
// arrow both "reversible" and "fixed"; an arrow has one kind now.)
func TestDeclaredDrawing(t *testing.T) {
	for _, demo := range demos {
		r := loadGolden(t, demo)
		v, err := graphView(r)
		if err != nil {
			t.Fatal(err)
		}
		svg := string(v.Declared)
		count := map[string]int{}
		for _, m := range nodeRe.FindAllStringSubmatch(svg, -1) {
			count[m[1]]++
		}
		for _, n := range r.Graph.Nodes {
			if count[n] != 1 || len(count) != len(r.Graph.Nodes) {
				t.Errorf("%s: variable %s drawn %d times, %d variables drawn", demo, n, count[n], len(count))
			}
		}
		checkArcs(t, demo, r, parseDrawing(t, svg).arcs)
	}
}

func checkArcs(t *testing.T, demo string, r *checks.Report, arcs []svgArc) {
	if len(arcs) != len(r.Graph.Declared) {
		t.Errorf("%s: %d arcs drawn, want %d", demo, len(arcs), len(r.Graph.Declared))
	}
	open := pairSet(r.Graph.CPDAG.Undirected, true)
	plausOpen := pairSet(r.Graph.PlausibleCPDAG.Undirected, true)
	kinds := map[string]int{}
	tier := map[string]int{}
	for k, names := range r.Graph.Tiers {
		for _, v := range names {
			tier[v] = k + 1
		}
	}
	for _, a := range arcs {
		key := [2]string{a.from, a.to}
		y0, y1 := a.pts[0].Y, a.pts[len(a.pts)-1].Y
		if y0 > y1 || y0 == y1 && (tier[a.from] == 0 || tier[a.from] != tier[a.to]) {
			t.Errorf("%s: %s points up", demo, arrow(key))
		}
		want := arcCompelled
		if open[key] {
			want = arcSettled
			if plausOpen[key] {
				want = arcReversible
			}
		}
		if a.kind != want {
			t.Errorf("%s: %s drawn %q, want %q", demo, arrow(key), a.kind, want)
		}
		kinds[a.kind]++
	}
	t.Logf("%s: %v", demo, kinds)
}
