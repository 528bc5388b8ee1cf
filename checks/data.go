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
	// Suspects are the likely undeclared codes and entry errors of raw
	// rows, by variable.
	Suspects []Suspect
}

// Suspect is a value of a data column that looks like an undeclared
// missing-value code or an entry error: repeated, and far outside the
// column's other values (package load finds them).
type Suspect struct {
	Variable string
	Value    float64
	Count    int
	// Q1 and Q3 are the quartiles of the column's other values.
	Q1, Q3 float64
	// Code is set when the value is written with nines or eights only
	// (99, −999, 8888): a likely missing-value code.
	Code bool
}
