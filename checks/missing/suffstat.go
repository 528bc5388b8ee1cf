package missing

import (
	"math"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/mat"
)

// blockRows is how many rows one rank-k update (BLAS dsyrk) of rows
// takes; chunkRows how many a transposed block holds (see crossProducts),
// which with 30 variables stays within a core's L2 cache.
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
	lay    *layout   // the observed values by pattern, or nil: read from cols
	w      []float64 // row weights (bootstrap counts); nil: every row once
	groups []*group
	buf    []float64 // blockRows × (p+1) scratch
	tbuf   []float64 // (p+1) × chunkRows scratch
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

// newEMData groups the rows of cols by pattern ps under the weights w. lay,
// when not nil, is cols laid out by ps, which is faster to read.
func newEMData(cols [][]float64, lay *layout, ps []Pattern, w []float64) *emData {
	p := len(cols)
	d := &emData{p: p, cols: cols, lay: lay, w: w, buf: make([]float64, blockRows*(p+1))}
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
		if len(g.rows) >= 2*(p+1) { // a reduction pays once it saves a few row passes
			g.s = d.crossProducts(g, nil)
		}
		d.groups = append(d.groups, g)
	}
	return d
}

func (d *emData) weight(i int) float64 {
	if d.w == nil {
		return 1
	}
	return d.w[i]
}

// crossProducts returns Σ w [1; x_O][1; x_O]ᵀ over g's rows, about centre
// when it is not nil (x_O − centre_O then). The rows are gathered a block
// at a time, transposed (a variable per row, scaled by √w), so that the
// rank-k update (BLAS dsyrk) runs as long dot products.
func (d *emData) crossProducts(g *group, centre []float64) []float64 {
	k := len(g.obs) + 1
	s := blas64.Symmetric{N: k, Stride: k, Data: make([]float64, k*k), Uplo: blas.Upper}
	d.tbuf = grow(d.tbuf, k*chunkRows)
	for start := 0; start < len(g.rows); start += chunkRows {
		end := min(start+chunkRows, len(g.rows))
		block := d.tbuf[:k*(end-start)]
		d.gather(block, g, start, end, centre)
		blas64.Syrk(blas.NoTrans, 1, blas64.General{Rows: k, Cols: end - start, Stride: end - start, Data: block}, 1, s)
	}
	symmetrize(s.Data, k)
	return s.Data
}

// gather writes g's rows from..to−1, transposed, into dst ((|O|+1) ×
// (to − from), row-major): first √w, then each observed variable, less
// centre[j] when centre is not nil, times √w.
func (d *emData) gather(dst []float64, g *group, from, to int, centre []float64) {
	c := to - from
	sw := dst[:c]
	for r, i := range g.rows[from:to] {
		sw[r] = math.Sqrt(d.weight(i))
	}
	for b, j := range g.obs {
		out, shift := dst[(b+1)*c:(b+2)*c], 0.0
		if centre != nil {
			shift = centre[j]
		}
		switch {
		case d.lay == nil:
			col := d.cols[j]
			for r, i := range g.rows[from:to] {
				out[r] = col[i] - shift
			}
		case g.at == nil:
			nk := d.lay.n[g.pat]
			for r, v := range d.lay.vals[g.pat][b*nk+from : b*nk+to] {
				out[r] = v - shift
			}
		default:
			nk := d.lay.n[g.pat]
			col := d.lay.vals[g.pat][b*nk : (b+1)*nk]
			for r, q := range g.at[from:to] {
				out[r] = col[q] - shift
			}
		}
		if d.w != nil {
			for r := range out {
				out[r] *= sw[r]
			}
		}
	}
}

// observed writes the values of g's q-th row at its observed variables
// into dst[:len(g.obs)].
func (d *emData) observed(g *group, q int, dst []float64) {
	if d.lay == nil {
		i := g.rows[q]
		for b, j := range g.obs {
			dst[b] = d.cols[j][i]
		}
		return
	}
	if g.at != nil {
		q = g.at[q]
	}
	v, nk := d.lay.vals[g.pat], d.lay.n[g.pat]
	for b := range g.obs {
		dst[b] = v[b*nk+q]
	}
}

// spread moves x[:len(obs)] to x[obs], from the last, which never
// overwrites a value still to move since obs is increasing.
func spread(x []float64, obs []int) {
	for b := len(obs) - 1; b >= 0; b-- {
		x[obs[b]] = x[b]
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
// statistics T = Σ w [1; x][1; x]ᵀ, then the mean and the ML (divisor Σ w)
// covariance they give.
func (d *emData) step(mean []float64, cov *mat.SymDense) ([]float64, *mat.SymDense, error) {
	p := d.p
	prec, err := precision(cov)
	if err != nil {
		return nil, nil, err
	}
	t := make([]float64, (p+1)*(p+1))
	rowSums := blas64.Symmetric{N: p + 1, Stride: p + 1, Data: make([]float64, (p+1)*(p+1)), Uplo: blas.Upper}
	r := 0
	for _, g := range d.groups {
		if err := d.cond.set(prec, mean, g.obs, g.mis); err != nil {
			return nil, nil, err
		}
		d.addConditionalCov(t, g)
		if g.s != nil {
			d.addReduced(t, g)
			continue
		}
		r = d.addRows(rowSums, g, r)
	}
	if r > 0 {
		blas64.Syrk(blas.Trans, 1, blas64.General{Rows: r, Cols: p + 1, Stride: p + 1, Data: d.buf}, 1, rowSums)
	}
	symmetrize(rowSums.Data, p+1)
	for i, v := range rowSums.Data {
		t[i] += v
	}
	return moments(t, p)
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

// addRows completes g's rows into the block buffer, from row r on, and
// adds full blocks to sums by a rank-k update; it returns the rows left in
// the buffer.
func (d *emData) addRows(sums blas64.Symmetric, g *group, r int) int {
	p := d.p
	for q, i := range g.rows {
		row := d.buf[r*(p+1) : (r+1)*(p+1)]
		d.observed(g, q, row[1:])
		spread(row[1:], g.obs)
		d.cond.predict(row[1:])
		sw := math.Sqrt(d.weight(i))
		row[0] = sw
		for j := 1; j <= p; j++ {
			row[j] *= sw
		}
		if r++; r == blockRows {
			block := blas64.General{Rows: r, Cols: p + 1, Stride: p + 1, Data: d.buf}
			blas64.Syrk(blas.Trans, 1, block, 1, sums)
			r = 0
		}
	}
	return r
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
