// Package table reads a paper's printed table of means, standard
// deviations and correlations (its "Table 1") as text copied from a PDF
// (cells set apart by runs of spaces, or by single spaces), a word
// processor (tabs) or a spreadsheet (commas or semicolons, cells quoted as
// in RFC 4180), and gives the figures a package of kind summary needs:
// the variables with their labels, the correlation matrix, the means and
// SDs when printed, and the sample size from a note ("N = 812").
//
// Method. The separator is the one under which most lines read as clean
// rows (a label, then values only); the decimal mark is a comma when more
// numbers read only that way. A header row names the columns (M, SD,
// "M (SD)", numbered or named matrix columns). Where the separator marks
// every cell and a header exists, cells are placed by column; otherwise
// (spaces, or no header) by counting each row's values against the
// layouts a table can have (descriptive columns before or after the
// matrix; the lower or upper triangle or the full matrix; the diagonal
// printed or not), taking the layout most rows fit. The half of the matrix
// that holds numbers gives its shape. The matrix is then checked by the
// package format's rules (load.CheckCorrelations: unit diagonal, entries
// in [-1, 1], symmetry of a full matrix, positive definiteness from
// gonum's symmetric eigendecomposition), each problem named by its line,
// cell and variables. What the reader took for granted is listed in
// Table.Guesses for the user to confirm.
//
// The forms read are those of correlation tables as journals print them
// (a dash or 1 on the diagonal, significance marks such as * and † after
// the figures, the sample size in a note below), after the tables of the
// APA Publication Manual (7th ed., 2020), recalled from memory; the
// corpus in testdata/tables, invented for this project, holds each form.
package table
