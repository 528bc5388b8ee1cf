package main

import (
	"fmt"
	"strings"

	"github.com/pathvet/pathvet/checks/load"
	"github.com/pathvet/pathvet/checks/load/guess"
)

// fromRows fills the package from raw rows as checks/load/guess reads
// them: variables, skipped columns, missing codes, and the missing-data
// method to state.
func (st *start) fromRows(text []byte, file string) error {
	rows, err := guess.Read(text)
	if err != nil {
		return err
	}
	fmt.Fprintf(&st.notes, "%d rows, %d columns. Variables, each scale guessed from the data (check each):\n",
		rows.N, len(rows.Columns))
	for _, c := range rows.Columns {
		if c.Skip == "" {
			st.names = append(st.names, c.Name)
			fmt.Fprintf(&st.notes, "  %-20s %-10s %s\n", c.Name, c.Scale, c.Why)
		}
	}
	st.notes.WriteString(skippedNotes(rows.Columns))
	st.notes.WriteString(codeNotes(rows.Columns))
	st.pkg.set("variables", rows.Variables)
	if len(rows.Variables) < 2 {
		return fmt.Errorf("fewer than two columns can be variables:\n%s", skippedNotes(rows.Columns))
	}
	if rows.Missing > 0 {
		st.pkg.set("missing_data", newObj("method", load.Placeholder+
			" how the paper handled missing values: complete_cases, available_cases, mean_substitution, "+
			"single_regression, carry_forward, multiple_imputation, maximum_likelihood or other"))
	}
	st.pkg.set("data", rowsSection(rows, file))
	return nil
}

// rowsSection is the data section of kind rows, read from file.
func rowsSection(rows *guess.Rows, file string) *obj {
	data := newObj("kind", "rows", "file", file)
	if len(rows.MissingCodes) > 0 {
		data.set("missing_codes", rows.MissingCodes)
	}
	if len(rows.Ignore) > 0 {
		data.set("ignore_columns", rows.Ignore)
	}
	return data
}

// skippedNotes lists the columns that are not variables, and why.
func skippedNotes(cols []*guess.Column) string {
	var b strings.Builder
	for _, c := range cols {
		if c.Skip != "" {
			fmt.Fprintf(&b, "  %-20s skipped (in ignore_columns): %s\n", c.Name, c.Skip)
		}
	}
	if b.Len() == 0 {
		return ""
	}
	return "Columns that are not variables:\n" + b.String()
}

// codeNotes says which missing marks and codes were found, and which
// values to look at.
func codeNotes(cols []*guess.Column) string {
	var b strings.Builder
	for _, c := range cols {
		for _, n := range c.Notes() {
			fmt.Fprintf(&b, "  %s\n", n)
		}
	}
	if b.Len() == 0 {
		return ""
	}
	return "Missing codes and values to look at:\n" + b.String()
}
