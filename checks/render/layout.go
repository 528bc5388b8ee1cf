package render

import (
	"fmt"
	"sort"
)

// Sizes of the graph drawing, in SVG user units.
const (
	nodeH    = 30.0
	nodeGapX = 22.0
	layerGap = 64.0
	margin   = 16.0
	charW    = 7.4 // average advance of the 13-unit label font
)

// Placed is one node of a layout.
type Placed struct {
	Name  string
	Layer int
	X, Y  float64 // the top-left corner
	W     float64
}

// Layout is a layered drawing of a directed graph: causes above effects.
type Layout struct {
	Nodes  []Placed // in the order of the input nodes
	Layers [][]int  // node indices, left to right, per layer
	Width  float64
	Height float64
	index  map[string]int
}

// LayOut places nodes in layers by the longest directed path into each
// (longest-path layering) and orders every layer by the barycentre of its
// parents' positions, the layer-by-layer sweep of Sugiyama, Tagawa & Toda
// (1981, IEEE Trans. SMC 11(2):109–125). An arc naming an unknown node is
// an error; on a cycle the layers stop growing after len(nodes) rounds.
func LayOut(nodes []string, arcs [][2]string) (*Layout, error) {
	l := &Layout{index: make(map[string]int, len(nodes))}
	for i, n := range nodes {
		l.index[n] = i
		l.Nodes = append(l.Nodes, Placed{Name: n, W: nodeWidth(n)})
	}
	idx := make([][2]int, len(arcs))
	for k, a := range arcs {
		u, ok1 := l.index[a[0]]
		v, ok2 := l.index[a[1]]
		if !ok1 || !ok2 {
			return nil, fmt.Errorf("render: arc %s names a variable not among the nodes", arrow(a))
		}
		idx[k] = [2]int{u, v}
	}
	l.layer(idx)
	l.order(idx)
	l.place()
	return l, nil
}

func nodeWidth(name string) float64 { return float64(len([]rune(name)))*charW + 20 }

// layer gives each node the length of the longest path into it.
func (l *Layout) layer(arcs [][2]int) {
	n := len(l.Nodes)
	for round := 0; round < n; round++ {
		changed := false
		for _, a := range arcs {
			if d := l.Nodes[a[0]].Layer + 1; d > l.Nodes[a[1]].Layer && d < n {
				l.Nodes[a[1]].Layer, changed = d, true
			}
		}
		if !changed {
			break
		}
	}
	for i, p := range l.Nodes {
		for len(l.Layers) <= p.Layer {
			l.Layers = append(l.Layers, nil)
		}
		l.Layers[p.Layer] = append(l.Layers[p.Layer], i)
	}
}

// order sorts each layer below the first by the mean relative position of
// its parents, two sweeps down.
func (l *Layout) order(arcs [][2]int) {
	pos := make([]float64, len(l.Nodes))
	for sweep := 0; sweep < 2; sweep++ {
		for _, layer := range l.Layers {
			for k, v := range layer {
				pos[v] = (float64(k) + 0.5) / float64(len(layer))
			}
		}
		for _, layer := range l.Layers[1:] {
			bc := barycentres(layer, arcs, pos)
			sort.SliceStable(layer, func(i, j int) bool { return bc[layer[i]] < bc[layer[j]] })
		}
	}
}

func barycentres(layer []int, arcs [][2]int, pos []float64) map[int]float64 {
	sum, cnt := map[int]float64{}, map[int]float64{}
	for _, a := range arcs {
		sum[a[1]] += pos[a[0]]
		cnt[a[1]]++
	}
	bc := make(map[int]float64, len(layer))
	for _, v := range layer {
		bc[v] = pos[v]
		if cnt[v] > 0 {
			bc[v] = sum[v] / cnt[v]
		}
	}
	return bc
}

// place sets coordinates: each layer centred on the widest.
func (l *Layout) place() {
	widths := make([]float64, len(l.Layers))
	for i, layer := range l.Layers {
		for _, v := range layer {
			widths[i] += l.Nodes[v].W + nodeGapX
		}
		widths[i] -= nodeGapX
		l.Width = max(l.Width, widths[i])
	}
	for i, layer := range l.Layers {
		x := margin + (l.Width-widths[i])/2
		for _, v := range layer {
			l.Nodes[v].X, l.Nodes[v].Y = x, margin+float64(i)*(nodeH+layerGap)
			x += l.Nodes[v].W + nodeGapX
		}
	}
	l.Width += 2 * margin
	l.Height = 2 * margin
	if len(l.Layers) > 0 {
		l.Height += float64(len(l.Layers))*(nodeH+layerGap) - layerGap
	}
}

// At returns the placed node of a name.
func (l *Layout) At(name string) (Placed, bool) {
	i, ok := l.index[name]
	if !ok {
		return Placed{}, false
	}
	return l.Nodes[i], true
}
