package checks

import "gonum.org/v1/gonum/mat"

// Dataset is a study's data, in the order of the declared variables.
type Dataset struct {
	Kind string
	// N is the number of rows, or the n of the summary statistics.
	N int
	// Summary data: the correlation matrix, and the SDs and means when the
	// package gives them (else nil).
	Cor   *mat.SymDense
	SD    []float64
	Means []float64
	// Raw rows: one slice per variable, NaN where the value is missing.
	Columns [][]float64
	// Ignored lists the CSV columns skipped by ignore_columns.
	Ignored []string
}
