package nearby

import (
	"cmp"
	"slices"
)

// pool holds the search's candidate edits: every edit, allowed or not,
// whose ΔBIC is negative, in one bucket per node w: the edits whose ΔBIC
// depends on w's row (improving), best first. An edit's ΔBIC is fixed
// while its rows are: a bucket is made anew when its row changes, and an
// edit that also depends on another row (a reversal) is stale once that
// row has changed since (its version stamps), and is dropped when met.
// The valid edits are those the search would find by rescoring every edit
// after each step, at the cost of the changed rows.
type pool struct {
	g       *graph
	r       *rows
	kn      *knowledge
	version []int
	buckets [][]pooled
}

// pooled is a candidate edit with its ΔBIC, its place in eachEdit's order
// (by From, then To, then add, remove, reverse) and the versions of the
// rows it depends on when it was scored.
type pooled struct {
	e          Edit
	d          float64
	order      int
	vTo, vFrom int
}

func newPool(g *graph, r *rows, kn *knowledge) *pool {
	p := &pool{g: g, r: r, kn: kn, version: make([]int, g.n), buckets: make([][]pooled, g.n)}
	for w := range g.n {
		p.fill(w)
	}
	return p
}

// best is the allowed edit that lowers BIC most, ties to the first in
// eachEdit's order: the best of the buckets' first allowed edits.
func (p *pool) best() (Edit, bool) {
	var best pooled
	found := false
	for w := range p.buckets {
		if c, ok := p.first(w); ok && (!found || comparePooled(c, best) < 0) {
			best, found = c, true
		}
	}
	return best.e, found
}

// first is bucket w's first allowed edit that is not stale; the stale
// ones passed on the way are dropped.
func (p *pool) first(w int) (pooled, bool) {
	b := p.buckets[w]
	keep, dropped := b[:0], false
	for i, c := range b {
		if p.stale(c) {
			dropped = true
			continue
		}
		if dropped {
			keep = append(keep, c)
		} else {
			keep = b[:i+1]
		}
		if p.kn.allowed(p.g, c.e) {
			if dropped {
				p.buckets[w] = append(keep, b[i+1:]...)
			}
			return c, true
		}
	}
	p.buckets[w] = keep
	return pooled{}, false
}

func (p *pool) stale(c pooled) bool {
	return p.version[c.e.To] != c.vTo || c.e.Op == Reverse && p.version[c.e.From] != c.vFrom
}

// refresh follows the edit e just made: the rows it changed get new
// versions and new buckets.
func (p *pool) refresh(e Edit) {
	p.version[e.To]++
	if e.Op == Reverse {
		p.version[e.From]++
		p.fill(e.From)
	}
	p.fill(e.To)
}

// fill scores bucket w anew: the edits whose ΔBIC depends on node w's row
// and is negative (arrows into w added, removed or reversed, and w's own
// arrows reversed, which add to w's parents), best first. Edits not
// allowed now are kept too: they may become allowed after later steps.
func (p *pool) fill(w int) {
	g, r := p.g, p.r
	b := p.buckets[w][:0]
	if r.m.in(w) {
		keep := func(e Edit) {
			if d := r.delta(e); d < -improvement {
				b = append(b, pooled{e: e, d: d, order: (e.From*g.n+e.To)*3 + opRank(e.Op),
					vTo: p.version[e.To], vFrom: p.version[e.From]})
			}
		}
		for u := range g.n {
			if u == w || !r.m.in(u) {
				continue
			}
			switch {
			case g.isPa[w].has(u):
				keep(Edit{Op: Remove, From: u, To: w})
				keep(Edit{Op: Reverse, From: u, To: w})
			case g.isPa[u].has(w): // not allowed while w → u stands, kept for after its removal
				keep(Edit{Op: Reverse, From: w, To: u})
				keep(Edit{Op: Add, From: u, To: w})
			default:
				keep(Edit{Op: Add, From: u, To: w})
			}
		}
	}
	slices.SortFunc(b, comparePooled)
	p.buckets[w] = b
}

// comparePooled orders edits by ΔBIC, ties by eachEdit's order.
func comparePooled(a, b pooled) int {
	return cmp.Or(cmp.Compare(a.d, b.d), cmp.Compare(a.order, b.order))
}
