package missing

import (
	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/mat"
)

// RowMoments returns the means and the covariance matrix (divisor n − 1)
// of the rows of x, in two passes: the means, then rank-k updates (BLAS
// dsyrk) on centred blocks of rows, so that x is not copied.
func RowMoments(x *mat.Dense) ([]float64, *mat.SymDense) {
	n, p := x.Dims()
	mean := make([]float64, p)
	for i := range n {
		for j, v := range x.RawRowView(i) {
			mean[j] += v
		}
	}
	for j := range mean {
		mean[j] /= float64(n)
	}
	cov := blas64.Symmetric{N: p, Stride: p, Data: make([]float64, p*p), Uplo: blas.Upper}
	buf := make([]float64, blockRows*p)
	for start := 0; start < n; start += blockRows {
		k := min(blockRows, n-start)
		for r := range k {
			row := buf[r*p : (r+1)*p]
			for j, v := range x.RawRowView(start + r) {
				row[j] = v - mean[j]
			}
		}
		blas64.Syrk(blas.Trans, 1/float64(n-1), blas64.General{Rows: k, Cols: p, Stride: p, Data: buf}, 1, cov)
	}
	return mean, mat.NewSymDense(p, cov.Data)
}
