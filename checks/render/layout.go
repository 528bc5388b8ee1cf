package render

import (
	"errors"
	"fmt"
	"strings"
)

// LayoutInput is what a drawing is laid out from: the variables, the
// arrows (every arrow any drawing of this layout shows, so that the
// declared graph and its edited versions share one layout), and two
// optional inputs: tiers (rows earliest first, each drawn as its own
// labelled row; arrows within a tier allowed) and latent constructs
// (each drawn as an ellipse with its indicator items listed beside it).
type LayoutInput struct {
	Nodes      []string
	Arcs       []LayoutArc
	Tiers      [][]string // optional; when given, every node in exactly one tier
	TierLabels []string   // optional, one per tier; "tier 1", "tier 2" … by default
	Latents    []Latent   // optional
}

// LayoutArc is one arrow to lay out, with the tags any drawing may hang on
// it (claim IDs, edit words); its tag's room fits the widest.
type LayoutArc struct {
	From, To string
	Tags     []string
}

// Latent is a construct measured by its indicator items.
type Latent struct {
	Name  string
	Items []string
}

// Pt is a point in user units.
type Pt struct{ X, Y float64 }

// Box is an axis-parallel rectangle: top-left corner and size.
type Box struct{ X, Y, W, H float64 }

// Placed is one variable of a layout: its row, its footprint (the shape
// and, for a construct, the list of items beside it), the shape's box
// and, for a construct, the box of its item list.
type Placed struct {
	Name     string
	Row      int
	Box      Box // the footprint
	Shape    Box // the box, or the ellipse's bounding box
	Latent   bool
	Items    []string
	ItemsBox Box
}

// Route is where one arrow runs, from its tail's shape to its head's:
// a start and a chain of segments (lines and cubic curves), and the box
// of its tag with the point of the route the tag hangs from.
type Route struct {
	From, To string
	Start    Pt
	Segs     []Seg
	Tag      *Box
	Pole     Pt
}

// Seg is a line (Curve false) or a cubic Bézier curve to To.
type Seg struct {
	C1, C2, To Pt
	Curve      bool
}

// TierRow is a tier's band across the drawing and its label.
type TierRow struct {
	Label     string
	Band      Box
	LabelAt   Pt // the label's baseline start
	LabelBox  Box
	Variables []string
}

// Layout is a layered drawing of a directed graph: causes above effects
// (or tiers top to bottom), every arrow routed around the boxes.
type Layout struct {
	Nodes  []Placed // in the order of the input nodes
	Routes []Route  // in the order of the input arcs
	Tiers  []TierRow
	Width  float64
	Height float64
	Rows   int // rows of variables
	index  map[string]int
	route  map[[2]string]int
}

// LayOut lays a graph out in layers with crossing reduction, the
// framework of Sugiyama, Tagawa & Toda (1981, IEEE Trans. SMC 11(2):
// 109–125) with the refinements of Gansner, Koutsofios, North & Vo (1993,
// IEEE Trans. Softw. Eng. 19(3):214–230):
//
//	cycles broken by reversing the back arcs of a depth-first search;
//	rows by longest path (or by tier), a tag row between every two rows;
//	long arrows cut into chains of virtual nodes, one per row crossed,
//	each tag a virtual node of its own width (Gansner et al. §4);
//	order in each row by barycentre sweeps down and up, each followed by
//	transposition of neighbours, the best order by crossings kept;
//	x by weighted least squares under order and separation, solved row by
//	row by pool-adjacent-violators (Barlow et al. 1972), virtual chains
//	weighted most (the priority idea of Sugiyama et al.);
//	arrows as vertical runs through rows and S-curves between them.
//
// Every arrow thus runs through rows only where it has a place of its
// own, and between rows only where nothing else is, so that no arrow
// crosses a box or a tag. An arrow naming an unknown variable, a tier
// list that does not name every variable once, or a construct that is
// not a variable is an error.
func LayOut(in LayoutInput) (*Layout, error) {
	l, err := newLayout(in)
	if err != nil {
		return nil, err
	}
	arcs, err := l.arcIndices(in.Arcs)
	if err != nil {
		return nil, err
	}
	tierOf, err := l.tierIndices(in.Tiers)
	if err != nil {
		return nil, err
	}
	l.initTiers(in)
	rank, rev := ranks(len(l.Nodes), arcs, tierOf)
	if n := properSize(rank, arcs, len(l.Tiers) == 0); n > MaxLayoutItems {
		return nil, fmt.Errorf("%w: %d variables and %d arrows would make %d items to order, more than %d",
			ErrTooLarge, len(l.Nodes), len(arcs), n, MaxLayoutItems)
	}
	l.sizeNodes(arcs, rank, rev)
	p := buildProper(l, arcs, rank, rev, in.Arcs)
	p.order()
	p.placeX()
	l.finish(p, in)
	return l, nil
}

// MaxLayoutItems bounds the variables and virtual nodes a layout orders:
// past it the ordering would take seconds, and the drawing would be too
// dense to read.
const MaxLayoutItems = 4000

// ErrTooLarge is the error of a graph too large to draw.
var ErrTooLarge = errors.New("render: the graph is too large to draw")

