package render

import (
	"fmt"
	"html"
	"html/template"
	"math"
	"strings"
)

// minTextPx is the least height, in CSS pixels, of any text of a drawing
// on a 390-pixel-wide page. A drawing is never set narrower than the
// width at which its smallest text is that high (minWidth); a wider one
// scrolls sideways within its figure instead of shrinking.
const minTextPx = 11.0

// maxScale is the most a drawing is enlarged on a wide page.
const maxScale = 1.2

// Head sizes of an arrow, in user units.
const (
	headLen  = 9.0
	headHalf = 4.5
)

// drawing is what one SVG shows: the layout's variables and tiers and the
// arrows of one graph on it.
type drawing struct {
	l           *Layout
	arcs        []drawnArc
	exo         map[string]bool
	id, title   string
	description string
}

// minWidth is the narrowest a drawing w units wide may be set.
func minWidth(w, smallest float64) float64 { return math.Ceil(w * minTextPx / smallest) }

// svg writes the drawing: tiers' bands, arrows, variables, then tags (so
// that nothing hides a tag); title and desc say in words what it shows.
func (d drawing) svg() template.HTML {
	l := d.l
	var b strings.Builder
	fmt.Fprintf(&b, `<svg class="graph" id="%[1]s" viewBox="0 0 %.0[2]f %.0[3]f" `+
		`style="max-width:%.0[4]fpx;min-width:%.0[5]fpx" role="img" aria-labelledby="%[1]s-t %[1]s-d">`+
		`<title id="%[1]s-t">%[6]s</title><desc id="%[1]s-d">%[7]s</desc>`,
		d.id, l.Width, l.Height, math.Ceil(l.Width*maxScale), minWidth(l.Width, smallestText),
		esc(d.title), esc(d.description+layoutWords(d.l)))
	for _, t := range l.Tiers {
		drawTier(&b, t)
	}
	var tags strings.Builder
	for _, a := range d.arcs {
		if r, ok := l.RouteOf(a.From, a.To); ok {
			drawArc(&b, a, r)
			drawTag(&tags, a, r)
		}
	}
	for _, p := range l.Nodes {
		drawNode(&b, p, d.exo[p.Name])
	}
	b.WriteString(tags.String() + `</svg>`)
	return template.HTML(b.String())
}

// layoutWords say in words what a drawing's rows and shapes add: each
// tier's variables and each construct's items.
func layoutWords(l *Layout) string {
	var parts []string
	for _, t := range l.Tiers {
		parts = append(parts, t.Label+": "+strings.Join(t.Variables, ", "))
	}
	for _, n := range l.Nodes {
		if n.Latent {
			parts = append(parts, n.Name+" is a construct measured by "+strings.Join(n.Items, ", "))
		}
	}
	if len(parts) == 0 {
		return ""
	}
	return ". " + strings.Join(parts, "; ")
}

// smallestText is the smallest font size a drawing uses.
const smallestText = min(nameSize, tagSize, itemSize, tierSize)

// pathD is a route as SVG path data.
func pathD(r Route) string {
	var b strings.Builder
	fmt.Fprintf(&b, "M%.1f,%.1f", r.Start.X, r.Start.Y)
	for _, s := range r.Segs {
		if s.Curve {
			fmt.Fprintf(&b, " C%.1f,%.1f %.1f,%.1f %.1f,%.1f", s.C1.X, s.C1.Y, s.C2.X, s.C2.Y, s.To.X, s.To.Y)
		} else {
			fmt.Fprintf(&b, " L%.1f,%.1f", s.To.X, s.To.Y)
		}
	}
	return b.String()
}

// drawArc draws one arrow along its route, in its kind's line and head.
func drawArc(b *strings.Builder, a drawnArc, r Route) {
	d := pathD(r)
	fmt.Fprintf(b, `<path class="arc %s" data-from="%s" data-to="%s" d="%s"/>`, a.Kind, esc(a.From), esc(a.To), d)
	if a.Kind == arcSettled {
		fmt.Fprintf(b, `<path class="rail" d="%s"/>`, d)
	}
	switch a.Kind {
	case arcOpen, arcRemoved:
	case arcReversible:
		b.WriteString(headPath(r, false, a.Kind))
	default:
		b.WriteString(headPath(r, true, a.Kind))
	}
}

// headPath is an arrow's head at the route's end: a filled triangle, or an
// open chevron.
func headPath(r Route, filled bool, kind string) string {
	e, d := r.here(), r.HeadDir()
	n := Pt{-d.Y, d.X}
	bx, by := e.X-headLen*d.X, e.Y-headLen*d.Y
	if filled {
		return fmt.Sprintf(`<path class="head filled %s" d="M%.1f,%.1f L%.1f,%.1f L%.1f,%.1f Z"/>`, kind,
			e.X, e.Y, bx+headHalf*n.X, by+headHalf*n.Y, bx-headHalf*n.X, by-headHalf*n.Y)
	}
	return fmt.Sprintf(`<path class="head open %s" d="M%.1f,%.1f L%.1f,%.1f L%.1f,%.1f"/>`, kind,
		bx+(headHalf+1)*n.X, by+(headHalf+1)*n.Y, e.X, e.Y, bx-(headHalf+1)*n.X, by-(headHalf+1)*n.Y)
}

