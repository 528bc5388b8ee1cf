package checks

import (
	"fmt"
	"math"
	"slices"
	"strings"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat"
)

// dataError is the reason the study's moments could not be computed, in
// terms an author can fix: too few complete cases for the variables, a
// constant variable, or which variables are exactly collinear. It wraps
// the moments' own error.
func (a *Analysis) dataError() error {
	_, err := a.moments()
	if err == nil {
		return nil
	}
	if a.dataErr == nil {
		a.dataErr = err
		if why := rowsProblem(a.Study.Data, a.Study.Names); why != "" {
			a.dataErr = &diagnosedError{why: why, err: err}
		}
	}
	return a.dataErr
}

// diagnosedError is an error said by its cause; it wraps the error it
// explains.
type diagnosedError struct {
	why string
	err error
}

func (e *diagnosedError) Error() string { return e.why }
func (e *diagnosedError) Unwrap() error { return e.err }

// rowsProblem diagnoses raw rows whose complete cases give no usable
// correlation matrix; "" when it finds nothing more specific.
func rowsProblem(d *Dataset, names []string) string {
	if d == nil || d.Kind != DataRows {
		return ""
	}
	rows := observedRows(d.Columns)
	p := len(d.Columns)
	switch n := len(rows); {
	case n <= p:
		return fmt.Sprintf(
			"only %s for %d variables: a correlation matrix of %d variables needs at least %d complete cases, and each regression needs more cases than parameters",
			count(n, "complete case", "complete cases"),
			p,
			p,
			p+1,
		)
	}
	x := mat.NewDense(len(rows), p, slices.Concat(rows...))
	for j := range p {
		if stat.Variance(mat.Col(nil, j, x), nil) == 0 {
			return fmt.Sprintf("%s is constant in the complete cases", names[j])
		}
	}
	return collinearText(x, names)
}

// collinearText names the variables that the eigenvector of the smallest
// eigenvalue of the correlation matrix loads on: a linear combination of
// them is (nearly) constant.
func collinearText(x *mat.Dense, names []string) string {
	_, p := x.Dims()
	cor := mat.NewSymDense(p, nil)
	stat.CorrelationMatrix(cor, x, nil)
	var eig mat.EigenSym
	if !eig.Factorize(cor, true) || eig.Values(nil)[0] > minEigen {
		return ""
	}
	var vec mat.Dense
	eig.VectorsTo(&vec)
	var in []string
	for j := range p {
		if math.Abs(vec.At(j, 0)) > 1e-6 {
			in = append(in, names[j])
		}
	}
	return fmt.Sprintf(
		"%s are exactly collinear in the complete cases (one is a linear combination of the others), so no regression that uses them all can be fitted",
		strings.Join(in, ", "),
	)
}

// observedRows are the rows with every value observed.
func observedRows(cols [][]float64) [][]float64 {
	if len(cols) == 0 {
		return nil
	}
	var out [][]float64
	for i := range cols[0] {
		row := make([]float64, len(cols))
		for j, c := range cols {
			row[j] = c[i]
		}
		if !slices.ContainsFunc(row, math.IsNaN) {
			out = append(out, row)
		}
	}
	return out
}
