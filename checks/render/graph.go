package render

import (
	"fmt"
	"html"
	"html/template"
	"sort"
	"strings"
	"unicode/utf8"

	"github.com/pathvet/pathvet/checks"
)

// Arc kinds in a drawing; each has its own line style and a word in the
// legend, so that colour is never the only cue.
const (
	arcShared     = "shared"     // every equivalent graph has it, this way round
	arcReversible = "reversible" // some equivalent graph has it the other way
	arcLine       = "open"       // an undirected edge of a CPDAG
)

// drawnArc is one edge of a drawing.
type drawnArc struct {
	From, To string
	Kind     string
	Fixed    bool   // fixed by background knowledge
	Label    string // the claims on it
}

// svgMarkers are the arrowheads, with ids made unique by prefix.
const svgMarkers = `<defs>` +
	`<marker id="%[1]s-head" viewBox="0 0 10 10" refX="10" refY="5" markerWidth="10" markerHeight="10" ` +
	`markerUnits="userSpaceOnUse" orient="auto">` +
	`<path d="M0,0 L10,5 L0,10 z" class="head"/></marker>` +
	`<marker id="%[1]s-open" viewBox="0 0 10 10" refX="10" refY="5" markerWidth="11" markerHeight="11" ` +
	`markerUnits="userSpaceOnUse" orient="auto">` +
	`<path d="M1,1 L9,5 L1,9" class="openhead"/></marker>` +
	`<marker id="%[1]s-bar" viewBox="0 0 10 10" refX="0" refY="5" markerWidth="11" markerHeight="11" ` +
	`markerUnits="userSpaceOnUse" orient="auto">` +
	`<path d="M2,0 L2,10 M6,0 L6,10" class="bar"/></marker></defs>`

// declaredArcs classifies the declared graph's arcs against its CPDAG.
func declaredArcs(g *checks.GraphReport, claims []checks.ClaimReport) []drawnArc {
	open := pairSet(g.CPDAG.Undirected, true)
	fixed := pairSet(g.Background, false)
	labels := claimLabels(claims)
	out := make([]drawnArc, len(g.Declared))
	for i, a := range g.Declared {
		k := arcShared
		if open[a] {
			k = arcReversible
		}
		out[i] = drawnArc{From: a[0], To: a[1], Kind: k, Fixed: fixed[a], Label: labels[a]}
	}
	return out
}

// cpdagArcs lists a CPDAG's arcs and undirected edges.
func cpdagArcs(es *checks.EdgeSets) []drawnArc {
	var out []drawnArc
	for _, a := range es.Directed {
		out = append(out, drawnArc{From: a[0], To: a[1], Kind: arcShared})
	}
	for _, a := range es.Undirected {
		out = append(out, drawnArc{From: a[0], To: a[1], Kind: arcLine})
	}
	return out
}

func pairSet(ps [][2]string, both bool) map[[2]string]bool {
	m := make(map[[2]string]bool, len(ps))
	for _, p := range ps {
		m[p] = true
		if both {
			m[[2]string{p[1], p[0]}] = true
		}
	}
	return m
}

// claimLabels names the direct-effect claims on each arc.
func claimLabels(claims []checks.ClaimReport) map[[2]string]string {
	ids := map[[2]string][]string{}
	for _, c := range claims {
		if c.Kind == checks.KindDirect {
			a := [2]string{c.From, c.To}
			ids[a] = append(ids[a], c.ID)
		}
	}
	out := make(map[[2]string]string, len(ids))
	for a, v := range ids {
		sort.Strings(v)
		out[a] = strings.Join(v, ", ")
	}
	return out
}

// bowPerLayer is how far sideways an arc bends per layer it skips, so
// that it does not run through the nodes between its ends.
const bowPerLayer = 34.0

// labelW is a generous width of one character of an arc's label (13 px,
// bold), in user units.
const labelW = 9.0

// sidePad is the room a drawing keeps on each side for its bowed arcs.
func sidePad(l *Layout) float64 { return bowPerLayer / 2 * float64(max(len(l.Layers)-2, 0)) }

// drawGraph writes the SVG of a layout with the given arcs; exo marks the
// exogenous variables; title and desc say in words what it shows.
func drawGraph(l *Layout, arcs []drawnArc, exo map[string]bool, id, title, desc string) template.HTML {
	pad := sidePad(l)
	ends := arcPorts(l, arcs)
	var marks strings.Builder
	right := l.Width + pad
	for i, a := range arcs {
		right = max(right, drawArcMarks(&marks, l, a, ends[i]))
	}
	var b strings.Builder
	fmt.Fprintf(&b, `<svg class="graph" id="%[1]s" viewBox="%.0[2]f 0 %.0[3]f %.0[4]f" style="max-width:%.0[3]fpx" `+
		`role="img" aria-labelledby="%[1]s-t %[1]s-d"><title id="%[1]s-t">%[5]s</title><desc id="%[1]s-d">%[6]s</desc>`,
		id, -pad, right+pad, l.Height, esc(title), esc(desc))
	fmt.Fprintf(&b, svgMarkers, id)
	for i, a := range arcs {
		drawArc(&b, a, ends[i], id)
	}
	for _, p := range l.Nodes {
		drawNode(&b, p, exo[p.Name])
	}
	b.WriteString(marks.String() + `</svg>`)
	return template.HTML(b.String())
}

// geom is where an arc runs: its ends and the control point of its curve.
type geom struct{ x1, y1, cx, cy, x2, y2 float64 }

