package render

import (
	"math"
	"sort"
)

// end is one arrow's end at a variable: its arc, the x of where it comes
// from or goes to, and which end of an arrow within the row it is (−1 for
// an arrow between rows).
type end struct {
	arc     int
	key     float64
	flatEnd int
}

func sortedEnds(p *proper, links []link) []end {
	out := make([]end, len(links))
	for i, e := range links {
		it := p.items[e.to]
		out[i] = end{arc: it.arc, key: it.x, flatEnd: -1}
	}
	sortEnds(out)
	return out
}

func sortEnds(es []end) {
	sort.SliceStable(es, func(i, j int) bool { return es[i].key < es[j].key })
}

// route runs arc k along its chain, from the upper variable's bottom at
// x bx to the lower one's top at tx: straight down through each rank it
// crosses (at its virtual node), an S-curve through each gap, and past
// an empty tag rank in one curve; turned round when the arc runs upwards.
func (p *proper) route(k int, chain []int, g *rowGeom, bx, tx float64) Route {
	first, last := p.items[chain[0]], p.items[chain[len(chain)-1]]
	u, v := &p.l.Nodes[first.node], &p.l.Nodes[last.node]
	r := Route{From: u.Name, To: v.Name, Start: Pt{bx, u.edgeY(bx, false)}}
	r.lineTo(Pt{bx, g.bottom[first.rank]})
	for _, id := range chain[1 : len(chain)-1] {
		it := p.items[id]
		if g.height(it.rank) == 0 {
			continue
		}
		r.curveTo(Pt{it.x, g.top[it.rank]})
		r.lineTo(Pt{it.x, g.bottom[it.rank]})
		if it.tag > 0 {
			r.Tag = &Box{X: it.x + tagGap, Y: g.top[it.rank], W: it.tag, H: tagH}
			r.Pole = Pt{it.x, g.top[it.rank] + tagH/2}
		}
	}
	r.curveTo(Pt{tx, g.top[last.rank]})
	r.lineTo(Pt{tx, v.edgeY(tx, true)})
	if p.rev[k] {
		r = r.reversed()
	}
	return r
}

// here is the route's current end.
func (r *Route) here() Pt {
	if len(r.Segs) == 0 {
		return r.Start
	}
	return r.Segs[len(r.Segs)-1].To
}

// lineTo adds a line, unless it would have no length.
func (r *Route) lineTo(q Pt) {
	if h := r.here(); h == q {
		return
	}
	r.Segs = append(r.Segs, Seg{To: q})
}

// curveTo adds an S-curve that leaves and arrives vertically; it stays
// within the rectangle of its two ends.
func (r *Route) curveTo(q Pt) {
	h := r.here()
	if h == q {
		return
	}
	if h.X == q.X {
		r.lineTo(q)
		return
	}
	mid := (h.Y + q.Y) / 2
	r.Segs = append(r.Segs, Seg{C1: Pt{h.X, mid}, C2: Pt{q.X, mid}, To: q, Curve: true})
}

// points are the route's ends and control points.
func (r Route) points() []Pt {
	out := []Pt{r.Start}
	for _, s := range r.Segs {
		if s.Curve {
			out = append(out, s.C1, s.C2)
		}
		out = append(out, s.To)
	}
	return out
}

func (r *Route) shift(dx float64) {
	r.Start.X += dx
	for i := range r.Segs {
		r.Segs[i].C1.X += dx
		r.Segs[i].C2.X += dx
		r.Segs[i].To.X += dx
	}
	r.Pole.X += dx
	if r.Tag != nil {
		t := *r.Tag
		t.X += dx
		r.Tag = &t
	}
}

// Sample is n+1 points along each segment of the route, for measuring.
func (r Route) Sample(n int) []Pt {
	out := []Pt{r.Start}
	from := r.Start
	for _, s := range r.Segs {
		for i := 1; i <= n; i++ {
			out = append(out, s.at(from, float64(i)/float64(n)))
		}
		from = s.To
	}
	return out
}

// at is the point at parameter t of a segment that starts at from.
func (s Seg) at(from Pt, t float64) Pt {
	if !s.Curve {
		return Pt{from.X + t*(s.To.X-from.X), from.Y + t*(s.To.Y-from.Y)}
	}
	u := 1 - t
	a, b, c, d := u*u*u, 3*u*u*t, 3*u*t*t, t*t*t
	return Pt{a*from.X + b*s.C1.X + c*s.C2.X + d*s.To.X, a*from.Y + b*s.C1.Y + c*s.C2.Y + d*s.To.Y}
}

// HeadDir is the direction the route arrives in, as a unit step.
func (r Route) HeadDir() Pt {
	pts := r.points()
	end := pts[len(pts)-1]
	for i := len(pts) - 2; i >= 0; i-- {
		if d := (Pt{end.X - pts[i].X, end.Y - pts[i].Y}); d.X != 0 || d.Y != 0 {
			return unit(d)
		}
	}
	return Pt{0, 1}
}

func unit(d Pt) Pt {
	n := math.Hypot(d.X, d.Y)
	return Pt{d.X / n, d.Y / n}
}
