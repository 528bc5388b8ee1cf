package render

import (
	"math"
	"slices"
	"strings"
	"testing"
)

// Container widths on a 390-pixel page (style.css): main has 1rem (16
// px) padding each side; a graph's figure adds .5rem padding and a 1 px
// border each side; a chart's figure adds nothing.
const (
	narrowGraphPx = 390 - 2*16 - 2*(8+1)
	narrowChartPx = 390 - 2*16
)

// checkDrawing holds a drawing, read back from its SVG, to the rules:
// everything inside the viewBox; no text below 11 px on a 390-pixel page;
// no two variables, texts or tags overlapping; no arrow through a
// variable other than its own ends, nor into its own ends' shapes, nor
// through any text or tag; every arrow starting and ending on the edge of
// its variables' shapes.
func checkDrawing(t *testing.T, name, svg string) *svgDrawing {
	t.Helper()
	d := parseDrawing(t, svg)
	bad := func(format string, args ...any) { t.Helper(); t.Errorf(name+": "+format, args...) }
	d.checkInside(bad)
	for _, tx := range d.texts {
		if px := d.effectivePx(tx.size, narrowGraphPx); px < minTextPx-1e-9 {
			bad("text %q is %.1f px high on a 390-pixel page", tx.words, px)
		}
	}
	d.checkOverlaps(bad)
	d.checkTagText(bad)
	for _, a := range d.arcs {
		d.checkArc(a, bad)
	}
	d.checkPorts(bad)
	return d
}

// checkPorts: arrows meeting one side of a shape are at least portStep
// apart, so that their heads do not run into each other.
func (d *svgDrawing) checkPorts(bad func(string, ...any)) {
	ends := map[string][]float64{}
	for _, a := range d.arcs {
		for i, name := range []string{a.from, a.to} {
			p := a.pts[0]
			if i == 1 {
				p = a.pts[len(a.pts)-1]
			}
			if n, ok := d.node(name); ok {
				side := name + " bottom"
				if p.Y < n.shape.Y+n.shape.H/2 {
					side = name + " top"
				}
				ends[side] = append(ends[side], p.X)
			}
		}
	}
	for side, xs := range ends {
		slices.Sort(xs)
		for k := 1; k < len(xs); k++ {
			if xs[k]-xs[k-1] < portStep-0.15 {
				bad("arrows meet the %s of %s only %.1f apart", strings.Fields(side)[1], strings.Fields(side)[0],
					xs[k]-xs[k-1])
			}
		}
	}
}

func (d *svgDrawing) checkInside(bad func(string, ...any)) {
	view := Box{0, 0, d.w, d.h}
	for _, n := range d.nodes {
		if !within(n.shape, view, 0.05) {
			bad("variable %s at %v lies outside the viewBox %v", n.name, n.shape, view)
		}
	}
	for _, b := range append(append([]Box(nil), d.tags...), d.bands...) {
		if !within(b, view, 0.05) {
			bad("tag or band %v lies outside the viewBox %v", b, view)
		}
	}
	for _, tx := range d.texts {
		if !within(tx.box, view, 0.05) {
			bad("text %q at %v runs outside the viewBox %v", tx.words, tx.box, view)
		}
	}
	for _, a := range d.arcs {
		for _, p := range a.pts {
			if p.X < 0 || p.Y < 0 || p.X > d.w || p.Y > d.h {
				bad("arrow %s → %s leaves the viewBox at (%.1f, %.1f)", a.from, a.to, p.X, p.Y)
				break
			}
		}
	}
}

// footprint is a variable's shape and item list.
func (n svgNode) footprint() []Box { return append([]Box{n.shape}, n.items...) }

func (d *svgDrawing) checkOverlaps(bad func(string, ...any)) {
	for i, a := range d.nodes {
		for _, b := range d.nodes[i+1:] {
			if anyOverlap(a.footprint(), b.footprint()) {
				bad("variables %s and %s overlap", a.name, b.name)
			}
		}
		for _, tg := range d.tags {
			if anyOverlap(a.footprint(), []Box{tg}) {
				bad("a tag %v lies on variable %s", tg, a.name)
			}
		}
	}
	for i, a := range d.texts {
		for _, b := range d.texts[i+1:] {
			if overlap(a.box, b.box) {
				bad("texts %q %v and %q %v overlap", a.words, a.box, b.words, b.box)
			}
		}
	}
	for i, a := range d.tags {
		for _, b := range d.tags[i+1:] {
			if overlap(a, b) {
				bad("tags %v and %v overlap", a, b)
			}
		}
	}
}

func anyOverlap(as, bs []Box) bool {
	for _, a := range as {
		for _, b := range bs {
			if overlap(a, b) {
				return true
			}
		}
	}
	return false
}

