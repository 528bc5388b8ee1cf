package render

import (
	"slices"
	"sort"
)

// orderSweeps is how many barycentre sweeps the ordering makes (Gansner
// et al. 1993 use 24).
const orderSweeps = 24

// transposePasses bounds the passes of one transposition.
const transposePasses = 12

// order reduces crossings: starting from an order by barycentres of the
// rows above, it sweeps down and up, each row sorted by the mean position
// of its neighbours in the row just swept (Sugiyama et al. 1981), then
// swaps neighbours while that lowers the crossings (transposition,
// Gansner et al. 1993, §3); the order with the fewest crossings is kept.
func (p *proper) order() {
	pos := make([]float64, len(p.items))
	p.sweep(pos, true)
	best, bestC := p.snapshot(), p.crossings()
	for i := 0; i < orderSweeps && bestC > 0; i++ {
		p.sweep(pos, i%2 == 1)
		p.transpose()
		if c := p.crossings(); c < bestC {
			best, bestC = p.snapshot(), c
		}
	}
	p.ranks = best
}

func (p *proper) snapshot() [][]int {
	out := make([][]int, len(p.ranks))
	for r, row := range p.ranks {
		out[r] = slices.Clone(row)
	}
	return out
}

// sweep sorts every row by the barycentre of its links to the row before
// it in the sweep's direction; an item without such links keeps its
// place.
func (p *proper) sweep(pos []float64, down bool) {
	p.positions(pos)
	rs := make([]int, len(p.ranks))
	for i := range rs {
		rs[i] = i
	}
	if !down {
		slices.Reverse(rs)
	}
	bc := make([]float64, len(p.items))
	for _, r := range rs[1:] {
		links := p.up
		if !down {
			links = p.down
		}
		p.sortRow(r, links, pos, bc)
		for k, id := range p.ranks[r] {
			pos[id] = float64(k)
		}
	}
}

func (p *proper) positions(pos []float64) {
	for _, row := range p.ranks {
		for k, id := range row {
			pos[id] = float64(k)
		}
	}
}

// sortRow orders a row by barycentre, leaving items without links in
// their slots.
func (p *proper) sortRow(r int, links [][]link, pos, bc []float64) {
	row := p.ranks[r]
	var moving []int
	for _, id := range row {
		if len(links[id]) == 0 {
			continue
		}
		s := 0.0
		for _, e := range links[id] {
			s += pos[e.to]
		}
		bc[id] = s / float64(len(links[id]))
		moving = append(moving, id)
	}
	sort.SliceStable(moving, func(i, j int) bool { return bc[moving[i]] < bc[moving[j]] })
	k := 0
	for i, id := range row {
		if len(links[id]) > 0 {
			row[i] = moving[k]
			k++
		}
	}
}

// transpose swaps neighbours in each row while that lowers the crossings
// with the rows above and below.
func (p *proper) transpose() {
	pos := make([]float64, len(p.items))
	p.positions(pos)
	for improved, pass := true, 0; improved && pass < transposePasses; pass++ {
		improved = false
		for _, row := range p.ranks {
			for k := 0; k+1 < len(row); k++ {
				v, w := row[k], row[k+1]
				if p.pairCrossings(w, v, pos) < p.pairCrossings(v, w, pos) {
					row[k], row[k+1] = w, v
					pos[v], pos[w] = pos[w], pos[v]
					improved = true
				}
			}
		}
	}
}

// pairCrossings counts the crossings between the links of v and w with v
// on the left.
func (p *proper) pairCrossings(v, w int, pos []float64) int {
	n := 0
	for _, links := range [][][]link{p.up, p.down} {
		for _, a := range links[v] {
			for _, b := range links[w] {
				if pos[a.to] > pos[b.to] {
					n++
				}
			}
		}
	}
	return n
}

// crossings counts the crossing pairs of links between every two
// neighbouring rows, by inversions of the lower ends in the order of the
// upper ends (Barth, Jünger & Mutzel 2004, counted with a Fenwick tree).
func (p *proper) crossings() int {
	pos := make([]int, len(p.items))
	for _, row := range p.ranks {
		for k, id := range row {
			pos[id] = k
		}
	}
	total := 0
	for r := 0; r+1 < len(p.ranks); r++ {
		var ends []int
		for _, id := range p.ranks[r] {
			var lower []int
			for _, e := range p.down[id] {
				lower = append(lower, pos[e.to])
			}
			slices.Sort(lower)
			ends = append(ends, lower...)
		}
		total += inversions(ends, len(p.ranks[r+1]))
	}
	return total
}

// inversions counts the pairs i < j with xs[i] > xs[j], xs in [0, n).
func inversions(xs []int, n int) int {
	tree := make([]int, n+1)
	count := 0
	for i, x := range xs {
		seen := 0 // how many so far are ≤ x
		for j := x + 1; j > 0; j -= j & -j {
			seen += tree[j]
		}
		count += i - seen
		for j := x + 1; j <= n; j += j & -j {
			tree[j]++
		}
	}
	return count
}
