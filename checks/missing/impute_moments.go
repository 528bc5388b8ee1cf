package missing

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/mat"
)

// ImputeMoments draws the same M completed datasets as ImputeEach, from
// the same streams, and hands use only the means and the covariance matrix
// (divisor n − 1) of each, without laying a dataset out. For a pattern
// with many rows, the completed rows are [1; x] = A u + P e, u = [1; x_O],
// A mapping u to the conditional mean, e = L z the drawn residual and P
// placing it at the missing variables; their cross-products are then
//
//	A S Aᵀ + A Eᵀ + E Aᵀ + P L (Σ z zᵀ) Lᵀ Pᵀ,  S = Σ u uᵀ,  E = P L Σ z uᵀ,
//
// where S is computed once for all imputations and Σ z uᵀ costs |M| · |O|
// per row instead of the p² of a row's own cross-products. The rows of a
// pattern with few rows are completed and added one block at a time. All
// sums are taken about start's means, so that the covariance loses no
// precision to large means.
//
// Rounding imputed binary values is not linear in the draws, so
// ImputeMoments refuses a variable marked binary that has a missing value;
// ImputeEach imputes those. The workers and streams are ImputeEach's, and
// use is called as there, from the workers, in no fixed order.
func ImputeMoments(ctx context.Context, cols [][]float64, start *EMResult, opt ImputeOptions,
	use func(k int, mean []float64, cov *mat.SymDense) error) error {
	for j, isBin := range opt.Binary {
		if isBin && j < len(cols) && hasNaN(cols[j]) {
			return fmt.Errorf("missing: variable %d is binary and has missing values: its imputations must be rounded row by row (ImputeEach)", j)
		}
	}
	if rows(cols) < 2 {
		return ErrNoData
	}
	if err := ctx.Err(); err != nil {
		return err
	}
	ps := Patterns(cols)
	lay := newLayout(cols, ps) // shared, read only
	full := newCompleted(cols, lay, ps, start.Mean)
	return runImputations(ctx, opt, func() imputeFunc {
		w := newImputer(cols, ps, lay, nil)
		c := &completer{completed: full}
		return func(ctx context.Context, k int, opt ImputeOptions) error {
			rng := imputationStream(opt.Seed, k)
			theta, err := w.bootstrapEM(ctx, start, opt.EM, rng)
			var mean []float64
			var cov *mat.SymDense
			if err == nil {
				mean, cov, err = c.moments(theta, rng)
			}
			if err != nil {
				return fmt.Errorf("missing: imputation %d: %w", k+1, err)
			}
			return use(k, mean, cov)
		}
	})
}

func hasNaN(c []float64) bool {
	for _, x := range c {
		if math.IsNaN(x) {
			return true
		}
	}
	return false
}

// completed is what every imputation of ImputeMoments shares: the rows
// grouped by pattern, in the order of Patterns, and, for the patterns with
// many rows, S = Σ u uᵀ about centre. It is only read.
type completed struct {
	d      *emData
	centre []float64
}

func newCompleted(cols [][]float64, lay *layout, ps []Pattern, centre []float64) *completed {
	return &completed{d: newEMData(cols, lay, ps, nil, centre), centre: centre}
}

// completer is one worker's scratch for the moments of a completed
// dataset.
type completer struct {
	*completed
	cond  condition
	block rowBlock  // completed rows of small patterns, about the centre
	x     []float64 // scratch: a row
	tbuf  []float64 // (|O|+1) × chunkRows: u, transposed
	zbuf  []float64 // |M| × chunkRows: z, transposed
}

// moments draws the missing values under theta, as ImputeEach's draw does,
// and returns the means and the covariance (divisor n − 1) of the
// completed data.
func (c *completer) moments(th *EMResult, rng *rand.Rand) ([]float64, *mat.SymDense, error) {
	d := c.d
	p, n := d.p, float64(rows(d.cols))
	prec, err := precision(th.Cov)
	if err != nil {
		return nil, nil, err
	}
	mean := make([]float64, p) // theta's mean about the centre
	for j := range mean {
		mean[j] = th.Mean[j] - c.centre[j]
	}
	full := fullSymmetric(prec)
	t := make([]float64, (p+1)*(p+1))
	c.block.reset(p)
	for _, g := range d.groups {
		if err := c.cond.setFor(g.s != nil, prec, full, mean, g.obs, g.mis); err != nil {
			return nil, nil, err
		}
		l, err := c.cond.factor()
		if err != nil {
			return nil, nil, err
		}
		if g.s != nil {
			c.addDrawnReduced(t, g, l, rng)
			continue
		}
		c.addDrawnRows(g, l, rng)
	}
	c.block.addTo(t)
	if t[0] != n {
		return nil, nil, errors.New("internal error: the completed rows do not add up to the data")
	}
	out := make([]float64, p)
	cov := mat.NewSymDense(p, nil)
	for i := range p {
		out[i] = c.centre[i] + t[i+1]/n
		for j := i; j < p; j++ {
			cov.SetSym(i, j, (t[(i+1)*(p+1)+j+1]-t[i+1]*t[j+1]/n)/(n-1))
		}
	}
	return out, cov, nil
}