// arcPorts lays every arc out: from the bottom of the tail to the top of
// the head (the other way round when the head lies higher, as on a cycle;
// side to side within a layer), bowed to alternating sides when it skips
// layers, and spread along each node's edge in the order of where the
// arcs go, so that arcs leaving one node do not run on top of each other.
func arcPorts(l *Layout, arcs []drawnArc) []geom {
	out := make([]geom, len(arcs))
	bow := make([]float64, len(arcs))
	for i, a := range arcs {
		u, _ := l.At(a.From)
		v, _ := l.At(a.To)
		g := geom{y1: u.Y + nodeH, y2: v.Y}
		if v.Layer < u.Layer {
			g.y1, g.y2 = u.Y, v.Y+nodeH
		} else if v.Layer == u.Layer {
			g.y1, g.y2 = u.Y+nodeH/2, v.Y+nodeH/2
		}
		if span := abs(v.Layer - u.Layer); span > 1 {
			bow[i] = float64(1-2*(i%2)) * bowPerLayer * float64(span-1)
		}
		out[i] = g
	}
	spread(l, arcs, out, bow, true)
	spread(l, arcs, out, bow, false)
	for i := range out {
		g := &out[i]
		g.cx, g.cy = (g.x1+g.x2)/2+bow[i], (g.y1+g.y2)/2
	}
	return out
}

// spread sets the x of each arc's tail (tails) or head along its node,
// ordered by the x of the other end plus the arc's bow.
func spread(l *Layout, arcs []drawnArc, out []geom, bow []float64, tails bool) {
	by := map[string][]int{}
	for i, a := range arcs {
		n := a.To
		if tails {
			n = a.From
		}
		by[n] = append(by[n], i)
	}
	for name, idx := range by {
		p, _ := l.At(name)
		key := func(i int) float64 {
			other := arcs[i].From
			if tails {
				other = arcs[i].To
			}
			q, _ := l.At(other)
			return q.X + q.W/2 + bow[i]
		}
		sort.SliceStable(idx, func(a, b int) bool { return key(idx[a]) < key(idx[b]) })
		for k, i := range idx {
			x := p.X + p.W*float64(k+1)/float64(len(idx)+1)
			if tails {
				out[i].x1 = x
			} else {
				out[i].x2 = x
			}
		}
	}
}

// drawArc draws one arc along its geometry.
func drawArc(b *strings.Builder, a drawnArc, g geom, id string) {
	class, marker := "arc "+a.Kind, ` marker-end="url(#`+id+`-head)"`
	switch a.Kind {
	case arcReversible:
		marker = ` marker-end="url(#` + id + `-open)"`
	case arcLine, arcRemoved:
		marker = ""
	}
	if a.Fixed {
		class += " fixed"
		marker += ` marker-start="url(#` + id + `-bar)"`
	}
	fmt.Fprintf(b, `<path class="%s" data-from="%s" data-to="%s" data-y1="%.1f" data-y2="%.1f" `+
		`d="M%.1f,%.1f Q%.1f,%.1f %.1f,%.1f"%s/>`,
		class, esc(a.From), esc(a.To), g.y1, g.y2, g.x1, g.y1, g.cx, g.cy, g.x2, g.y2, marker)
}

// drawArcMarks writes an arc's label and, on a removed arc, its strike,
// at the first point along the curve clear of every node; drawn after the
// nodes, so that a mark never hides behind one. It returns how far right
// the marks reach, so that the drawing can make room.
func drawArcMarks(b *strings.Builder, l *Layout, a drawnArc, g geom) float64 {
	mx, my := markPoint(l, g)
	right := mx + 6
	if a.Kind == arcRemoved {
		fmt.Fprintf(b, `<path class="strike" d="M%.1f,%.1f l12,12 m0,-12 l-12,12"/>`, mx-6, my-6)
	}
	if a.Label != "" {
		fmt.Fprintf(b, `<text class="claimlabel" x="%.1f" y="%.1f">%s</text>`, mx+6, my+4, esc(a.Label))
		right = mx + 10 + labelW*float64(utf8.RuneCountInString(a.Label))
	}
	return right
}

// markPoint is the point of the arc's quadratic curve at the first of a
// few places (middle first) that lies outside every node's box.
func markPoint(l *Layout, g geom) (float64, float64) {
	at := func(t float64) (float64, float64) {
		u := 1 - t
		return u*u*g.x1 + 2*u*t*g.cx + t*t*g.x2, u*u*g.y1 + 2*u*t*g.cy + t*t*g.y2
	}
	for _, t := range []float64{0.5, 0.35, 0.65, 0.25, 0.75} {
		if x, y := at(t); !inNode(l, x, y) {
			return x, y
		}
	}
	return at(0.5)
}

func inNode(l *Layout, x, y float64) bool {
	for _, p := range l.Nodes {
		if x >= p.X-2 && x <= p.X+p.W+2 && y >= p.Y-2 && y <= p.Y+nodeH+2 {
			return true
		}
	}
	return false
}

func abs(n int) int {
	if n < 0 {
		return -n
	}
	return n
}

func drawNode(b *strings.Builder, p Placed, exogenous bool) {
	class := "node"
	if exogenous {
		class += " exogenous"
	}
	fmt.Fprintf(b, `<g class="%s" data-name="%s"><rect x="%.1f" y="%.1f" width="%.1f" height="%.0f" rx="4"/>`,
		class, esc(p.Name), p.X, p.Y, p.W, nodeH)
	if exogenous {
		fmt.Fprintf(b, `<rect class="inner" x="%.1f" y="%.1f" width="%.1f" height="%.0f" rx="2"/>`,
			p.X+3, p.Y+3, p.W-6, nodeH-6)
	}
	fmt.Fprintf(b, `<text x="%.1f" y="%.1f">%s</text></g>`, p.X+p.W/2, p.Y+nodeH/2+4.5, esc(p.Name))
}

func esc(s string) string { return html.EscapeString(s) }
