package render

import (
	"fmt"
	"html/template"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/checks"
)

var demos = []string{"tutoring-anxiety", "coding-club", "sleep-attention", "mentoring-waves"}

var calibrations = []string{"calibration/bare-claims", "calibration/clean-randomized", "calibration/nearby-headline"}

// reportsToDraw are the demos' golden reports and the calibration
// packages screened afresh.
func reportsToDraw(t *testing.T) map[string]*checks.Report {
	out := map[string]*checks.Report{}
	for _, d := range demos {
		out[d] = loadGolden(t, d)
	}
	for _, c := range calibrations {
		out[c] = runPackage(t, c)
	}
	return out
}

// TestDrawingGeometry_Packages: every drawing of every demo and
// calibration package (declared, CPDAG, each nearby graph) keeps the
// rules of checkDrawing.
func TestDrawingGeometry_Packages(t *testing.T) {
	for name, r := range reportsToDraw(t) {
		v, err := graphView(r)
		if err != nil {
			t.Fatal(err)
		}
		if v == nil || v.Declared == "" {
			continue
		}
		d := checkDrawing(t, name+" declared", string(v.Declared))
		if want := tagCount(declaredArcs(r.Graph, r.Claims)); len(d.tags) != want {
			t.Errorf("%s: %d tags drawn, want %d", name, len(d.tags), want)
		}
		checkDrawing(t, name+" CPDAG", string(v.Other))
		for i, n := range v.Nearby {
			checkDrawing(t, fmt.Sprintf("%s nearby %d", name, i+1), string(n.SVG))
		}
	}
}

// randomName is a variable name of 2 to 18 letters and underscores.
func randomName(rng *rand.Rand, i int) string {
	var b strings.Builder
	for range 1 + rng.IntN(16) {
		b.WriteByte("abcdefghijklmnopqrstuvwxyz_"[rng.IntN(27)])
	}
	return fmt.Sprintf("%s%d", b.String(), i)
}

var randomTags = []string{"", "", "C1", "C12, C3", "removed (C2)", "added", "reversed (H1, H2)", "N4"}

var allKinds = []string{arcCompelled, arcSettled, arcReversible, arcOpen, arcKept, arcAdded, arcRemoved, arcReversed}

// randomGraph is a seeded random graph of n variables: a DAG in a random
// order with about density arrows a variable, a few arrows closing cycles
// when cyclic; tiers cut the order into rows (with some arrows then into
// earlier tiers), and latents make some variables constructs with items.
func randomGraph(rng *rand.Rand, n int, density float64, tiers, latents, cyclic bool) (LayoutInput, []drawnArc) {
	in := LayoutInput{}
	for i := range n {
		in.Nodes = append(in.Nodes, randomName(rng, i))
	}
	order := rng.Perm(n)
	var arcs []drawnArc
	for i := range n {
		for j := i + 1; j < n; j++ {
			if rng.Float64() < density/float64(n) || (cyclic && rng.Float64() < 0.3/float64(n)) {
				u, v := order[i], order[j]
				if (cyclic && rng.IntN(4) == 0) || (tiers && rng.IntN(8) == 0) {
					u, v = v, u
				}
				arcs = append(arcs, drawnArc{From: in.Nodes[u], To: in.Nodes[v],
					Kind: allKinds[rng.IntN(len(allKinds))], Tag: randomTags[rng.IntN(len(randomTags))]})
			}
		}
	}
	if tiers {
		in.Tiers = cutTiers(rng, in.Nodes, order)
		if rng.IntN(2) == 0 {
			in.TierLabels = []string{"before", "wave 2", "after the exposure"}
		}
	}
	if latents {
		in.Latents = randomLatents(rng, in.Nodes)
	}
	in.Arcs = layoutArcs(arcs)
	return in, arcs
}

// cutTiers cuts the order into 1 to 6 tiers of consecutive variables.
func cutTiers(rng *rand.Rand, names []string, order []int) [][]string {
	k := 1 + rng.IntN(min(6, len(names)))
	tiers := make([][]string, k)
	for i, v := range order {
		t := i * k / len(order)
		tiers[t] = append(tiers[t], names[v])
	}
	return tiers
}

func randomLatents(rng *rand.Rand, names []string) []Latent {
	var out []Latent
	for _, n := range names {
		if rng.IntN(4) == 0 {
			lv := Latent{Name: n}
			for k := range 2 + rng.IntN(6) {
				lv.Items = append(lv.Items, fmt.Sprintf("%s_item%d", n[:min(len(n), 6)], k+1))
			}
			out = append(out, lv)
		}
	}
	return out
}

// TestDrawingGeometry_Random: seeded random graphs of 2 to 40 variables,
// sparse and dense, with and without tiers, constructs and cycles, every
// arrow of a random kind and tag, keep the rules of checkDrawing.
func TestDrawingGeometry_Random(t *testing.T) {
	samples := newSamples(t, "random-drawings.html")
	defer samples.write()
	rng := rand.New(rand.NewPCG(22, 1))
	for n := 2; n <= 40; n++ {
		for v := range 8 {
			density := []float64{1.2, 2.5, 4}[rng.IntN(3)]
			in, arcs := randomGraph(rng, n, density, v&1 != 0, v&2 != 0, v&4 != 0 && v&1 == 0)
			l, err := LayOut(in)
			if err != nil {
				t.Fatalf("n %d variant %d: %v", n, v, err)
			}
			exo := map[string]bool{in.Nodes[0]: true}
			svg := drawing{l: l, arcs: arcs, exo: exo, id: "r", title: "r", description: "r"}.svg()
			name := fmt.Sprintf("n %d variant %d (%d arrows)", n, v, len(arcs))
			if d := checkDrawing(t, name, string(svg)); len(d.tags) != tagCount(arcs) {
				t.Errorf("%s: %d tags drawn, want %d", name, len(d.tags), tagCount(arcs))
			}
			samples.add(name, svg)
			if len(in.Tiers) > 0 {
				checkTiers(t, name, l, in)
			}
		}
	}
}

// samples collects drawings into a page for a person to look at, written
// to the folder PATHVET_DRAWINGS names (nothing without it).
type samplePage struct {
	t    *testing.T
	file string
	b    strings.Builder
}

func newSamples(t *testing.T, file string) *samplePage { return &samplePage{t: t, file: file} }

func (s *samplePage) add(name string, svg template.HTML) {
	fmt.Fprintf(&s.b, "<figure><figcaption>%s</figcaption>%s</figure>\n", esc(name), svg)
}

func (s *samplePage) write() {
	dir := os.Getenv("PATHVET_DRAWINGS")
	if dir == "" {
		return
	}
	page := "<!DOCTYPE html><html><head><meta charset=utf-8><style>" + styleCSS +
		"figure{border:1px solid #ccc;overflow-x:auto;padding:.5rem}</style></head><body><main>" + s.b.String() +
		"</main></body></html>"
	if err := os.WriteFile(filepath.Join(dir, s.file), []byte(page), 0o644); err != nil {
		s.t.Error(err)
	}
}

// tagCount is how many of the arcs carry a tag.
func tagCount(arcs []drawnArc) int {
	n := 0
	for _, a := range arcs {
		if a.Tag != "" {
			n++
		}
	}
	return n
}