// checkTagText: each tag's words fit inside its box, each variable's name
// inside its shape.
func (d *svgDrawing) checkTagText(bad func(string, ...any)) {
	k, n := 0, 0
	for _, tx := range d.texts {
		switch {
		case len(tx.group) >= 3 && tx.group[:3] == "tag":
			if k < len(d.tags) && !within(tx.box, d.tags[k], 0.05) {
				bad("tag words %q %v overflow the tag %v", tx.words, tx.box, d.tags[k])
			}
			k++
		case hasWord(tx.group, "name"):
			if n < len(d.nodes) && !within(tx.box, d.nodes[n].shape, 0.05) {
				bad("name %q %v overflows its shape %v", tx.words, tx.box, d.nodes[n].shape)
			}
			n++
		}
	}
}

func hasWord(s, w string) bool {
	for _, f := range strings.Fields(s) {
		if f == w {
			return true
		}
	}
	return false
}

// checkArc: the arrow passes through no variable but its ends, enters
// neither end's shape, crosses no text or tag, and starts and ends on its
// variables' edges.
func (d *svgDrawing) checkArc(a svgArc, bad func(string, ...any)) {
	for _, n := range d.nodes {
		own := n.name == a.from || n.name == a.to
		for _, p := range a.pts {
			switch {
			case !own && strictlyIn(p, n.shape, 0.5):
				bad("arrow %s → %s passes through %s at (%.1f, %.1f)", a.from, a.to, n.name, p.X, p.Y)
			case own && ((n.ellipse && inEllipse(p, n.shape, 0.97)) || (!n.ellipse && strictlyIn(p, n.shape, 1))):
				bad("arrow %s → %s runs into its own end %s at (%.1f, %.1f)", a.from, a.to, n.name, p.X, p.Y)
			default:
				continue
			}
			break
		}
	}
	for _, p := range a.pts {
		if b, ok := d.hit(p); ok {
			bad("arrow %s → %s crosses the text or tag %v at (%.1f, %.1f)", a.from, a.to, b, p.X, p.Y)
			break
		}
	}
	d.checkEnds(a, bad)
}

// hit is the tag or text box a point lies in, if any.
func (d *svgDrawing) hit(p Pt) (Box, bool) {
	for _, tg := range d.tags {
		if strictlyIn(p, tg, 0.3) {
			return tg, true
		}
	}
	for _, tx := range d.texts {
		if strictlyIn(p, tx.box, 0.3) {
			return tx.box, true
		}
	}
	return Box{}, false
}

func (d *svgDrawing) checkEnds(a svgArc, bad func(string, ...any)) {
	if a.from == "" { // a legend's sample
		return
	}
	for i, name := range []string{a.from, a.to} {
		p := a.pts[0]
		if i == 1 {
			p = a.pts[len(a.pts)-1]
		}
		n, ok := d.node(name)
		if !ok {
			bad("arrow %s → %s: no variable %s drawn", a.from, a.to, name)
			continue
		}
		if !onEdge(p, n) {
			bad("arrow %s → %s does not meet %s's edge: (%.1f, %.1f), shape %v", a.from, a.to, name, p.X, p.Y, n.shape)
		}
	}
}

func (d *svgDrawing) node(name string) (svgNode, bool) {
	for _, n := range d.nodes {
		if n.name == name {
			return n, true
		}
	}
	return svgNode{}, false
}

// onEdge says whether p lies on the shape's outline (within a tenth of a
// unit and the rounding of the drawn coordinates).
func onEdge(p Pt, n svgNode) bool {
	s := n.shape
	if n.ellipse {
		u, v := (p.X-s.X-s.W/2)/(s.W/2), (p.Y-s.Y-s.H/2)/(s.H/2)
		return math.Abs(math.Hypot(u, v)-1) < 0.03
	}
	inX := p.X >= s.X-0.1 && p.X <= s.X+s.W+0.1
	return inX && (math.Abs(p.Y-s.Y) < 0.11 || math.Abs(p.Y-s.Y-s.H) < 0.11)
}

// checkTiers: each tier's variables share its row, rows run from the
// first tier down, each band holds its variables, and the labels lie
// left of every variable.
func checkTiers(t *testing.T, name string, l *Layout, in LayoutInput) {
	t.Helper()
	prev := math.Inf(-1)
	for k, names := range in.Tiers {
		band := l.Tiers[k].Band
		if band.Y < prev {
			t.Errorf("%s: tier %d's band starts at %.1f, above the end of the one before (%.1f)",
				name, k+1, band.Y, prev)
		}
		prev = band.Y + band.H
		for _, v := range names {
			p, _ := l.At(v)
			if p.Row != k || !within(p.Box, band, 0.05) {
				t.Errorf("%s: %s (row %d, %v) is not in tier %d's band %v", name, v, p.Row, p.Box, k+1, band)
			}
			if p.Box.X < l.Tiers[k].LabelBox.X+l.Tiers[k].LabelBox.W {
				t.Errorf("%s: %s starts left of the end of the tier's label", name, v)
			}
		}
	}
}
