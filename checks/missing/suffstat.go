package missing

import (
	"math"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/mat"
)

// blockRows is how many rows one rank-k update (BLAS dsyrk) takes.
const blockRows = 256

// emData is the data of one EM problem, reduced once. A pattern with many
// rows carries the weighted sums and cross-products of its observed block,
// which do not change between iterations, so that its E-step is linear in
// them; a pattern with few rows keeps its rows, completed block by block
// at each iteration.
type emData struct {
	p      int
	cols   [][]float64
	x      *mat.Dense // cols as rows, or nil; only the observed cells are read
	w      []float64  // row weights (bootstrap counts); nil: every row once
	groups []*group
	buf    []float64 // blockRows × (p+1) scratch
	cond   condition
}

// group is a pattern's share of an EM problem.
type group struct {
	obs, mis []int
	rows     []int   // rows of positive weight
	weight   float64 // Σ w over rows
	// s is Σ w [1; x_O][1; x_O]ᵀ, (|O|+1) × (|O|+1) row-major, when the
	// pattern has enough rows to be reduced; nil otherwise.
	s []float64
}

// newEMData groups the rows of cols by pattern ps under the weights w. x,
// when not nil, holds the same values as rows, which are faster to read.
func newEMData(cols [][]float64, x *mat.Dense, ps []Pattern, w []float64) *emData {
	p := len(cols)
	d := &emData{p: p, cols: cols, x: x, w: w, buf: make([]float64, blockRows*(p+1))}
	for _, pat := range ps {
		g := &group{obs: pat.obs, mis: pat.mis}
		for _, i := range pat.Rows {
			if wi := d.weight(i); wi > 0 {
				g.rows, g.weight = append(g.rows, i), g.weight+wi
			}
		}
		if len(g.rows) == 0 {
			continue
		}
		if len(g.rows) >= 2*(p+1) { // a reduction pays once it saves a few row passes
			g.s = d.crossProducts(g)
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

// crossProducts returns Σ w [1; x_O][1; x_O]ᵀ over g's rows, by rank-k
// updates on blocks of rows.
func (d *emData) crossProducts(g *group) []float64 {
	k := len(g.obs) + 1
	s := blas64.Symmetric{N: k, Stride: k, Data: make([]float64, k*k), Uplo: blas.Upper}
	r := 0
	for _, i := range g.rows {
		row := d.buf[r*k : (r+1)*k]
		sw := math.Sqrt(d.weight(i))
		row[0] = sw
		d.observed(i, g.obs, row[1:])
		for b := range g.obs {
			row[b+1] *= sw
		}
		if r++; r == blockRows {
			blas64.Syrk(blas.Trans, 1, blas64.General{Rows: r, Cols: k, Stride: k, Data: d.buf}, 1, s)
			r = 0
		}
	}
	if r > 0 {
		blas64.Syrk(blas.Trans, 1, blas64.General{Rows: r, Cols: k, Stride: k, Data: d.buf}, 1, s)
	}
	symmetrize(s.Data, k)
	return s.Data
}

// observed writes the values of row i at obs into dst[:len(obs)].
func (d *emData) observed(i int, obs []int, dst []float64) {
	if d.x != nil {
		x := d.x.RawRowView(i)
		for b, j := range obs {
			dst[b] = x[j]
		}
		return
	}
	for b, j := range obs {
		dst[b] = d.cols[j][i]
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
	p, k := d.p, len(g.obs)+1
	a := make([]float64, (p+1)*k)
	a[0] = 1
	for b, j := range g.obs {
		a[(j+1)*k+b+1] = 1
	}
	for x, j := range g.mis {
		a[(j+1)*k] = d.cond.a[x]
		copy(a[(j+1)*k+1:(j+2)*k], d.cond.b[x*(k-1):(x+1)*(k-1)])
	}
	am := blas64.General{Rows: p + 1, Cols: k, Stride: k, Data: a}
	as := blas64.General{Rows: p + 1, Cols: k, Stride: k, Data: make([]float64, (p+1)*k)}
	gs := blas64.General{Rows: k, Cols: k, Stride: k, Data: g.s}
	tt := blas64.General{Rows: p + 1, Cols: p + 1, Stride: p + 1, Data: t}
	blas64.Gemm(blas.NoTrans, blas.NoTrans, 1, am, gs, 0, as)
	blas64.Gemm(blas.NoTrans, blas.Trans, 1, as, am, 1, tt)
}

// addRows completes g's rows into the block buffer, from row r on, and
// adds full blocks to sums by a rank-k update; it returns the rows left in
// the buffer.
func (d *emData) addRows(sums blas64.Symmetric, g *group, r int) int {
	p := d.p
	for _, i := range g.rows {
		row := d.buf[r*(p+1) : (r+1)*(p+1)]
		d.observed(i, g.obs, row[1:])
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
