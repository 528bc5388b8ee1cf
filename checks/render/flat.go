package render

import (
	"math"
	"sort"
)

// Room of the band above a row that holds the arrows within it (tiers).
const (
	flatBase    = 8.0  // from the row's top to the lowest level
	flatStrip   = 12.0 // a level without a tag
	flatCorner  = 5.0  // the radius of an arch's corners
	flatPad     = 16.0 // arches closer than this go on different levels
	obstaclePad = 6.0  // a tag keeps this far from a vertical line
)

// flatArc is one arrow between two variables of the same row, drawn as an
// arch above the row on a level of its own.
type flatArc struct {
	arc, u, v int
	level     int
	port      [2]float64
	tagW      float64
}

// flatRow is the band of arches above one row.
type flatRow struct {
	arcs   []flatArc
	strips []float64 // the height of each level
	height float64
}

// flatLevels stacks each row's arches: the shortest lowest, each on the
// lowest level where it overlaps no other (interval colouring).
func (p *proper) flatLevels() []flatRow {
	out := make([]flatRow, p.l.Rows)
	xOf := p.nodeX()
	for _, k := range p.flat {
		a := p.arcs[k]
		row := p.rankOf(a[0]) / 2
		out[row].arcs = append(out[row].arcs, flatArc{arc: k, u: a[0], v: a[1], tagW: p.tagW[k]})
	}
	for i := range out {
		out[i].stack(xOf)
	}
	return out
}

func (f *flatRow) stack(xOf []float64) {
	span := func(a flatArc) (float64, float64) {
		return min(xOf[a.u], xOf[a.v]), max(xOf[a.u], xOf[a.v])
	}
	sort.SliceStable(f.arcs, func(i, j int) bool {
		li, hi := span(f.arcs[i])
		lj, hj := span(f.arcs[j])
		return hi-li < hj-lj
	})
	for i := range f.arcs {
		lo, hi := span(f.arcs[i])
		level := 0
		for clash := true; clash; {
			clash = false
			for _, b := range f.arcs[:i] {
				blo, bhi := span(b)
				if b.level == level && lo < bhi+flatPad && blo < hi+flatPad {
					clash, level = true, level+1
					break
				}
			}
		}
		f.arcs[i].level = level
		for len(f.strips) <= level {
			f.strips = append(f.strips, flatStrip)
		}
		if f.arcs[i].tagW > 0 {
			f.strips[level] = tagH + 8
		}
	}
	if len(f.arcs) > 0 {
		f.height = flatBase
		for _, s := range f.strips {
			f.height += s
		}
	}
}

// endsAt lists the ends of the row's arches at variable n.
func (f *flatRow) endsAt(p *proper, n int) []end {
	xOf := p.nodeX()
	var out []end
	for _, a := range f.arcs {
		switch n {
		case a.u:
			out = append(out, end{arc: a.arc, key: xOf[a.v], flatEnd: 0})
		case a.v:
			out = append(out, end{arc: a.arc, key: xOf[a.u], flatEnd: 1})
		}
	}
	return out
}

func (f *flatRow) setPort(arc, which int, x float64) {
	for i := range f.arcs {
		if f.arcs[i].arc == arc {
			f.arcs[i].port[which] = x
		}
	}
}

// lineY is the height of a level's arch; its tags sit just above it.
func (f *flatRow) lineY(nodeTop float64, level int) float64 {
	y := nodeTop - flatBase
	for _, s := range f.strips[:level] {
		y -= s
	}
	return y
}

// routeFlats draws every arch: up from its tail's top, along its level,
// down into its head's top; its tag above its line where no vertical
// line crosses the level.
func (p *proper) routeFlats(flats []flatRow, g *rowGeom, tops []float64) {
	for row, f := range flats {
		r := 2 * row
		placed := map[int][][2]float64{}
		for _, a := range f.arcs {
			y := f.lineY(g.nodeTop[r], a.level)
			rt := archRoute(&p.l.Nodes[a.u], &p.l.Nodes[a.v], a.port, y)
			if a.tagW > 0 {
				obs := p.verticalsAcross(f, a.level, r, tops)
				x := freeSpot(obs, placed[a.level], a.port, a.tagW)
				placed[a.level] = append(placed[a.level], [2]float64{x, x + a.tagW})
				rt.Tag = &Box{X: x, Y: y - 2 - tagH, W: a.tagW, H: tagH}
				lo, hi := min(a.port[0], a.port[1])+flatCorner, max(a.port[0], a.port[1])-flatCorner
				rt.Pole = Pt{min(max(x+a.tagW/2, lo), hi), y}
			}
			p.l.Routes[a.arc] = rt
		}
	}
}

