package render

import (
	"encoding/json"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
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

// TestLayOut: every node is in exactly one layer, and every arc points
// from an upper layer to a lower one, drawn with its tail above its head.
func TestLayOut(t *testing.T) {
	for _, tc := range layoutCases {
		l, err := LayOut(tc.nodes, tc.arcs)
		if err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		seen := map[int]int{}
		for _, layer := range l.Layers {
			for _, v := range layer {
				seen[v]++
			}
		}
		for i, n := range tc.nodes {
			if seen[i] != 1 {
				t.Errorf("%s: node %s is in %d layers", tc.name, n, seen[i])
			}
		}
		for _, a := range tc.arcs {
			u, _ := l.At(a[0])
			v, _ := l.At(a[1])
			if u.Layer >= v.Layer || u.Y+nodeH > v.Y {
				t.Errorf(
					"%s: %s drawn from layer %d (y %g) to layer %d (y %g)",
					tc.name,
					arrow(a),
					u.Layer,
					u.Y,
					v.Layer,
					v.Y,
				)
			}
		}
	}
	if _, err := LayOut([]string{"a"}, [][2]string{{"a", "b"}}); err == nil {
		t.Error("an arc to an unknown node was accepted")
	}
}

func TestLayOutNoOverlap(t *testing.T) {
	for _, tc := range layoutCases {
		l, _ := LayOut(tc.nodes, tc.arcs)
		for _, layer := range l.Layers {
			for k := 1; k < len(layer); k++ {
				a, b := l.Nodes[layer[k-1]], l.Nodes[layer[k]]
				if a.X+a.W > b.X {
					t.Errorf("%s: %s and %s overlap", tc.name, a.Name, b.Name)
				}
			}
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

var (
	nodeRe = regexp.MustCompile(`<g class="node[^"]*" data-name="([^"]+)"`)
	arcRe  = regexp.MustCompile(
		`<path class="arc ([a-z ]+)" data-from="([^"]+)" data-to="([^"]+)" data-y1="([0-9.]+)" data-y2="([0-9.]+)"`,
	)
)

// TestDeclaredDrawing draws each demo's declared graph: one node per graph
// variable, every declared arrow once and pointing down, an arrow drawn
// reversible exactly when the CPDAG leaves that edge undirected, fixed
// exactly when background knowledge fixes it.
func TestDeclaredDrawing(t *testing.T) {
	for _, demo := range []string{"tutoring-anxiety", "coding-club", "sleep-attention"} {
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
		if len(count) != len(r.Graph.Nodes) {
			t.Errorf("%s: %d nodes drawn, want %d", demo, len(count), len(r.Graph.Nodes))
		}
		for _, n := range r.Graph.Nodes {
			if count[n] != 1 {
				t.Errorf("%s: node %s drawn %d times", demo, n, count[n])
			}
		}
		checkArcs(t, demo, r, arcRe.FindAllStringSubmatch(svg, -1))
	}
}

func checkArcs(t *testing.T, demo string, r *checks.Report, arcs [][]string) {
	if len(arcs) != len(r.Graph.Declared) {
		t.Errorf("%s: %d arcs drawn, want %d", demo, len(arcs), len(r.Graph.Declared))
	}
	open := map[string]bool{}
	for _, e := range r.Graph.CPDAG.Undirected {
		open[e[0]+">"+e[1]], open[e[1]+">"+e[0]] = true, true
	}
	fixed := map[string]bool{}
	for _, e := range r.Graph.Background {
		fixed[e[0]+">"+e[1]] = true
	}
	kinds := map[bool]int{}
	for _, m := range arcs {
		class, key := m[1], m[2]+">"+m[3]
		y1, _ := strconv.ParseFloat(m[4], 64)
		y2, _ := strconv.ParseFloat(m[5], 64)
		if y1 >= y2 {
			t.Errorf("%s: %s points up (y %g to %g)", demo, key, y1, y2)
		}
		rev := strings.Contains(class, "reversible")
		kinds[rev]++
		if rev != open[key] || strings.Contains(class, "shared") == open[key] {
			t.Errorf("%s: %s drawn %q, reversible in the class %v", demo, key, class, open[key])
		}
		if strings.Contains(class, "fixed") != fixed[key] {
			t.Errorf("%s: %s drawn %q, fixed %v", demo, key, class, fixed[key])
		}
	}
	t.Logf("%s: %d reversible, %d shared", demo, kinds[true], kinds[false])
}
