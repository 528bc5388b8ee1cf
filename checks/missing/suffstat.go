package missing

import (
	"math"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/mat"
)

// chunkRows is how many rows a transposed block holds (see crossProducts
// and rowBlock), which with 30 variables stays within a core's L2 cache;
// blockRows how many rows rowMajor transposes at a time.
const (
	blockRows = 256
	chunkRows = 1024
)

// emData is the data of one EM problem, reduced once. A pattern with many
// rows carries the weighted sums and cross-products of its observed block,
// which do not change between iterations, so that its E-step is linear in
// them; a pattern with few rows keeps its rows, completed block by block
// at each iteration.
type emData struct {
	p      int
	cols   [][]float64
	lay    *layout   // the observed values by pattern
	centre []float64 // the sums are taken about it, so that large means lose no digits
	w      []float64 // row weights (bootstrap counts); nil: every row once
	groups []*group
	block  rowBlock  // rows of small patterns, completed
	x      []float64 // scratch: a row
	tbuf   []float64 // (|O|+1) × chunkRows scratch
	cond   condition
}

// group is a pattern's share of an EM problem.
type group struct {
	obs, mis []int
	rows     []int   // rows of positive weight
	weight   float64 // Σ w over rows
	// pat is the pattern's index in the layout, at the positions there of
	// rows (nil: rows are all the pattern's rows, in order).
	pat int
	at  []int
	// s is Σ w [1; x_O][1; x_O]ᵀ, (|O|+1) × (|O|+1) row-major, when the
	// pattern has enough rows to be reduced; nil otherwise.
	s []float64
}

// layout holds the observed values of each pattern together, a variable
// at a time: those of pattern k's b-th observed variable, at its rows in
// order, are vals[k][b·n_k : (b+1)·n_k]. Reading a pattern's rows from it
// streams through memory, where reading them from the columns jumps.
type layout struct {
	vals [][]float64
	n    []int // n_k
}

// newLayout lays the observed values of cols out by the patterns ps.
func newLayout(cols [][]float64, ps []Pattern) *layout {
	l := &layout{vals: make([][]float64, len(ps)), n: make([]int, len(ps))}
	for k, pat := range ps {
		nk := len(pat.Rows)
		l.n[k] = nk
		v := make([]float64, len(pat.obs)*nk)
		for b, j := range pat.obs {
			col, out := cols[j], v[b*nk:(b+1)*nk]
			for r, i := range pat.Rows {
				out[r] = col[i]
			}
		}
		l.vals[k] = v
	}
	return l
}

// newEMData groups the rows of cols by pattern ps under the weights w; lay
// is cols laid out by ps, which the reductions and iterations read, and the
// sums are taken about centre (EM's starting means).
func newEMData(cols [][]float64, lay *layout, ps []Pattern, w, centre []float64) *emData {
	p := len(cols)
	d := &emData{p: p, cols: cols, lay: lay, w: w, centre: centre}
	for k, pat := range ps {
		g := &group{obs: pat.obs, mis: pat.mis, pat: k}
		if w == nil {
			g.rows, g.weight = pat.Rows, float64(len(pat.Rows))
		} else {
			for r, i := range pat.Rows {
				if wi := w[i]; wi > 0 {
					g.rows, g.at, g.weight = append(g.rows, i), append(g.at, r), g.weight+wi
				}
			}
		}
		if len(g.rows) == 0 {
			continue
		}
		if reducible(len(g.rows), p) {
			g.s = d.crossProducts(g)
		}
		d.groups = append(d.groups, g)
	}
	return d
}

// reducible says whether a pattern of rows rows (of p variables) is worth
// reducing to its sums and cross-products: once that saves a few passes
// over its rows.
func reducible(rows, p int) bool { return rows >= 2*(p+1) }

func (d *emData) weight(i int) float64 {
	if d.w == nil {
		return 1
	}
	return d.w[i]
}