// properSize is how many items the layered graph would have: every
// variable, and for each arrow one virtual node in every rank it crosses
// (two a row: the tag rank and the variables' rank).
func properSize(rank []int, arcs [][2]int, compact bool) int {
	if compact {
		rank = compactRanks(rank)
	}
	n := len(rank)
	for _, a := range arcs {
		if d := rank[a[0]] - rank[a[1]]; d != 0 {
			n += 2*max(d, -d) - 1
		}
	}
	return n
}

// Errors of a layout's input.
const (
	badConstruct = "render: construct %s is not a variable of the graph, has no items or is listed twice"
	badTier      = "render: tier %d names %s, not a variable of the graph or already in a tier"
)

// newLayout indexes the variables and checks the constructs.
func newLayout(in LayoutInput) (*Layout, error) {
	l := &Layout{index: make(map[string]int, len(in.Nodes)), route: map[[2]string]int{}}
	for i, n := range in.Nodes {
		if _, dup := l.index[n]; dup {
			return nil, fmt.Errorf("render: variable %s listed twice", n)
		}
		l.index[n] = i
		l.Nodes = append(l.Nodes, Placed{Name: n})
	}
	for _, lv := range in.Latents {
		i, ok := l.index[lv.Name]
		if !ok || len(lv.Items) == 0 || l.Nodes[i].Latent {
			return nil, fmt.Errorf(badConstruct, lv.Name)
		}
		for _, it := range lv.Items {
			if _, clash := l.index[it]; clash {
				return nil, fmt.Errorf("render: item %s of construct %s is also a variable of the graph", it, lv.Name)
			}
		}
		l.Nodes[i].Latent, l.Nodes[i].Items = true, lv.Items
	}
	return l, nil
}

// sizeNodes sizes every variable for its name and for the arrows that
// meet its top (from above, and within its row) and its bottom.
func (l *Layout) sizeNodes(arcs [][2]int, rank []int, rev []bool) {
	top, bottom := make([]int, len(l.Nodes)), make([]int, len(l.Nodes))
	for k, a := range arcs {
		u, v := a[0], a[1]
		if rev[k] {
			u, v = v, u
		}
		if rank[u] == rank[v] {
			top[u]++
		} else {
			bottom[u]++
		}
		top[v]++
	}
	for i := range l.Nodes {
		l.Nodes[i].size(max(top[i], bottom[i]))
	}
}

func (l *Layout) arcIndices(arcs []LayoutArc) ([][2]int, error) {
	out := make([][2]int, len(arcs))
	for k, a := range arcs {
		u, ok1 := l.index[a.From]
		v, ok2 := l.index[a.To]
		if !ok1 || !ok2 || u == v {
			return nil, fmt.Errorf("render: arc %s names a variable not among the nodes, or joins one to itself",
				arrow([2]string{a.From, a.To}))
		}
		key := [2]string{a.From, a.To}
		if _, dup := l.route[key]; dup {
			return nil, fmt.Errorf("render: arc %s listed twice", arrow(key))
		}
		l.route[key], out[k] = k, [2]int{u, v}
	}
	return out, nil
}

// tierIndices is each variable's tier, or nil without tiers.
func (l *Layout) tierIndices(tiers [][]string) ([]int, error) {
	if len(tiers) == 0 {
		return nil, nil
	}
	tierOf := make([]int, len(l.Nodes))
	for i := range tierOf {
		tierOf[i] = -1
	}
	for t, names := range tiers {
		for _, n := range names {
			i, ok := l.index[n]
			if !ok || tierOf[i] >= 0 {
				return nil, fmt.Errorf(badTier, t+1, n)
			}
			tierOf[i] = t
		}
	}
	var missing []string
	for i, t := range tierOf {
		if t < 0 {
			missing = append(missing, l.Nodes[i].Name)
		}
	}
	if len(missing) > 0 {
		return nil, fmt.Errorf("render: the tiers leave out %s", strings.Join(missing, ", "))
	}
	return tierOf, nil
}

// initTiers names each tier's row.
func (l *Layout) initTiers(in LayoutInput) {
	for t, names := range in.Tiers {
		label := fmt.Sprintf("tier %d", t+1)
		if t < len(in.TierLabels) && in.TierLabels[t] != "" {
			label = in.TierLabels[t]
		}
		l.Tiers = append(l.Tiers, TierRow{Label: label, Variables: names})
	}
}

// At returns the placed variable of a name.
func (l *Layout) At(name string) (Placed, bool) {
	i, ok := l.index[name]
	if !ok {
		return Placed{}, false
	}
	return l.Nodes[i], true
}

// RouteOf is the route of the arrow from → to, run the other way when
// only to → from was laid out (an arrow an edit reversed).
func (l *Layout) RouteOf(from, to string) (Route, bool) {
	if k, ok := l.route[[2]string{from, to}]; ok {
		return l.Routes[k], true
	}
	if k, ok := l.route[[2]string{to, from}]; ok {
		return l.Routes[k].reversed(), true
	}
	return Route{}, false
}

// reversed is the same route run from its head to its tail.
func (r Route) reversed() Route {
	out := Route{From: r.To, To: r.From, Tag: r.Tag, Pole: r.Pole}
	pts := []Pt{r.Start}
	for _, s := range r.Segs {
		pts = append(pts, s.To)
	}
	out.Start = pts[len(pts)-1]
	for i := len(r.Segs) - 1; i >= 0; i-- {
		s := r.Segs[i]
		out.Segs = append(out.Segs, Seg{C1: s.C2, C2: s.C1, To: pts[i], Curve: s.Curve})
	}
	return out
}
