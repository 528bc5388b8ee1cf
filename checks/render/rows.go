package render

import "math"

// Vertical room, in user units.
const (
	margin     = 12.0 // around the drawing
	minGap     = 20.0 // between two ranks, at the least
	maxGap     = 56.0
	gapPerDx   = 0.3  // a gap grows with how far sideways its arrows run
	bandPad    = 6.0  // a tier's band reaches this far above and below its row
	tierLabelX = 14.0 // room right of a tier's label
)

// rowGeom is the vertical extent of every rank: top (where arrows enter
// it), the variables' row below any band of arrows within a tier, and
// the bottom.
type rowGeom struct {
	top, nodeTop, bottom []float64
	arch                 []float64 // the height of each rank's band of arrows within the row
}

func (g *rowGeom) height(r int) float64 { return g.bottom[r] - g.top[r] }

// finish sets the rows' heights and places, the variables, the routes,
// the tiers' bands and the drawing's size.
func (l *Layout) finish(p *proper, in LayoutInput) {
	flats := p.flatLevels()
	g := p.rows(flats)
	for _, id := range p.itemsOfNodes() {
		it := p.items[id]
		l.Nodes[it.node].Row = it.rank / 2
		l.Nodes[it.node].place(it.x, g.nodeTop[it.rank], g.bottom[it.rank]-g.nodeTop[it.rank])
	}
	bottoms, tops := p.ports(flats)
	l.Routes = make([]Route, len(p.chain))
	for k, chain := range p.chain {
		r := Route{From: in.Arcs[k].From, To: in.Arcs[k].To}
		if chain != nil {
			r = p.route(k, chain, g, bottoms[k], tops[k])
		}
		l.Routes[k] = r
	}
	p.routeFlats(flats, g, tops)
	l.frame(g)
}

func (p *proper) itemsOfNodes() []int {
	var out []int
	for id, it := range p.items {
		if it.node >= 0 {
			out = append(out, id)
		}
	}
	return out
}

// rows stacks the ranks: a variables' rank as high as its tallest
// footprint plus its band of arrows within the row, a tag rank as high
// as a tag when it holds one (else nothing), and gaps that grow with how
// far sideways the arrows between two ranks run.
func (p *proper) rows(flats []flatRow) *rowGeom {
	n := len(p.ranks)
	g := &rowGeom{top: make([]float64, n), nodeTop: make([]float64, n), bottom: make([]float64, n),
		arch: make([]float64, n)}
	y := margin
	for r := range n {
		h := 0.0
		for _, id := range p.ranks[r] {
			it := p.items[id]
			if it.node >= 0 {
				h = max(h, p.l.Nodes[it.node].Box.H)
			} else if it.tag > 0 {
				h = max(h, tagH)
			}
		}
		if r%2 == 0 {
			h = max(h, boxH)
			g.arch[r] = flats[r/2].height
		}
		g.top[r], g.nodeTop[r] = y, y+g.arch[r]
		g.bottom[r] = g.nodeTop[r] + h
		y = g.bottom[r] + p.gapBelow(r)
	}
	return g
}

// gapBelow is the gap between rank r and the next.
func (p *proper) gapBelow(r int) float64 {
	if r+1 >= len(p.ranks) {
		return 0
	}
	dx := 0.0
	for _, id := range p.ranks[r] {
		for _, e := range p.down[id] {
			dx = max(dx, math.Abs(p.items[id].x-p.items[e.to].x))
		}
	}
	return min(max(gapPerDx*dx, minGap), maxGap)
}

// ports spreads the arrows along each variable's bottom (in the order of
// where they go) and top (in the order of where they come from, arrows
// within the row among them): the x of each arc's upper and lower end.
func (p *proper) ports(flats []flatRow) (bottoms, tops []float64) {
	bottoms, tops = make([]float64, len(p.chain)), make([]float64, len(p.chain))
	for _, id := range p.itemsOfNodes() {
		it := p.items[id]
		n := &p.l.Nodes[it.node]
		out := sortedEnds(p, p.down[id])
		for k, x := range n.ports(len(out)) {
			bottoms[out[k].arc] = x
		}
		in := append(sortedEnds(p, p.up[id]), flats[it.rank/2].endsAt(p, it.node)...)
		sortEnds(in)
		for k, x := range n.ports(len(in)) {
			if in[k].flatEnd >= 0 {
				flats[it.rank/2].setPort(in[k].arc, in[k].flatEnd, x)
			} else {
				tops[in[k].arc] = x
			}
		}
	}
	return bottoms, tops
}

// frame moves the drawing to its margins (and right of the tiers'
// labels), and sets its size and the tiers' bands.
func (l *Layout) frame(g *rowGeom) {
	left := 0.0
	for _, t := range l.Tiers {
		left = max(left, textWidth(t.Label, tierSize, true)+tierLabelX)
	}
	lo, hi := l.extent()
	dx := margin + left - lo
	for i := range l.Nodes {
		l.Nodes[i].shift(dx)
	}
	for k := range l.Routes {
		l.Routes[k].shift(dx)
	}
	l.Width = math.Ceil(hi + dx + margin)
	l.Height = math.Ceil(g.bottom[len(g.bottom)-1] + margin)
	for t := range l.Tiers {
		r := 2 * t
		band := Box{X: margin / 2, Y: g.top[r] - bandPad, W: l.Width - margin, H: g.height(r) + 2*bandPad}
		mid := g.nodeTop[r] + (g.bottom[r]-g.nodeTop[r])/2
		l.Tiers[t].Band = band
		l.Tiers[t].LabelAt = Pt{margin, mid + tierSize*0.35}
		l.Tiers[t].LabelBox = Box{X: margin, Y: mid - tierSize*0.75, W: textWidth(l.Tiers[t].Label, tierSize, true),
			H: tierSize * 1.5}
	}
}

// extent is the least and greatest x of everything drawn.
func (l *Layout) extent() (lo, hi float64) {
	lo, hi = math.Inf(1), math.Inf(-1)
	grow := func(a, b float64) { lo, hi = min(lo, a), max(hi, b) }
	for _, n := range l.Nodes {
		grow(n.Box.X, n.Box.X+n.Box.W)
	}
	for _, r := range l.Routes {
		for _, q := range r.points() {
			grow(q.X, q.X)
		}
		if r.Tag != nil {
			grow(min(r.Pole.X-tagGap/2-1, r.Tag.X), max(r.Pole.X+tagGap/2+1, r.Tag.X+r.Tag.W))
		}
	}
	if math.IsInf(lo, 1) {
		return 0, 0
	}
	return lo, hi
}