// crossProducts returns Σ w [1; x_O − c_O][1; x_O − c_O]ᵀ over g's rows, c
// the centre. The rows are gathered a block at a time, transposed (a
// variable per row, scaled by √w), so that the rank-k update (BLAS dsyrk)
// runs as long dot products.
func (d *emData) crossProducts(g *group) []float64 {
	k := len(g.obs) + 1
	s := blas64.Symmetric{N: k, Stride: k, Data: make([]float64, k*k), Uplo: blas.Upper}
	d.tbuf = grow(d.tbuf, k*chunkRows)
	for start := 0; start < len(g.rows); start += chunkRows {
		end := min(start+chunkRows, len(g.rows))
		block := d.tbuf[:k*(end-start)]
		d.gather(block, g, start, end)
		blas64.Syrk(blas.NoTrans, 1, blas64.General{Rows: k, Cols: end - start, Stride: end - start, Data: block}, 1, s)
	}
	symmetrize(s.Data, k)
	return s.Data
}

// gather writes g's rows from..to−1, transposed, into dst ((|O|+1) ×
// (to − from), row-major): first √w, then each observed variable, less
// the centre, times √w. Without weights (g.at nil) √w is one.
func (d *emData) gather(dst []float64, g *group, from, to int) {
	c := to - from
	sw := dst[:c]
	for r, i := range g.rows[from:to] {
		sw[r] = math.Sqrt(d.weight(i))
	}
	for b, j := range g.obs {
		out, shift := dst[(b+1)*c:(b+2)*c], d.centre[j]
		nk := d.lay.n[g.pat]
		col := d.lay.vals[g.pat][b*nk : (b+1)*nk]
		if g.at == nil { // every row of the pattern, once
			for r, v := range col[from:to] {
				out[r] = v - shift
			}
			continue
		}
		for r, q := range g.at[from:to] { // the rows of positive weight
			out[r] = (col[q] - shift) * sw[r]
		}
	}
}

// observedInto writes the values of g's q-th row into x at its observed
// variables.
func (d *emData) observedInto(g *group, q int, x []float64) {
	if g.at != nil {
		q = g.at[q]
	}
	v, nk := d.lay.vals[g.pat], d.lay.n[g.pat]
	for b, j := range g.obs {
		x[j] = v[b*nk+q]
	}
}

// rowBlock gathers rows [√w; √w x], transposed ((p+1) × chunkRows, a
// variable per row), and adds them to sums, Σ w [1; x][1; x]ᵀ (upper
// triangle), by a rank-k update (BLAS dsyrk, as long dot products) each
// time it fills.
type rowBlock struct {
	p, r int
	data []float64
	sums blas64.Symmetric
}

// reset empties the block and zeroes the sums, making them when needed.
func (b *rowBlock) reset(p int) {
	if b.p != p || b.data == nil {
		b.p, b.data = p, make([]float64, (p+1)*chunkRows)
		b.sums = blas64.Symmetric{N: p + 1, Stride: p + 1, Data: make([]float64, (p+1)*(p+1)), Uplo: blas.Upper}
	}
	b.r = 0
	clear(b.sums.Data)
}

// add adds the row x of weight sw².
func (b *rowBlock) add(x []float64, sw float64) {
	b.data[b.r] = sw
	for j, v := range x {
		b.data[(j+1)*chunkRows+b.r] = v * sw
	}
	if b.r++; b.r == chunkRows {
		b.flush()
	}
}

func (b *rowBlock) flush() {
	if b.r > 0 {
		blas64.Syrk(blas.NoTrans, 1, blas64.General{Rows: b.p + 1, Cols: b.r, Stride: chunkRows, Data: b.data}, 1, b.sums)
		b.r = 0
	}
}

// addTo adds the sums of every row added since reset to t, (p+1) × (p+1)
// with both triangles.
func (b *rowBlock) addTo(t []float64) {
	b.flush()
	k := b.p + 1
	for x := range k {
		for y := x; y < k; y++ {
			v := b.sums.Data[x*k+y]
			t[x*k+y] += v
			if y != x {
				t[y*k+x] += v
			}
		}
	}
}

