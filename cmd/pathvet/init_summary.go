package main

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"github.com/pathvet/pathvet/checks/load"
)

// fromSummary fills the package from a printed correlation table.
func (st *start) fromSummary(text []byte) error {
	names, rows, err := readTable(text)
	if err != nil {
		return err
	}
	vars := make([]*obj, len(names))
	for i, n := range names {
		vars[i] = newObj("name", n, "scale", "continuous")
	}
	st.pkg.set("variables", vars)
	st.pkg.set("data", newObj(
		"kind", "summary", "n", load.Placeholder+" the sample size", "variables", names, "correlations", rows))
	fmt.Fprintf(&st.notes, "Variables (%d): %s.\n", len(names), strings.Join(names, ", "))
	st.notes.WriteString("Every scale is set to continuous: a printed table does not show a variable's\n" +
		"scale; set binary (coded 0 and 1) or ordinal where it applies. Add \"sds\" and\n" +
		"\"means\" to data, one per variable in the table's order, if the paper prints them.\n")
	return nil
}

// readTable reads a correlation table: the header names the variables,
// row i has at least i + 1 numbers, and cells past the diagonal may be
// empty. It returns the lower triangle.
func readTable(text []byte) ([]string, [][]float64, error) {
	cols, n, err := readColumns(text, true)
	if err != nil {
		return nil, nil, err
	}
	names := make([]string, len(cols))
	for j, c := range cols {
		if !varName.MatchString(c.name) {
			return nil, nil, fmt.Errorf("column %d: %q is not a variable name (letters, digits and _)", j+1, c.name)
		}
		names[j] = c.name
	}
	if n != len(cols) {
		return nil, nil, fmt.Errorf("the table has %d rows for %d variables", n, len(cols))
	}
	rows := make([][]float64, n)
	for i := range n {
		for j := 0; j <= i; j++ {
			x, err := strconv.ParseFloat(cols[j].cells[i], 64)
			if err != nil {
				return nil, nil, fmt.Errorf("line %d, column %d: %q is not a number", i+2, j+1, cols[j].cells[i])
			}
			rows[i] = append(rows[i], x)
		}
	}
	return names, rows, symmetric(cols, rows)
}

// symmetric checks the cells above the diagonal, where the table gives
// them, against the lower triangle (to 1e-6, as the loader does).
func symmetric(cols []*column, rows [][]float64) error {
	for i := range rows {
		for j := i + 1; j < len(rows); j++ {
			cell := cols[j].cells[i]
			if cell == "" {
				continue
			}
			x, err := strconv.ParseFloat(cell, 64)
			if err != nil || math.Abs(x-rows[j][i]) > 1e-6 {
				return fmt.Errorf("line %d, column %d: %q, but line %d, column %d is %g: the table is not symmetric",
					i+2, j+1, cell, j+2, i+1, rows[j][i])
			}
		}
	}
	return nil
}
