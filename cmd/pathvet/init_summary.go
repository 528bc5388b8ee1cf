package main

import (
	"fmt"
	"strings"

	"github.com/pathvet/pathvet/checks/load"
	"github.com/pathvet/pathvet/checks/load/table"
)

// fromSummary fills the package from a printed table of correlations (and
// means, SDs and n where it prints them), read by checks/load/table.
func (st *start) fromSummary(text []byte) error {
	tb, err := table.Read(string(text))
	if err != nil {
		return err
	}
	st.pkg.set("variables", tb.PackageVariables())
	st.names = tb.Names()
	st.pkg.set("data", summarySection(tb))
	st.summaryNotes(tb)
	return nil
}

// summarySection is the data section of kind summary, n a placeholder
// when the table gives none.
func summarySection(tb *table.Table) *obj {
	data := tb.Data()
	var n any = load.Placeholder + " the sample size"
	if data.N > 0 {
		n = data.N
	}
	d := newObj("kind", data.Kind, "n", n, "variables", data.Variables, "correlations", data.Correlations)
	if data.SDs != nil {
		d.set("sds", data.SDs)
	}
	if data.Means != nil {
		d.set("means", data.Means)
	}
	return d
}

// summaryNotes lists the variables, what was read, and what the reader
// guessed, for the user to check against the paper.
func (st *start) summaryNotes(tb *table.Table) {
	w := &st.notes
	fmt.Fprintf(w, "Variables (%d), named after the table's labels:\n", len(tb.Variables))
	for _, v := range tb.Variables {
		fmt.Fprintf(w, "  %-24s %s\n", v.Name, v.Label)
	}
	fmt.Fprintf(w, "\nRead from the table: the correlations%s.\n", readList(tb))
	if tb.N == 0 {
		w.WriteString("The table gives no sample size: fill in data.n.\n")
	}
	if tb.Means == nil || tb.SDs == nil {
		w.WriteString("Add \"sds\" and \"means\" to data, one per variable in the table's order, if the\n" +
			"paper prints them elsewhere; without SDs only standardized results are given.\n")
	}
	w.WriteString("\nWhat the reader took for granted (check each against the paper):\n")
	for _, g := range tb.Guesses {
		fmt.Fprintf(w, "  - %s\n", g)
	}
	if marks := tb.MarkCounts(); marks != "" {
		fmt.Fprintf(w, "  - significance marks stripped from the figures: %s\n", marks)
	}
	w.WriteString("\nEvery scale is set to continuous: a printed table does not show a variable's\n" +
		"scale; set binary (coded 0 and 1) or ordinal where it applies.\n")
}

// readList says what the table gave besides the correlations.
func readList(tb *table.Table) string {
	var parts []string
	if tb.Means != nil {
		parts = append(parts, "means")
	}
	if tb.SDs != nil {
		parts = append(parts, "SDs")
	}
	if tb.N > 0 {
		parts = append(parts, fmt.Sprintf("n = %d", tb.N))
	}
	if tb.Reliabilities != nil {
		parts = append(parts, "reliabilities (written to the variables that have one)")
	}
	if len(parts) == 0 {
		return " only"
	}
	return ", " + strings.Join(parts, ", ")
}
