package render

import (
	"encoding/xml"
	"fmt"
	"math"
	"regexp"
	"strconv"
	"strings"
	"testing"
)

// svgNode is a variable as drawn: its shape's box and whether it is an
// ellipse, and the boxes of its item list's lines.
type svgNode struct {
	name    string
	shape   Box
	ellipse bool
	items   []Box
}

// svgText is one text element as drawn: its box estimated from its font
// size and words, its size, and its group's class.
type svgText struct {
	box   Box
	size  float64
	words string
	group string
	lines []string  // a chart label's lines (tspans)
	dys   []float64 // each line's baseline below the first
}

// svgArc is one arrow as drawn: its ends and points along its path.
type svgArc struct {
	from, to, kind string
	pts            []Pt
}

// svgDrawing is the geometry of one drawing, read back from its SVG.
type svgDrawing struct {
	w, h, minW, maxW float64
	nodes            []svgNode
	arcs             []svgArc
	tags             []Box
	texts            []svgText
	heads            int
	bands            []Box
	marks            []Box // a chart's dots, intervals and bars
}

var (
	styleWidthRe = regexp.MustCompile(`max-width:([0-9.]+)px;min-width:([0-9.]+)px`)
	numRe        = regexp.MustCompile(`-?[0-9]+(\.[0-9]+)?`)
)

// parseDrawing reads an SVG drawing or chart with encoding/xml.
func parseDrawing(t *testing.T, svg string) *svgDrawing {
	t.Helper()
	d := &svgDrawing{}
	dec := xml.NewDecoder(strings.NewReader(svg))
	var groups []map[string]string
	var text *svgText
	var node *svgNode
	for {
		tok, err := dec.Token()
		if err != nil {
			break
		}
		switch e := tok.(type) {
		case xml.StartElement:
			a := attrs(e)
			switch e.Name.Local {
			case "svg":
				d.readSVG(t, a)
			case "g":
				groups = append(groups, a)
				if strings.HasPrefix(a["class"], "node") {
					node = &svgNode{name: a["data-name"]}
				}
			case "text":
				text = &svgText{size: num(t, a["font-size"]), group: groupClass(groups)}
				text.box = Box{X: num(t, a["x"]), Y: num(t, a["y"])}
				text.group += " " + a["class"]
			case "tspan":
				dy := 0.0
				if len(text.dys) > 0 {
					dy = text.dys[len(text.dys)-1] + num(t, a["dy"])
				}
				text.lines, text.dys = append(text.lines, ""), append(text.dys, dy)
			default:
				d.readShape(t, e.Name.Local, a, node, groups)
			}
		case xml.CharData:
			if text != nil && len(text.lines) > 0 {
				text.lines[len(text.lines)-1] += string(e)
			} else if text != nil {
				text.words += string(e)
			}
		case xml.EndElement:
			switch e.Name.Local {
			case "text":
				d.finishText(text, node)
				text = nil
			case "g":
				if node != nil && strings.HasPrefix(groups[len(groups)-1]["class"], "node") {
					d.nodes = append(d.nodes, *node)
					node = nil
				}
				groups = groups[:len(groups)-1]
			}
		}
	}
	return d
}

func attrs(e xml.StartElement) map[string]string {
	m := map[string]string{}
	for _, a := range e.Attr {
		m[a.Name.Local] = a.Value
	}
	return m
}

func groupClass(groups []map[string]string) string {
	var cs []string
	for _, g := range groups {
		cs = append(cs, g["class"])
	}
	return strings.Join(cs, " ")
}

func num(t *testing.T, s string) float64 {
	t.Helper()
	x, err := strconv.ParseFloat(s, 64)
	if err != nil {
		t.Fatalf("not a number: %q", s)
	}
	return x
}

func (d *svgDrawing) readSVG(t *testing.T, a map[string]string) {
	vb := strings.Fields(a["viewBox"])
	d.w, d.h = num(t, vb[2]), num(t, vb[3])
	m := styleWidthRe.FindStringSubmatch(a["style"])
	if m == nil {
		t.Fatalf("svg without its widths: %q", a["style"])
	}
	d.maxW, d.minW = num(t, m[1]), num(t, m[2])
}

func (d *svgDrawing) readShape(t *testing.T, el string, a map[string]string, node *svgNode,
	groups []map[string]string) {
	class := a["class"]
	switch {
	case el == "rect" && node != nil && class == "":
		node.shape = Box{num(t, a["x"]), num(t, a["y"]), num(t, a["width"]), num(t, a["height"])}
	case el == "ellipse" && node != nil && class == "":
		rx, ry := num(t, a["rx"]), num(t, a["ry"])
		node.shape, node.ellipse = Box{num(t, a["cx"]) - rx, num(t, a["cy"]) - ry, 2 * rx, 2 * ry}, true
	case el == "rect" && strings.HasPrefix(groupClass(groups), "tag"):
		d.tags = append(d.tags, Box{num(t, a["x"]), num(t, a["y"]), num(t, a["width"]), num(t, a["height"])})
	case el == "rect" && class == "tierband":
		d.bands = append(d.bands, Box{num(t, a["x"]), num(t, a["y"]), num(t, a["width"]), num(t, a["height"])})
	case el == "path" && strings.HasPrefix(class, "arc "):
		d.arcs = append(d.arcs, svgArc{from: a["data-from"], to: a["data-to"], kind: class[4:],
			pts: samplePath(t, a["d"], 24)})
	case el == "path" && strings.HasPrefix(class, "head "):
		d.heads++
	case el == "rect" && class == "range":
		d.marks = append(d.marks, Box{num(t, a["x"]), num(t, a["y"]), num(t, a["width"]), num(t, a["height"])})
	case el == "line" && class == "null":
		d.marks = append(d.marks, Box{num(t, a["x1"]) - 0.5, num(t, a["y1"]), 1, num(t, a["y2"]) - num(t, a["y1"])})
	case el == "circle":
		r := num(t, a["r"])
		d.marks = append(d.marks, Box{num(t, a["cx"]) - r, num(t, a["cy"]) - r, 2 * r, 2 * r})
	case el == "path" && (class == "ci" || class == "zero"):
		d.marks = append(d.marks, boundsOf(t, a["d"]))
	}
}

