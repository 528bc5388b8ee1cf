package load

import (
	"bytes"
	"encoding/csv"
	"io"
	"math"
	"strconv"
	"strings"

	"github.com/pathvet/pathvet/checks"
)

// This file keeps the loader's earlier CSV path, built on encoding/csv, as
// the reference the one-pass parser is tested against (csvdiff_test.go).

func (s *study) parseCSVRef(text []byte, lim Limits, ps *problems) *checks.Dataset {
	text = bytes.TrimPrefix(text, utf8BOM)
	if !s.readable(text, ps) {
		return nil
	}
	r := csv.NewReader(bytes.NewReader(text))
	r.ReuseRecord = true
	header, err := r.Read()
	if err != nil {
		csvReadError(err, ps)
		return nil
	}
	header = append([]string(nil), header...)
	head := make([]cell, len(header))
	for i := range head {
		head[i].line, _ = r.FieldPos(i)
		head[i].b = []byte(header[i])
	}
	if len(header) > s.maxColumns() {
		ps.csv(1, 0, headerTooWide, len(header), len(s.Names), len(s.Package.Data.IgnoreColumns))
		return nil
	}
	if s.otherSeparator(head, ps) {
		return nil
	}
	cols := s.headerColumns(header, head, ps)
	if cols == nil {
		return nil
	}
	ds := s.newDataset(header, cols, min(bytes.Count(text, []byte{'\n'}), lim.Rows+1))
	missing := map[string]bool{}
	for _, c := range s.Package.Data.MissingCodes {
		missing[strings.TrimSpace(c)] = true
	}
	reported := ps.count()
	for {
		rec, err := r.Read()
		if err == io.EOF {
			break
		}
		if ps.count()-reported >= maxCSVProblems {
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
		s.parseRowRef(rec, r, cols, missing, ds, ps)
	}
	if ds.N == 0 {
		ps.csv(1, 0, "the data have a header but no rows")
	}
	s.checkColumns(ds, ps)
	s.findSuspects(ds)
	return ds
}

func (s *study) parseRowRef(rec []string, r *csv.Reader, cols []int, missing map[string]bool,
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
			ps.csv(line, i+1, cellNotNumber, quoted(cell), quoted(s.Names[j]), codeHint(cell, missingMark(cell)))
		case s.Package.Variables[j].Scale == checks.ScaleBinary && x != 0 && x != 1:
			ps.csv(line, i+1, cellNotBinary, quoted(cell), quoted(s.Names[j]), codeHint(cell, CodeLike(x)))
		}
		ds.Columns[j] = append(ds.Columns[j], x)
	}
}
