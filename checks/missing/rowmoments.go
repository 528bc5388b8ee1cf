package missing

import (
	"gonum.org/v1/gonum/mat"
)

// RowMoments returns the means and the covariance matrix (divisor n − 1)
// of the rows of data, in two passes: the means, then rank-k updates (BLAS
// dsyrk) on centred blocks of rows (a rowBlock), so that data is not
// copied.
func RowMoments(data *mat.Dense) ([]float64, *mat.SymDense) {
	n, p := data.Dims()
	mean := make([]float64, p)
	for i := range n {
		for j, v := range data.RawRowView(i) {
			mean[j] += v
		}
	}
	for j := range mean {
		mean[j] /= float64(n)
	}
	var block rowBlock
	block.reset(p)
	x := make([]float64, p)
	for i := range n {
		for j, v := range data.RawRowView(i) {
			x[j] = v - mean[j]
		}
		block.add(x, 1)
	}
	t := make([]float64, (p+1)*(p+1))
	block.addTo(t)
	cov := mat.NewSymDense(p, nil)
	for i := range p {
		for j := i; j < p; j++ {
			cov.SetSym(i, j, t[(i+1)*(p+1)+j+1]/float64(n-1))
		}
	}
	return mean, cov
}