// drawTag hangs an arrow's tag beside it: a short pole from the arrow to
// a box with the words; a removal's cross on the arrow at the pole.
func drawTag(b *strings.Builder, a drawnArc, r Route) {
	if a.Tag == "" || r.Tag == nil {
		return
	}
	t := *r.Tag
	t.W = min(t.W, tagWidth([]string{a.Tag})) // the room fits the widest tag any drawing hangs here
	fmt.Fprintf(b, `<g class="tag %s">`, a.Kind)
	q := nearestOnBox(r.Pole, t)
	fmt.Fprintf(b, `<path class="pole" d="M%.1f,%.1f L%.1f,%.1f"/>`, r.Pole.X, r.Pole.Y, q.X, q.Y)
	if a.Kind == arcRemoved {
		fmt.Fprintf(b, `<path class="strike" d="M%.1f,%.1f l8,8 m0,-8 l-8,8"/>`, r.Pole.X-4, r.Pole.Y-4)
	}
	fmt.Fprintf(b, `<rect x="%.1f" y="%.1f" width="%.1f" height="%.1f" rx="3"/>`, t.X, t.Y, t.W, t.H)
	fmt.Fprintf(b, `<text x="%.1f" y="%.1f" font-size="%.0f">%s</text></g>`, t.X+tagPadX, t.Y+t.H/2+tagSize*0.36,
		tagSize, esc(a.Tag))
}

// nearestOnBox is the point of the box's edge nearest p.
func nearestOnBox(p Pt, b Box) Pt {
	return Pt{min(max(p.X, b.X), b.X+b.W), min(max(p.Y, b.Y), b.Y+b.H)}
}

// drawNode draws a variable: a box (double for an exogenous one) or, for
// a construct, an ellipse with its items listed beside it.
func drawNode(b *strings.Builder, p Placed, exogenous bool) {
	class := "node"
	if exogenous {
		class += " exogenous"
	}
	if p.Latent {
		class += " latent"
	}
	fmt.Fprintf(b, `<g class="%s" data-name="%s">`, class, esc(p.Name))
	s := p.Shape
	cx, cy := s.X+s.W/2, s.Y+s.H/2
	if p.Latent {
		fmt.Fprintf(b, `<ellipse cx="%.1f" cy="%.1f" rx="%.1f" ry="%.1f"/>`, cx, cy, s.W/2, s.H/2)
		if exogenous {
			fmt.Fprintf(b, `<ellipse class="inner" cx="%.1f" cy="%.1f" rx="%.1f" ry="%.1f"/>`,
				cx, cy, s.W/2-3, s.H/2-3)
		}
	} else {
		fmt.Fprintf(b, `<rect x="%.1f" y="%.1f" width="%.1f" height="%.1f" rx="4"/>`, s.X, s.Y, s.W, s.H)
		if exogenous {
			fmt.Fprintf(b, `<rect class="inner" x="%.1f" y="%.1f" width="%.1f" height="%.1f" rx="2"/>`,
				s.X+3, s.Y+3, s.W-6, s.H-6)
		}
	}
	fmt.Fprintf(b, `<text class="name" x="%.1f" y="%.1f" font-size="%.0f">%s</text>`, cx, cy+nameSize*0.36,
		nameSize, esc(p.Name))
	drawItems(b, p)
	b.WriteString(`</g>`)
}

// drawItems lists a construct's items beside its ellipse, joined to it by
// a bracket.
func drawItems(b *strings.Builder, p Placed) {
	if !p.Latent {
		return
	}
	ib := p.ItemsBox
	midY := p.Shape.Y + p.Shape.H/2
	fmt.Fprintf(b, `<path class="bracket" d="M%.1f,%.1f H%.1f M%.1f,%.1f V%.1f"/>`,
		p.Shape.X+p.Shape.W, midY, ib.X+3, ib.X+3, ib.Y+3, ib.Y+ib.H-3)
	for i, it := range p.Items {
		fmt.Fprintf(b, `<text class="item" x="%.1f" y="%.1f" font-size="%.0f">%s</text>`,
			ib.X+itemsPadL, ib.Y+2+float64(i)*itemLineH+itemLineH/2+itemSize*0.36, itemSize, esc(it))
	}
}

// drawTier draws a tier's band and its label at the left.
func drawTier(b *strings.Builder, t TierRow) {
	fmt.Fprintf(b, `<g class="tier"><rect class="tierband" x="%.1f" y="%.1f" width="%.1f" height="%.1f" rx="6"/>`,
		t.Band.X, t.Band.Y, t.Band.W, t.Band.H)
	fmt.Fprintf(b, `<text class="tierlabel" x="%.1f" y="%.1f" font-size="%.0f">%s</text></g>`,
		t.LabelAt.X, t.LabelAt.Y, tierSize, esc(t.Label))
}

func esc(s string) string { return html.EscapeString(s) }
