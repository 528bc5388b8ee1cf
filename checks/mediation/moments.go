package mediation

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/mat"
)

// rowsPerBlock is the rows of one product block in weightedMoments.
const rowsPerBlock = 256

// weightBudget bounds the floats of one worker's resample weights; a batch
// holds as many resamples as fit, at most maxBatch.
const (
	weightBudget = 1 << 21
	maxBatch     = 64
)

// standardRows reads the variables a bootstrap refits, each centred at
// its full-data mean and divided by its full-data SD as it is read, so
// that the weighted sums of products keep their digits however large the
// means. It keeps no copy of the data.
type standardRows struct {
	cols   [][]float64 // the caller's columns, read only
	n, p   int
	vars   []int     // the node of each variable
	mean   []float64 // full-data means
	sd     []float64 // full-data SDs (divisor n − 1)
	q      int       // sums per resample: 1 + p + p(p+1)/2
	triIdx [][2]int  // the pairs (a, b), a ≤ b, in the order of the sums
}

// newStandardRows reads the columns vars of cols. Every value must be
// finite and every column must vary.
func newStandardRows(cols [][]float64, vars []int) (*standardRows, error) {
	n := len(cols[vars[0]])
	s := &standardRows{cols: cols, n: n, p: len(vars), vars: vars}
	for _, v := range vars {
		if len(cols[v]) != n {
			return nil, fmt.Errorf("mediation: column %d has %d rows, column %d has %d", v, len(cols[v]), vars[0], n)
		}
		mu, sd, err := meanSD(cols[v], v)
		if err != nil {
			return nil, err
		}
		s.mean, s.sd = append(s.mean, mu), append(s.sd, sd)
	}
	for a := range s.p {
		for b := a; b < s.p; b++ {
			s.triIdx = append(s.triIdx, [2]int{a, b})
		}
	}
	s.q = 1 + s.p + len(s.triIdx)
	return s, nil
}

// badValue names a value the bootstrap cannot use.
const badValue = "mediation: column %d, row %d: value %v (the bootstrap needs complete rows)"

func meanSD(c []float64, v int) (mu, sd float64, err error) {
	for i, x := range c {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return 0, 0, fmt.Errorf(badValue, v, i+1, x)
		}
		mu += x
	}
	mu /= float64(len(c))
	for _, x := range c {
		sd += (x - mu) * (x - mu)
	}
	sd = math.Sqrt(sd / float64(len(c)-1))
	if !(sd > 0) {
		return 0, 0, fmt.Errorf("mediation: column %d does not vary", v)
	}
	return mu, sd, nil
}

// batchSize is how many resamples one worker weighs at once.
func (s *standardRows) batchSize() int { return max(1, min(maxBatch, weightBudget/max(s.n, 1))) }

// weightedMoments adds to sums (batch × q, row-major) the weighted sums
// of each resample's weights w (batch × n, row-major): Σw, Σw z_a and
// Σw z_a z_b, a ≤ b, as one matrix product per block of rows,
//
//	S += W[:, rows] · P[rows, :],  P[i,:] = (1, z_i, z_ia z_ib …),
//
// so the work is that of a general matrix multiply (gonum's BLAS). z and
// prod are scratch of rowsPerBlock × p and rowsPerBlock × q.
func (s *standardRows) weightedMoments(w []float64, batch int, sums, z, prod []float64) {
	for lo := 0; lo < s.n; lo += rowsPerBlock {
		hi := min(lo+rowsPerBlock, s.n)
		for a, v := range s.vars {
			for i, x := range s.cols[v][lo:hi] {
				z[i*s.p+a] = (x - s.mean[a]) / s.sd[a]
			}
		}
		for i := range hi - lo {
			row, out := z[i*s.p:(i+1)*s.p], prod[i*s.q:(i+1)*s.q]
			out[0] = 1
			copy(out[1:], row)
			for k, ab := range s.triIdx {
				out[1+s.p+k] = row[ab[0]] * row[ab[1]]
			}
		}
		blas64.Gemm(blas.NoTrans, blas.NoTrans, 1,
			blas64.General{Rows: batch, Cols: hi - lo, Stride: s.n, Data: w[lo:]},
			blas64.General{Rows: hi - lo, Cols: s.q, Stride: s.q, Data: prod},
			1, blas64.General{Rows: batch, Cols: s.q, Stride: s.q, Data: sums})
	}
}

// constantShare is how small a variable's variance in a resample may be,
// as a share of its mean square there, before the variable counts as
// constant: the variance is a difference of sums, good to about 1e−16 of
// the mean square, so below 1e−10 fewer than six of its digits are left.
const constantShare = 1e-10

// covariance turns one resample's sums into the covariance matrix of the
// standardized variables (divisor Σw, which the coefficients do not
// depend on). ok is false when a variable is constant in the resample
// (a binary variable whose rare value was never drawn).
func (s *standardRows) covariance(sum []float64, cov *mat.SymDense) (ok bool) {
	sw := sum[0]
	mean := sum[1 : 1+s.p]
	ok = true
	for k, ab := range s.triIdx {
		a, b := ab[0], ab[1]
		m2 := sum[1+s.p+k] / sw
		v := m2 - mean[a]*mean[b]/(sw*sw)
		if a == b && !(v > constantShare*m2) {
			ok = false
		}
		cov.SetSym(a, b, v)
	}
	return ok
}
