package api

import (
	"bytes"
	"errors"
	"fmt"
	"strconv"
	"strings"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/load/guess"
	"github.com/pathvet/pathvet/checks/load/table"
)

// built is a package built from the form: the package and its raw rows,
// what was read (for the preview), every problem by field, and where each
// edge and claim came from, so that the loader's JSON pointers lead back
// to the form.
type built struct {
	pkg  *checks.Package
	csv  []byte       // the raw rows, sent beside the package; nil for a table
	tb   *table.Table // the table read, or nil
	rows *guess.Rows  // the rows read, or nil
	errs *fieldErrors
	// edgeLines[i] is the line of the arrows box that gave edge i;
	// claimRows[i] the form's row (from 1) that gave claim i.
	edgeLines, claimRows []int
	nFromField           bool     // data.n came from the n field
	earlier              bool     // the form is a new version of an earlier one
	rowsEarlier          bool     // the rows are the earlier version's
	carried              []string // what came from the earlier version, in words
	// n is the submission to store, when the API's checks accept the
	// package; sp the spooled rows it streams from.
	n       *service.NewSubmission
	sp      *spool
	preview bool
}

// Messages of the form's own checks.
const (
	msgNoData = "Paste the paper's table of means, SDs and correlations here, or attach the raw rows " +
		"below."
	msgBothData = "Both a table and raw rows are given: clear the table, or tick \"Do not use these rows\"."
	msgNoN      = "The table's note gives no sample size: enter n below it."
	msgBadN     = "n is a whole number, such as 812; %q is not."
	msgNDiffers = "The table's note says N = %d; leave n empty, or make it agree."
	msgNRows    = "Leave n empty: with raw rows, n is the number of rows (%d)."
	msgFewVars  = "Fewer than two columns can be variables: %s"
	msgBadCSV   = "The rows cannot be read as CSV: %v"
)

// build makes the package from the form and checks it as the API does.
func (s *Server) build(f *screenForm, e *earlierVersion) *built {
	f.useEarlier(e)
	b := &built{errs: newFieldErrors(), pkg: &checks.Package{FormatVersion: 1, Title: strings.TrimSpace(f.Title),
		ManuscriptID: strings.TrimSpace(f.ManuscriptID), Design: f.Design}, earlier: e != nil}
	if f.MissingMethod != "" {
		b.pkg.MissingData = &checks.MissingData{Method: f.MissingMethod}
	}
	if !b.readData(f) {
		return b
	}
	if e != nil {
		b.carryVariables(e)
	}
	names := newNameIndex(b.pkg.Variables)
	b.readArrows(f.Arrows, names)
	b.readClaims(f.Claims, names)
	if e != nil {
		b.carryRest(e)
	}
	s.check(b)
	return b
}

// readData reads the table or the rows; false when there are no variables
// to go on.
func (b *built) readData(f *screenForm) bool {
	hasTable := strings.TrimSpace(f.Table) != ""
	if f.rowsErr != "" {
		b.errs.add(fieldRows, f.rowsErr)
	}
	switch {
	case hasTable && f.Rows != nil:
		b.errs.add(fieldTable, msgBothData)
		return false
	case hasTable:
		return b.fromTable(f)
	case f.Rows != nil:
		return b.fromRows(f)
	case f.rowsErr == "":
		b.errs.add(fieldTable, msgNoData)
	}
	return false
}

// fromTable reads the printed table: variables, summary data, and n from
// its note or the n field.
func (b *built) fromTable(f *screenForm) bool {
	tb, err := table.Read(f.Table)
	var te *table.Error
	if errors.As(err, &te) {
		for _, p := range te.Problems {
			b.errs.add(fieldTable, p.String())
		}
		if te.More > 0 {
			b.errs.add(fieldTable, fmt.Sprintf("and %d further problems", te.More))
		}
		return false
	}
	if err != nil {
		b.errs.add(fieldTable, err.Error())
		return false
	}
	b.tb = tb
	b.pkg.Variables, b.pkg.Data = tb.PackageVariables(), tb.Data()
	b.readN(f.N)
	return true
}

// readN reads the n field against the table's note.
func (b *built) readN(text string) {
	text = strings.NewReplacer(",", "", " ", "", "\u2009", "", "\u202f", "").Replace(strings.TrimSpace(text))
	n, err := strconv.Atoi(text)
	switch {
	case text == "" && b.tb.N == 0:
		b.errs.add(fieldN, msgNoN)
	case text == "":
	case err != nil || n < 0:
		b.errs.add(fieldN, fmt.Sprintf(msgBadN, text))
	case b.tb.N != 0 && n != b.tb.N:
		b.errs.add(fieldN, fmt.Sprintf(msgNDiffers, b.tb.N))
	case b.tb.N == 0:
		b.pkg.Data.N, b.nFromField = n, true
	}
}

// fromRows reads raw rows as pathvet init --data does: each column's
// scale, the missing codes and the columns that cannot be variables.
func (b *built) fromRows(f *screenForm) bool {
	rows, err := guess.Read(f.Rows.Data)
	if err != nil {
		b.errs.add(fieldRows, fmt.Sprintf(msgBadCSV, err))
		return false
	}
	b.rows, b.csv, b.rowsEarlier = rows, f.Rows.Data, f.Rows.Earlier
	if len(rows.Variables) < 2 {
		b.errs.add(fieldRows, fmt.Sprintf(msgFewVars, skippedWords(rows)))
		return false
	}
	b.pkg.Variables = append([]checks.Variable(nil), rows.Variables...)
	b.pkg.Data = checks.Data{Kind: checks.DataRows, MissingCodes: rows.MissingCodes, IgnoreColumns: rows.Ignore}
	if strings.TrimSpace(f.N) != "" {
		b.errs.add(fieldN, fmt.Sprintf(msgNRows, rows.N))
	}
	return true
}

// skippedWords lists the columns that cannot be variables, and why.
func skippedWords(rows *guess.Rows) string {
	var parts []string
	for _, c := range rows.Columns {
		if c.Skip != "" {
			parts = append(parts, fmt.Sprintf("%s (%s)", c.Name, c.Skip))
		}
	}
	if len(parts) == 0 {
		return fmt.Sprintf("the header names %d", len(rows.Columns))
	}
	return strings.Join(parts, "; ")
}

// check runs the API's checks on the package (checkPackage: the memory
// estimate, load.Load with the server's limits) and maps every problem
// to its field. The submission it gives is kept for the store.
func (s *Server) check(b *built) {
	doc := []byte(packageJSON(b.pkg)) // stored as the preview shows it
	var err error
	if b.csv != nil {
		if b.sp, err = newSpool(bytes.NewReader(b.csv), s.cfg.Limits.CSVBytes); err != nil {
			b.placeError(err)
			return
		}
	}
	n, err := s.checkPackage(doc, b.sp)
	if err != nil {
		b.placeError(err)
		return
	}
	b.n = &n
}

// close removes the spooled rows.
func (b *built) close() {
	if b.sp != nil {
		b.sp.Close()
	}
}
