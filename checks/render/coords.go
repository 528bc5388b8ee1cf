package render

import "math"

// placeSweeps is how many down-and-up rounds the x placement makes.
const placeSweeps = 8

// freeWeight is the pull of an item's own place when it has no link on
// the side a sweep looks at: small, so that it only fills in.
const freeWeight = 0.01

// placeX gives every item its x: rows first packed from the left, then
// rounds of sweeps down and up in which each row moves, as a whole, to
// the weighted least-squares fit of its items' targets (the weighted
// mean x of their links in the row just placed) that keeps the row's
// order and separations, and a last round toward both neighbours.
func (p *proper) placeX() {
	for r := range p.ranks {
		p.pack(r)
	}
	last := len(p.ranks) - 1
	for i := 0; i < placeSweeps; i++ {
		for r := 1; r <= last; r++ {
			p.fitRow(r, p.up, nil)
		}
		for r := last - 1; r >= 0; r-- {
			p.fitRow(r, p.down, nil)
		}
	}
	for r := 0; r <= last; r++ {
		p.fitRow(r, p.up, p.down)
	}
	p.straighten()
	p.straighten()
}

func (p *proper) pack(r int) {
	x := 0.0
	for k, id := range p.ranks[r] {
		it := &p.items[id]
		if k > 0 {
			prev := p.items[p.ranks[r][k-1]]
			x += prev.rw + sep(prev, *it) + it.lw
		}
		it.x = x
	}
}

// fitRow moves row r to the targets of its links a (and b, if given).
func (p *proper) fitRow(r int, a, b [][]link) {
	row := p.ranks[r]
	target, weight, offset := make([]float64, len(row)), make([]float64, len(row)), make([]float64, len(row))
	for k, id := range row {
		if k > 0 {
			prev, it := p.items[row[k-1]], p.items[id]
			offset[k] = offset[k-1] + prev.rw + sep(prev, it) + it.lw
		}
		s, w := 0.0, 0.0
		for _, links := range [][][]link{a, b} {
			if links == nil {
				continue
			}
			for _, e := range links[id] {
				s, w = s+e.w*p.items[e.to].x, w+e.w
			}
		}
		if w == 0 {
			s, w = freeWeight*p.items[id].x, freeWeight
		}
		target[k], weight[k] = s/w-offset[k], w
	}
	fit := isotonic(target, weight)
	for k, id := range row {
		p.items[id].x = fit[k] + offset[k]
	}
}

// isotonic is the weighted least-squares non-decreasing fit to y, by
// pool-adjacent-violators (Barlow, Bartholomew, Bremner & Brunk 1972,
// Statistical Inference under Order Restrictions, ch. 1):
//
//	minimise Σ w_k (f_k − y_k)²  subject to  f_1 ≤ f_2 ≤ … ≤ f_n
//
// An item k at x_k = f_k + c_k, with c_k the row's cumulative
// separations, then keeps its order and room.
func isotonic(y, w []float64) []float64 {
	type block struct{ sum, weight float64 }
	var blocks []block
	var sizes []int
	for k := range y {
		blocks, sizes = append(blocks, block{w[k] * y[k], w[k]}), append(sizes, 1)
		for n := len(blocks); n > 1 && blocks[n-2].sum/blocks[n-2].weight > blocks[n-1].sum/blocks[n-1].weight; n-- {
			blocks[n-2].sum += blocks[n-1].sum
			blocks[n-2].weight += blocks[n-1].weight
			sizes[n-2] += sizes[n-1]
			blocks, sizes = blocks[:n-1], sizes[:n-1]
		}
	}
	out := make([]float64, 0, len(y))
	for i, b := range blocks {
		for range sizes[i] {
			out = append(out, b.sum/b.weight)
		}
	}
	return out
}

// straighten sets each run of an arrow's virtual nodes that the rows
// allow to one x (their mean, within what the neighbours leave free), so
// that a long arrow runs straight down instead of wavering from row to
// row.
func (p *proper) straighten() {
	slot := make([]int, len(p.items))
	for _, row := range p.ranks {
		for k, id := range row {
			slot[id] = k
		}
	}
	for _, chain := range p.chain {
		if len(chain) < 4 {
			continue
		}
		virt := chain[1 : len(chain)-1]
		for i := 0; i < len(virt); {
			lo, hi := p.room(virt[i], slot)
			j := i + 1
			for ; j < len(virt); j++ {
				l2, h2 := p.room(virt[j], slot)
				if max(lo, l2) > min(hi, h2) {
					break
				}
				lo, hi = max(lo, l2), min(hi, h2)
			}
			p.align(virt[i:j], lo, hi)
			i = j
		}
	}
}

// room is how far an item may move between its neighbours.
func (p *proper) room(id int, slot []int) (lo, hi float64) {
	it, row, k := p.items[id], p.ranks[p.items[id].rank], slot[id]
	lo, hi = math.Inf(-1), math.Inf(1)
	if k > 0 {
		a := p.items[row[k-1]]
		lo = a.x + a.rw + sep(a, it) + it.lw
	}
	if k+1 < len(row) {
		b := p.items[row[k+1]]
		hi = b.x - b.lw - sep(it, b) - it.rw
	}
	return lo, hi
}

// align puts the items at their mean x, kept within [lo, hi].
func (p *proper) align(ids []int, lo, hi float64) {
	s := 0.0
	for _, id := range ids {
		s += p.items[id].x
	}
	x := min(max(s/float64(len(ids)), lo), hi)
	for _, id := range ids {
		p.items[id].x = x
	}
}
