package load

import (
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"github.com/pathvet/pathvet/checks"
)

// parseCSV reads the rows: a header naming variables, then one row per
// participant. Empty cells, NA in any case and the package's missing codes
// are missing.
func (s *study) parseCSV(text []byte, lim Limits, ps *problems) *checks.Dataset {
	d := s.Package.Data
	r := csv.NewReader(bytes.NewReader(bytes.TrimPrefix(text, []byte("\xef\xbb\xbf"))))
	r.ReuseRecord = true
	header, err := r.Read()
	if err != nil {
		csvReadError(err, ps)
		return nil
	}
	header = append([]string(nil), header...)
	cols := s.headerColumns(header, r, ps)
	if cols == nil {
		return nil
	}
	ds := &checks.Dataset{Kind: checks.DataRows, Columns: make([][]float64, len(s.Names))}
	rows := min(bytes.Count(text, []byte{'\n'}), lim.Rows+1)
	for j := range ds.Columns {
		ds.Columns[j] = make([]float64, 0, rows)
	}
	for i, name := range header {
		if cols[i] < 0 {
			ds.Ignored = append(ds.Ignored, strings.TrimSpace(name))
		}
	}
	missing := map[string]bool{}
	for _, c := range d.MissingCodes {
		missing[strings.TrimSpace(c)] = true
	}
	reported := len(ps.list)
	for {
		rec, err := r.Read()
		if err == io.EOF {
			break
		}
		if len(ps.list)-reported >= maxCSVProblems {
			ps.csv(0, 0, "further data errors are not listed")
			return nil
		}
		if err != nil {
			if fieldCount(err, len(rec), len(header), ps) {
				continue
			}
			csvReadError(err, ps)
			return nil
		}
		if ds.N++; ds.N > lim.Rows {
			ps.at("/data", "has more than %d rows; the limit is %d", lim.Rows, lim.Rows)
			return nil
		}
		s.parseRow(rec, r, cols, missing, ds, ps)
	}
	if ds.N == 0 {
		ps.csv(1, 0, "the data have a header but no rows")
	}
	s.checkColumns(ds, ps)
	s.findSuspects(ds)
	return ds
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
	return fmt.Sprintf("; if it marks a missing value, list %q in /data/missing_codes", cell)
}

// headerColumns maps each CSV column to a variable index, -1 for an
// ignored column.
func (s *study) headerColumns(header []string, r *csv.Reader, ps *problems) []int {
	ignore := map[string]bool{}
	for _, c := range s.Package.Data.IgnoreColumns {
		ignore[c] = true
	}
	cols := make([]int, len(header))
	seen := map[string]bool{}
	before := len(ps.list)
	for i, h := range header {
		name := strings.TrimSpace(h)
		line, _ := r.FieldPos(i)
		j, ok := s.Index[name]
		switch {
		case seen[name]:
			ps.csv(line, i+1, "column %q appears twice in the header", name)
		case ok:
			cols[i] = j
		case ignore[name]:
			cols[i] = -1
		default:
			ps.csv(line, i+1, "column %q is not a declared variable%s; list it in /data/ignore_columns to skip it",
				name, didYouMean(name, s.Names))
		}
		seen[name] = true
	}
	for j, name := range s.Names {
		if !seen[name] {
			ps.at(pointer("variables", j, "name"), "%q has no column in the data", name)
		}
	}
	if len(ps.list) > before {
		return nil
	}
	return append([]int(nil), cols...)
}

func (s *study) parseRow(rec []string, r *csv.Reader, cols []int, missing map[string]bool,
	ds *checks.Dataset, ps *problems) {
	for i, raw := range rec {
		j := cols[i]
		if j < 0 {
			continue
		}
		cell := strings.TrimSpace(raw)
		if cell == "" || strings.EqualFold(cell, "NA") || missing[cell] {
			ds.Columns[j] = append(ds.Columns[j], math.NaN())
			continue
		}
		x, err := strconv.ParseFloat(cell, 64)
		line, _ := r.FieldPos(i)
		switch {
		case err != nil || math.IsNaN(x) || math.IsInf(x, 0):
			ps.csv(line, i+1, "%q in column %q is not a number%s", cell, s.Names[j], codeHint(cell, missingMark(cell)))
		case s.Package.Variables[j].Scale == checks.ScaleBinary && x != 0 && x != 1:
			ps.csv(line, i+1, "%q in column %q: a binary variable is coded 0 or 1%s",
				cell, s.Names[j], codeHint(cell, CodeLike(x)))
		}
		ds.Columns[j] = append(ds.Columns[j], x)
	}
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
			ps.at(pointer("variables", j, "name"), "every value of %q in the data is missing", s.Names[j])
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
