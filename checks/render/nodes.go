package render

import "math"

// Sizes of a variable's shape, in user units.
const (
	boxH      = 30.0 // a measured variable's box
	boxPadX   = 10.0 // room each side of its name
	ellipseH  = 36.0 // a construct's ellipse
	ellipsePX = 16.0 // room each side of a construct's name
	itemLineH = 15.0 // one indicator item
	itemsGap  = 8.0  // between an ellipse and its list of items
	itemsPadL = 9.0  // the list's bracket, left of the item names
	portStep  = 11.0 // between two arrows meeting a shape, so that their heads stay apart
	portInset = 6.0  // a box's corners, which no arrow meets
	ellipseIn = 0.22 // the share of an ellipse's width either side where no arrow meets it
)

// size sets the footprint's and the shape's sizes (their places come
// with the row): wide enough for the name, and for ends arrows meeting
// its busier side portStep apart.
func (p *Placed) size(ends int) {
	tw := textWidth(p.Name, nameSize, false)
	need := float64(ends+1) * portStep
	if !p.Latent {
		p.Shape = Box{W: max(tw+2*boxPadX, need+2*portInset), H: boxH}
		p.Box = p.Shape
		return
	}
	p.Shape = Box{W: max(tw+2*ellipsePX, need/(1-2*ellipseIn)), H: ellipseH}
	iw := 0.0
	for _, it := range p.Items {
		iw = max(iw, textWidth(it, itemSize, false))
	}
	p.ItemsBox = Box{W: itemsPadL + iw + 2, H: float64(len(p.Items))*itemLineH + 4}
	p.Box = Box{W: p.Shape.W + itemsGap + p.ItemsBox.W, H: max(p.Shape.H, p.ItemsBox.H)}
}

// leftExtent and rightExtent are how far the footprint reaches either side
// of the shape's centre, the point the layout aligns.
func (p *Placed) leftExtent() float64  { return p.Shape.W / 2 }
func (p *Placed) rightExtent() float64 { return p.Box.W - p.Shape.W/2 }

// place puts the shape's centre at x, the footprint centred in the row
// that starts at top and is h high.
func (p *Placed) place(x, top, h float64) {
	p.Box.X, p.Box.Y = x-p.Shape.W/2, top+(h-p.Box.H)/2
	p.Shape.X, p.Shape.Y = p.Box.X, p.Box.Y+(p.Box.H-p.Shape.H)/2
	if p.Latent {
		p.ItemsBox.X = p.Shape.X + p.Shape.W + itemsGap
		p.ItemsBox.Y = p.Box.Y + (p.Box.H-p.ItemsBox.H)/2
	}
}

// portSpan is the stretch of the shape's top or bottom that arrows may
// meet: the box less its corners, or the flatter middle of the ellipse.
func (p *Placed) portSpan() (lo, hi float64) {
	inset := portInset
	if p.Latent {
		inset = p.Shape.W * ellipseIn
	}
	return p.Shape.X + inset, p.Shape.X + p.Shape.W - inset
}

// ports spreads n arrows evenly along the port span.
func (p *Placed) ports(n int) []float64 {
	lo, hi := p.portSpan()
	out := make([]float64, n)
	for k := range out {
		out[k] = lo + (hi-lo)*float64(k+1)/float64(n+1)
	}
	return out
}

// edgeY is where the vertical at x meets the shape's top (or bottom).
func (p *Placed) edgeY(x float64, top bool) float64 {
	if !p.Latent {
		if top {
			return p.Shape.Y
		}
		return p.Shape.Y + p.Shape.H
	}
	rx, ry := p.Shape.W/2, p.Shape.H/2
	cx, cy := p.Shape.X+rx, p.Shape.Y+ry
	u := (x - cx) / rx
	dy := ry * math.Sqrt(max(0, 1-u*u))
	if top {
		return cy - dy
	}
	return cy + dy
}

// shift moves a placed variable right by dx.
func (p *Placed) shift(dx float64) {
	p.Box.X += dx
	p.Shape.X += dx
	p.ItemsBox.X += dx
}
