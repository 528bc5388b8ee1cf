package render

import "slices"

// Room around the things in a row, in user units.
const (
	sepNodes   = 26.0 // between two variables
	sepNodeArc = 14.0 // between a variable and an arrow passing it
	sepArcs    = 12.0 // between two arrows
	tagGap     = 8.0  // from an arrow to its tag's box (a removal's cross sits in it)
	tagPadX    = 6.0  // inside a tag, each side of its words
	tagH       = 18.0 // a tag's box
)

// item is one thing of a row: a variable, or a virtual node where an
// arrow crosses the row (carrying the arrow's tag in the tag row chosen
// for it).
type item struct {
	node, arc int // the variable, or −1; the arc of a virtual node, or −1
	rank      int // doubled: variables on even ranks, tags on odd ones
	lw, rw    float64
	x         float64
	tag       float64 // the tag box's width; 0 without one
}

type link struct {
	to int
	w  float64
}

// proper is the layered graph whose every link joins neighbouring ranks.
type proper struct {
	l        *Layout
	items    []item
	ranks    [][]int  // items of each rank, left to right
	up, down [][]link // the links of each item to the ranks above and below
	chain    [][]int  // per arc: its items from the upper end to the lower; nil when flat
	flat     []int    // arcs within one row (tiers only)
	rev      []bool
	arcs     [][2]int  // each arc's tail and head
	tagW     []float64 // each arc's tag width, 0 without one
	nodeItem []int     // each variable's item
}

// Link weights of the x placement (Gansner et al. 1993, §4.2: 1, 2 and 8
// for links between two variables, a variable and a virtual node, and two
// virtual nodes), so that long arrows run straight.
func linkWeight(a, b item) float64 {
	switch {
	case a.node >= 0 && b.node >= 0:
		return 1
	case a.node >= 0 || b.node >= 0:
		return 2
	}
	return 8
}

func buildProper(l *Layout, arcs [][2]int, rank []int, rev []bool, in []LayoutArc) *proper {
	p := &proper{l: l, rev: rev, chain: make([][]int, len(arcs)), arcs: arcs, tagW: make([]float64, len(arcs)),
		nodeItem: make([]int, len(l.Nodes))}
	if len(l.Tiers) == 0 {
		rank = compactRanks(rank)
	}
	rows := 0
	for _, r := range rank {
		rows = max(rows, r+1)
	}
	rows = max(rows, len(l.Tiers), 1)
	l.Rows = rows
	p.ranks = make([][]int, max(2*rows-1, 1))
	for i, r := range rank {
		n := &l.Nodes[i]
		p.nodeItem[i] = p.add(item{node: i, arc: -1, rank: 2 * r, lw: n.leftExtent(), rw: n.rightExtent()})
	}
	for k, a := range arcs {
		p.tagW[k] = tagWidth(in[k].Tags)
		p.addArc(k, a, rank)
	}
	return p
}

// compactRanks renumbers the ranks 0, 1, … without gaps.
func compactRanks(rank []int) []int {
	used := slices.Clone(rank)
	slices.Sort(used)
	used = slices.Compact(used)
	out := make([]int, len(rank))
	for i, r := range rank {
		out[i], _ = slices.BinarySearch(used, r)
	}
	return out
}

func (p *proper) add(it item) int {
	id := len(p.items)
	p.items = append(p.items, it)
	p.up, p.down = append(p.up, nil), append(p.down, nil)
	p.ranks[it.rank] = append(p.ranks[it.rank], id)
	return id
}

// addArc cuts an arc into a chain from its upper end to its lower one,
// one virtual node a rank, the tag on the middle tag row.
func (p *proper) addArc(k int, a [2]int, rank []int) {
	u, v := a[0], a[1]
	if p.rev[k] {
		u, v = v, u
	}
	if rank[u] == rank[v] {
		p.flat = append(p.flat, k)
		return
	}
	top, bottom := 2*rank[u], 2*rank[v]
	tagRank := top + 1 + 2*(((bottom-top)/2-1)/2)
	w := p.tagW[k]
	chain := []int{u}
	for r := top + 1; r < bottom; r++ {
		it := item{node: -1, arc: k, rank: r}
		if r == tagRank && w > 0 {
			it.tag, it.lw, it.rw = w, tagGap/2+1, tagGap+w
		}
		chain = append(chain, p.add(it))
	}
	chain = append(chain, v)
	for i := 1; i < len(chain); i++ {
		a, b := chain[i-1], chain[i]
		w := linkWeight(p.items[a], p.items[b])
		p.down[a] = append(p.down[a], link{b, w})
		p.up[b] = append(p.up[b], link{a, w})
	}
	p.chain[k] = chain
}

// tagWidth is the width of the box that holds the widest of the tags.
func tagWidth(tags []string) float64 {
	w := 0.0
	for _, t := range tags {
		if t != "" {
			w = max(w, textWidth(t, tagSize, true)+2*tagPadX)
		}
	}
	return w
}

// sep is the least distance between the right extent of a and the left
// extent of b, neighbours in a row.
func sep(a, b item) float64 {
	switch {
	case a.node >= 0 && b.node >= 0:
		return sepNodes
	case a.node >= 0 || b.node >= 0:
		return sepNodeArc
	}
	return sepArcs
}

// nodeX is each variable's x (its shape's centre).
func (p *proper) nodeX() []float64 {
	out := make([]float64, len(p.nodeItem))
	for n, id := range p.nodeItem {
		out[n] = p.items[id].x
	}
	return out
}

func (p *proper) rankOf(n int) int { return p.items[p.nodeItem[n]].rank }
