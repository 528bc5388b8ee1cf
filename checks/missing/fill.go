package missing

import (
	"math"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat"
)

// The deterministic single imputations that papers use, re-run so that
// their effect on the estimates shows (Little & Rubin, ch. 4: both bias
// coefficients and understate uncertainty).

// MeanSubstitute fills each missing value with the mean of its variable's
// observed values.
func MeanSubstitute(cols [][]float64) [][]float64 {
	out := make([][]float64, len(cols))
	for j, c := range cols {
		var obs []float64
		for _, x := range c {
			if !math.IsNaN(x) {
				obs = append(obs, x)
			}
		}
		m := stat.Mean(obs, nil)
		out[j] = make([]float64, len(c))
		for i, x := range c {
			out[j][i] = x
			if math.IsNaN(x) {
				out[j][i] = m
			}
		}
	}
	return out
}

// RegressionImpute fills each missing value with its conditional mean
// given the row's observed values under the EM estimates: single
// regression imputation, without residual noise.
func RegressionImpute(cols [][]float64, em *EMResult) ([][]float64, error) {
	prec, err := precision(em.Cov)
	if err != nil {
		return nil, err
	}
	out := make([][]float64, len(cols))
	for j, c := range cols {
		out[j] = append([]float64(nil), c...)
	}
	x := make([]float64, len(cols))
	var c condition
	for _, pat := range Patterns(cols) {
		if err := c.set(prec, em.Mean, pat.obs, pat.mis); err != nil {
			return nil, err
		}
		for _, i := range pat.Rows {
			for j, col := range cols {
				x[j] = col[i]
			}
			c.predict(x)
			for _, j := range c.mis {
				out[j][i] = x[j]
			}
		}
	}
	return out, nil
}

// Pairwise returns the available-case (pairwise-deletion) correlation
// matrix, each entry from the rows where both variables are observed, and
// the smallest number of such rows.
func Pairwise(cols [][]float64) (*mat.SymDense, int) {
	p := len(cols)
	r := mat.NewSymDense(p, nil)
	minN := rows(cols)
	for a := range p {
		r.SetSym(a, a, 1)
		for b := range a {
			var x, y []float64
			for i := range cols[a] {
				if !math.IsNaN(cols[a][i]) && !math.IsNaN(cols[b][i]) {
					x, y = append(x, cols[a][i]), append(y, cols[b][i])
				}
			}
			minN = min(minN, len(x))
			r.SetSym(a, b, stat.Correlation(x, y, nil))
		}
	}
	return r, minN
}