func symmetrize(s []float64, k int) {
	for x := range k {
		for y := range x {
			s[x*k+y] = s[y*k+x]
		}
	}
}

// step is one E and M step from (mean, cov): the expected complete-data
// statistics T = Σ w [1; x − c][1; x − c]ᵀ about the centre c, then the
// mean and the ML (divisor Σ w) covariance they give.
func (d *emData) step(mean []float64, cov *mat.SymDense) ([]float64, *mat.SymDense, error) {
	p := d.p
	prec, err := precision(cov)
	if err != nil {
		return nil, nil, err
	}
	full := fullSymmetric(prec)
	mc := make([]float64, p) // the mean about the centre
	for j := range mc {
		mc[j] = mean[j] - d.centre[j]
	}
	t := make([]float64, (p+1)*(p+1))
	d.block.reset(p)
	for _, g := range d.groups {
		if err := d.cond.setFor(g.s != nil, prec, full, mc, g.obs, g.mis); err != nil {
			return nil, nil, err
		}
		d.addConditionalCov(t, g)
		if g.s != nil {
			d.addReduced(t, g)
			continue
		}
		d.addRows(g)
	}
	d.block.addTo(t)
	next, cov, err := moments(t, p)
	for j := range next {
		next[j] += d.centre[j]
	}
	return next, cov, err
}

// addConditionalCov adds weight · C to T's block of the missing variables.
func (d *emData) addConditionalCov(t []float64, g *group) {
	nm := len(g.mis)
	for x, i := range g.mis {
		for y, j := range g.mis {
			t[(i+1)*(d.p+1)+j+1] += g.weight * d.cond.c[x*nm+y]
		}
	}
}

// addReduced adds A S Aᵀ to T, where A maps [1; x_O] to [1; E(x | x_O)]:
// the identity on the observed variables, (a, B) on the missing ones.
func (d *emData) addReduced(t []float64, g *group) {
	addSandwich(t, d.p, reducedMap(d.p, g, &d.cond), g.s)
}

// addRows adds g's rows, about the centre and completed by their
// conditional means, to the row block.
func (d *emData) addRows(g *group) {
	d.x = grow(d.x, d.p)
	for q, i := range g.rows {
		d.observedInto(g, q, d.x)
		for _, j := range g.obs {
			d.x[j] -= d.centre[j]
		}
		d.cond.predict(d.x)
		d.block.add(d.x, math.Sqrt(d.weight(i)))
	}
}

// moments turns T = Σ w [1; x][1; x]ᵀ into the mean and the ML covariance.
func moments(t []float64, p int) ([]float64, *mat.SymDense, error) {
	n := t[0]
	mean := make([]float64, p)
	for j := range p {
		mean[j] = t[j+1] / n
	}
	cov := make([]float64, p*p)
	for i := range p {
		for j := range p {
			cov[i*p+j] = t[(i+1)*(p+1)+j+1]/n - mean[i]*mean[j]
		}
	}
	return mean, mat.NewSymDense(p, cov), nil
}

// observedTwice says whether every variable is observed in at least two
// rows of positive weight.
func (d *emData) observedTwice() bool {
	count := make([]int, d.p)
	for _, g := range d.groups {
		for _, j := range g.obs {
			count[j] += len(g.rows)
		}
	}
	for _, k := range count {
		if k < 2 {
			return false
		}
	}
	return true
}

// rowMajor lays cols out as rows, a block of rows at a time.
func rowMajor(cols [][]float64) *mat.Dense {
	n, p := rows(cols), len(cols)
	x := mat.NewDense(n, p, nil)
	data := x.RawMatrix().Data
	for start := 0; start < n; start += blockRows {
		end := min(start+blockRows, n)
		for j, c := range cols {
			for i, v := range c[start:end] {
				data[(start+i)*p+j] = v
			}
		}
	}
	return x
}
