package missing

import (
	"context"

	"gonum.org/v1/gonum/mat"
)

// impute returns M completed copies of cols, drawn by ImputeEach.
func impute(ctx context.Context, cols [][]float64, start *EMResult, opt ImputeOptions) ([][][]float64, error) {
	if opt.M == 0 {
		opt.M = DefaultImputations
	}
	out := make([][][]float64, opt.M)
	err := ImputeEach(ctx, cols, start, opt, func(k int, data *mat.Dense) error {
		out[k] = make([][]float64, len(cols))
		for j := range cols {
			out[k][j] = mat.Col(nil, j, data)
		}
		return nil
	})
	if err != nil {
		return nil, err
	}
	return out, nil
}