// archRoute is an arch from u's top at port[0] to v's top at port[1],
// along the height y, with rounded corners.
func archRoute(u, v *Placed, port [2]float64, y float64) Route {
	x1, x2 := port[0], port[1]
	rad := min(flatCorner, math.Abs(x2-x1)/2)
	dir := 1.0
	if x2 < x1 {
		dir = -1
	}
	r := Route{From: u.Name, To: v.Name, Start: Pt{x1, u.edgeY(x1, true)}}
	r.lineTo(Pt{x1, y + rad})
	r.Segs = append(r.Segs,
		Seg{C1: Pt{x1, y + rad/3}, C2: Pt{x1 + dir*rad*2/3, y}, To: Pt{x1 + dir*rad, y}, Curve: true})
	r.lineTo(Pt{x2 - dir*rad, y})
	r.Segs = append(r.Segs,
		Seg{C1: Pt{x2 - dir*rad*2/3, y}, C2: Pt{x2, y + rad/3}, To: Pt{x2, y + rad}, Curve: true})
	r.lineTo(Pt{x2, v.edgeY(x2, true)})
	return r
}

// verticalsAcross are the x of the lines that cross level's strip in
// rank r: arrows coming into the row's variables from above, arrows
// passing through the row, and the legs of higher arches.
func (p *proper) verticalsAcross(f flatRow, level, r int, tops []float64) []float64 {
	var xs []float64
	for _, id := range p.ranks[r] {
		it := p.items[id]
		if it.node < 0 {
			xs = append(xs, it.x)
			continue
		}
		for _, e := range p.up[id] {
			xs = append(xs, tops[p.items[e.to].arc])
		}
	}
	for _, a := range f.arcs {
		if a.level > level {
			xs = append(xs, a.port[0], a.port[1])
		}
	}
	return xs
}

// freeSpot is the left x of a tag w wide, as near the middle of the arch
// as lines and tags already placed allow: over the arch if it fits there,
// else wherever is nearest.
func freeSpot(xs []float64, tags [][2]float64, port [2]float64, w float64) float64 {
	var blocked [][2]float64
	for _, x := range xs {
		blocked = append(blocked, [2]float64{x - obstaclePad, x + obstaclePad})
	}
	for _, t := range tags {
		blocked = append(blocked, [2]float64{t[0] - obstaclePad, t[1] + obstaclePad})
	}
	lo, hi := min(port[0], port[1])+flatCorner, max(port[0], port[1])-flatCorner
	mid := (lo + hi) / 2
	best, bestD, inside := 0.0, math.Inf(1), false
	for _, gap := range freeGaps(blocked) {
		if gap[1]-gap[0] < w {
			continue
		}
		x := min(max(mid-w/2, gap[0]), gap[1]-w)
		over := x >= lo && x+w <= hi
		if d := math.Abs(x + w/2 - mid); (over && !inside) || (over == inside && d < bestD) {
			best, bestD, inside = x, d, over
		}
	}
	return best
}

// freeGaps are the stretches of the line between the blocked intervals,
// the outer two unbounded.
func freeGaps(blocked [][2]float64) [][2]float64 {
	sort.Slice(blocked, func(i, j int) bool { return blocked[i][0] < blocked[j][0] })
	var out [][2]float64
	from := math.Inf(-1)
	for _, b := range blocked {
		if b[0] > from {
			out = append(out, [2]float64{from, b[0]})
		}
		from = max(from, b[1])
	}
	return append(out, [2]float64{from, math.Inf(1)})
}
