package load

import (
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"strings"

	"github.com/pathvet/pathvet/checks"
)

// parseCSV reads the rows in one pass, straight into the columns: a
// header naming variables, then one row per participant. Empty cells, NA
// in any case and the package's missing codes are missing.
func (s *study) parseCSV(text []byte, lim Limits, ps *problems) *checks.Dataset {
	text = bytes.TrimPrefix(text, utf8BOM)
	if !s.readable(text, ps) {
		return nil
	}
	sc := &scanner{text: text, max: s.maxColumns()}
	head, err := sc.next()
	if err != nil {
		csvReadError(err, ps)
		return nil
	}
	if !s.headerFits(sc, ps) || s.otherSeparator(head, ps) {
		return nil
	}
	sc.max = sc.fields + 1 // a longer row is only counted
	header := make([]string, len(head))
	for i, c := range head {
		header[i] = string(c.b)
	}
	cols := s.headerColumns(header, head, ps)
	if cols == nil {
		return nil
	}
	ds := s.newDataset(header, cols, min(bytes.Count(text, []byte{'\n'}), lim.Rows+1))
	if !s.readRows(sc, newCells(s, cols), ds, lim, ps) {
		return nil
	}
	if ds.N == 0 {
		ps.csv(1, 0, "the data have a header but no rows")
	}
	s.checkColumns(ds, ps)
	s.findSuspects(ds)
	return ds
}

// newDataset makes the columns, with room for rows values each, and lists
// the ignored columns.
func (s *study) newDataset(header []string, cols []int, rows int) *checks.Dataset {
	ds := &checks.Dataset{Kind: checks.DataRows, Columns: make([][]float64, len(s.Names))}
	for j := range ds.Columns {
		ds.Columns[j] = make([]float64, 0, rows)
	}
	for i, name := range header {
		if cols[i] < 0 {
			ds.Ignored = append(ds.Ignored, strings.TrimSpace(name))
		}
	}
	return ds
}

// readRows reads the data rows after the header into ds; false means the
// data are rejected. Load takes no context, so this loop watches none: its
// length is bounded by Limits.CSVBytes instead.
func (s *study) readRows(sc *scanner, cr *cellReader, ds *checks.Dataset, lim Limits, ps *problems) bool {
	reported := ps.count()
	for {
		rec, err := sc.next()
		if err == io.EOF {
			return true
		}
		if ps.count()-reported >= maxCSVProblems {
			ps.csv(0, 0, "further data errors are not listed")
			return false
		}
		if err != nil {
			if fieldCount(err, sc.width(), sc.fields, ps) {
				continue
			}
			csvReadError(err, ps)
			return false
		}
		if ds.N++; ds.N > lim.Rows {
			ps.at("/data", "has more than %d rows; the limit is %d", lim.Rows, lim.Rows)
			return false
		}
		cr.row(rec, ds, ps)
	}
}

// findSuspects lists the likely undeclared codes of every column that is
// not binary (a binary column refuses any value but 0 and 1).
func (s *study) findSuspects(ds *checks.Dataset) {
	for j, col := range ds.Columns {
		if s.Package.Variables[j].Scale != checks.ScaleBinary {
			ds.Suspects = append(ds.Suspects, Suspects(s.Names[j], col)...)
		}
	}
}

// codeHint suggests declaring a cell as a missing-value code.
func codeHint(cell string, likely bool) string {
	if !likely {
		return ""
	}
	return fmt.Sprintf("; if it marks a missing value, list %s in /data/missing_codes", quoted(cell))
}

// undeclaredColumn reports a CSV column that names no variable, with a
// hint at a near name.
const undeclaredColumn = "column %s is not a declared variable%s; list it in /data/ignore_columns to skip it"

// headerColumns maps each CSV column to a variable index, -1 for an
// ignored column.
func (s *study) headerColumns(header []string, head []cell, ps *problems) []int {
	ignore := map[string]bool{}
	for _, c := range s.Package.Data.IgnoreColumns {
		ignore[c] = true
	}
	cols := make([]int, len(header))
	seen := map[string]bool{}
	before := ps.count()
	for i, h := range header {
		name := strings.TrimSpace(h)
		line := head[i].line
		j, ok := s.Index[name]
		switch {
		case seen[name]:
			ps.csv(line, i+1, "column %s appears twice in the header", quoted(name))
		case ok:
			cols[i] = j
		case ignore[name]:
			cols[i] = -1
		default:
			ps.csv(line, i+1, undeclaredColumn, quoted(name), ps.suggest(name, s.Names))
		}
		seen[name] = true
	}
	for j, name := range s.Names {
		if !seen[name] {
			ps.at(pointer("variables", j, "name"), "%s has no column in the data", quoted(name))
		}
	}
	if ps.count() > before {
		return nil
	}
	return append([]int(nil), cols...)
}

// checkColumns reports variables with no observed value.
func (s *study) checkColumns(ds *checks.Dataset, ps *problems) {
	for j, col := range ds.Columns {
		observed := 0
		for _, x := range col {
			if !math.IsNaN(x) {
				observed++
			}
		}
		if observed == 0 && ds.N > 0 {
			ps.at(pointer("variables", j, "name"), "every value of %s in the data is missing", quoted(s.Names[j]))
		}
	}
}

// fieldCount reports a row with the wrong number of fields, which the
// reader can read on from.
func fieldCount(err error, got, want int, ps *problems) bool {
	var pe *csv.ParseError
	if !errors.As(err, &pe) || !errors.Is(err, csv.ErrFieldCount) {
		return false
	}
	ps.csv(pe.Line, 0, "the row has %d fields; the header has %d", got, want)
	return true
}

func csvReadError(err error, ps *problems) {
	var pe *csv.ParseError
	if errors.As(err, &pe) {
		ps.csv(pe.Line, pe.Column, "%v", pe.Err)
		return
	}
	ps.csv(1, 0, "%v", fmt.Errorf("the data cannot be read: %w", err))
}