// addDrawnReduced adds the cross-products of g's completed rows to t (see
// ImputeMoments), drawing z for its rows in their order, |M| values a row.
func (c *completer) addDrawnReduced(t []float64, g *group, l []float64, rng *rand.Rand) {
	p, k, nm := c.d.p, len(g.obs)+1, len(g.mis)
	a := reducedMap(p, g, &c.cond)
	if nm > 0 {
		zu := blas64.General{Rows: nm, Cols: k, Stride: k, Data: make([]float64, nm*k)}
		zz := blas64.Symmetric{N: nm, Stride: nm, Data: make([]float64, nm*nm), Uplo: blas.Upper}
		c.tbuf, c.zbuf = grow(c.tbuf, k*chunkRows), grow(c.zbuf, nm*chunkRows)
		for start := 0; start < len(g.rows); start += chunkRows {
			end := min(start+chunkRows, len(g.rows))
			m := end - start
			u, z := c.tbuf[:k*m], c.zbuf[:nm*m]
			c.d.gather(u, g, start, end)
			for r := range m {
				for x := range nm {
					z[x*m+r] = rng.NormFloat64()
				}
			}
			zt := blas64.General{Rows: nm, Cols: m, Stride: m, Data: z}
			blas64.Gemm(blas.NoTrans, blas.Trans, 1, zt, blas64.General{Rows: k, Cols: m, Stride: m, Data: u}, 1, zu)
			blas64.Syrk(blas.NoTrans, 1, zt, 1, zz)
		}
		symmetrize(zz.Data, nm)
		// E = P L ZU, (p+1) × k, and the residuals' own cross-products
		// L ZZ Lᵀ at the missing variables.
		e := blas64.General{Rows: p + 1, Cols: k, Stride: k, Data: make([]float64, (p+1)*k)}
		lm := blas64.General{Rows: nm, Cols: nm, Stride: nm, Data: l}
		le := blas64.General{Rows: nm, Cols: k, Stride: k, Data: make([]float64, nm*k)}
		blas64.Gemm(blas.NoTrans, blas.NoTrans, 1, lm, zu, 0, le)
		for x, j := range g.mis {
			copy(e.Data[(j+1)*k:(j+2)*k], le.Data[x*k:(x+1)*k])
		}
		lz := blas64.General{Rows: nm, Cols: nm, Stride: nm, Data: make([]float64, nm*nm)}
		lzl := blas64.General{Rows: nm, Cols: nm, Stride: nm, Data: make([]float64, nm*nm)}
		blas64.Gemm(blas.NoTrans, blas.NoTrans, 1, lm, blas64.General{Rows: nm, Cols: nm, Stride: nm, Data: zz.Data}, 0, lz)
		blas64.Gemm(blas.NoTrans, blas.Trans, 1, lz, lm, 0, lzl)
		for x, i := range g.mis {
			for y, j := range g.mis {
				t[(i+1)*(p+1)+j+1] += lzl.Data[x*nm+y]
			}
		}
		tt := blas64.General{Rows: p + 1, Cols: p + 1, Stride: p + 1, Data: t}
		blas64.Gemm(blas.NoTrans, blas.Trans, 1, a, e, 1, tt)
		blas64.Gemm(blas.NoTrans, blas.Trans, 1, e, a, 1, tt)
	}
	addSandwich(t, p, a, g.s)
}

// reducedMap is A, (p+1) × (|O|+1): the identity on the constant and the
// observed variables, (a, B) of cond on the missing ones.
func reducedMap(p int, g *group, cond *condition) blas64.General {
	k := len(g.obs) + 1
	a := make([]float64, (p+1)*k)
	a[0] = 1
	for b, j := range g.obs {
		a[(j+1)*k+b+1] = 1
	}
	for x, j := range g.mis {
		a[(j+1)*k] = cond.a[x]
		copy(a[(j+1)*k+1:(j+2)*k], cond.b[x*(k-1):(x+1)*(k-1)])
	}
	return blas64.General{Rows: p + 1, Cols: k, Stride: k, Data: a}
}

// addSandwich adds A S Aᵀ to t, (p+1) × (p+1).
func addSandwich(t []float64, p int, a blas64.General, s []float64) {
	k := a.Cols
	as := blas64.General{Rows: p + 1, Cols: k, Stride: k, Data: make([]float64, (p+1)*k)}
	blas64.Gemm(blas.NoTrans, blas.NoTrans, 1, a, blas64.General{Rows: k, Cols: k, Stride: k, Data: s}, 0, as)
	blas64.Gemm(blas.NoTrans, blas.Trans, 1, as, a, 1, blas64.General{Rows: p + 1, Cols: p + 1, Stride: p + 1, Data: t})
}

// addDrawnRows completes g's rows about the centre, conditional mean plus
// L z, and adds them to the row block.
func (c *completer) addDrawnRows(g *group, l []float64, rng *rand.Rand) {
	c.x = grow(c.x, c.d.p)
	x := c.x
	for q := range g.rows {
		c.d.observedInto(g, q, x)
		for _, j := range g.obs {
			x[j] -= c.centre[j]
		}
		c.cond.predict(x)
		addNoise(x, g.mis, l, rng)
		c.block.add(x, 1)
	}
}