// finishText sets a text's box from its words: anchored at the middle
// for a variable's name and an axis number, at the start otherwise; from
// 0.8 of its size above the baseline to 0.25 below. A chart label's lines
// (tspans) each get a box of their own.
func (d *svgDrawing) finishText(tx *svgText, node *svgNode) {
	for i, line := range tx.lines {
		one := *tx
		one.words, one.lines = line, nil
		one.box.Y += tx.dys[i]
		d.finishText(&one, node)
	}
	if tx.lines != nil {
		return
	}
	bold := strings.Contains(tx.group, "tag") || strings.Contains(tx.group, "tierlabel") ||
		strings.Contains(tx.group, "shifted")
	w := textWidth(tx.words, tx.size, bold)
	x := tx.box.X
	if strings.Contains(tx.group, " name") || strings.Contains(tx.group, "ticklabel") {
		x -= w / 2
	}
	tx.box = Box{X: x, Y: tx.box.Y - 0.8*tx.size, W: w, H: 1.05 * tx.size}
	if node != nil && strings.Contains(tx.group, " item") {
		node.items = append(node.items, tx.box)
	}
	d.texts = append(d.texts, *tx)
}

// samplePath reads path data of absolute M, L and C commands and returns
// n points along each segment.
func samplePath(t *testing.T, d string, n int) []Pt {
	t.Helper()
	var pts []Pt
	var cur Pt
	for _, cmd := range regexp.MustCompile(`[MLC][^MLC]*`).FindAllString(d, -1) {
		var v []float64
		for _, s := range numRe.FindAllString(cmd[1:], -1) {
			v = append(v, num(t, s))
		}
		switch cmd[0] {
		case 'M':
			cur = Pt{v[0], v[1]}
			pts = append(pts, cur)
		case 'L':
			s := Seg{To: Pt{v[0], v[1]}}
			pts, cur = appendSamples(pts, s, cur, n), s.To
		case 'C':
			s := Seg{C1: Pt{v[0], v[1]}, C2: Pt{v[2], v[3]}, To: Pt{v[4], v[5]}, Curve: true}
			pts, cur = appendSamples(pts, s, cur, n), s.To
		}
	}
	return pts
}

func appendSamples(pts []Pt, s Seg, from Pt, n int) []Pt {
	for i := 1; i <= n; i++ {
		pts = append(pts, s.at(from, float64(i)/float64(n)))
	}
	return pts
}

// strictlyIn says whether p lies inside b shrunk by pad on every side.
func strictlyIn(p Pt, b Box, pad float64) bool {
	return p.X > b.X+pad && p.X < b.X+b.W-pad && p.Y > b.Y+pad && p.Y < b.Y+b.H-pad
}

// inEllipse says whether p lies inside the ellipse of bounding box b,
// scaled by f.
func inEllipse(p Pt, b Box, f float64) bool {
	rx, ry := b.W/2*f, b.H/2*f
	u, v := (p.X-b.X-b.W/2)/rx, (p.Y-b.Y-b.H/2)/ry
	return u*u+v*v < 1
}

func overlap(a, b Box) bool {
	return a.X < b.X+b.W && b.X < a.X+a.W && a.Y < b.Y+b.H && b.Y < a.Y+a.H
}

func within(in, out Box, slack float64) bool {
	return in.X >= out.X-slack && in.Y >= out.Y-slack && in.X+in.W <= out.X+out.W+slack &&
		in.Y+in.H <= out.Y+out.H+slack
}

func (b Box) String() string { return fmt.Sprintf("[%.1f,%.1f %.1fx%.1f]", b.X, b.Y, b.W, b.H) }

// effectivePx is the height in CSS pixels of text of a size when the
// drawing is set in a container that many pixels wide: the SVG takes the
// container's width, kept between its min-width and max-width.
func (d *svgDrawing) effectivePx(size, container float64) float64 {
	w := min(max(container, d.minW), d.maxW)
	return size * w / d.w
}

// boundsOf is the box of a chart mark's path of absolute M, V, H and
// relative l and m commands.
func boundsOf(t *testing.T, d string) Box {
	lo, hi := Pt{math.Inf(1), math.Inf(1)}, Pt{math.Inf(-1), math.Inf(-1)}
	var cur Pt
	for _, cmd := range regexp.MustCompile(`[MVHlm][^MVHlm]*`).FindAllString(d, -1) {
		var v []float64
		for _, s := range numRe.FindAllString(cmd[1:], -1) {
			v = append(v, num(t, s))
		}
		switch cmd[0] {
		case 'M':
			cur = Pt{v[0], v[1]}
		case 'V':
			cur.Y = v[0]
		case 'H':
			cur.X = v[0]
		case 'l', 'm':
			cur = Pt{cur.X + v[0], cur.Y + v[1]}
		}
		lo, hi = Pt{min(lo.X, cur.X), min(lo.Y, cur.Y)}, Pt{max(hi.X, cur.X), max(hi.Y, cur.Y)}
	}
	return Box{lo.X, lo.Y, hi.X - lo.X, hi.Y - lo.Y}
}
