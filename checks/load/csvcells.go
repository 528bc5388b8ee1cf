package load

import (
	"bytes"
	"math"
	"strconv"
	"strings"
	"unsafe"

	"github.com/pathvet/pathvet/checks"
)

// Formats of the problems a cell can have: the cell, its column's name,
// and a hint on missing-value codes.
const (
	cellNotNumber = "%s in column %s is not a number%s"
	cellNotBinary = "%s in column %s: a binary variable is coded 0 or 1%s"
)

// cellReader turns the cells of a row into column values.
type cellReader struct {
	s       *study
	cols    []int  // CSV column → variable, -1 for an ignored column
	binary  []bool // by variable
	missing map[string]bool
	lengths uint64 // bit k set: a missing code has k bytes (k < 64), bit 63 also for longer codes
}

func newCells(s *study, cols []int) *cellReader {
	cr := &cellReader{s: s, cols: cols, binary: make([]bool, len(s.Names)), missing: map[string]bool{}}
	for j, v := range s.Package.Variables {
		cr.binary[j] = v.Scale == checks.ScaleBinary
	}
	for _, c := range s.Package.Data.MissingCodes {
		c = strings.TrimSpace(c)
		cr.missing[c] = true
		cr.lengths |= 1 << min(len(c), 63)
	}
	return cr
}

// row appends the values of one row to the columns, NaN for a missing
// cell, and reports each cell that is not a number, or not 0 or 1 in a
// binary column, at its line and column. It allocates only to report.
func (cr *cellReader) row(rec []cell, ds *checks.Dataset, ps *problems) {
	for i, c := range rec {
		j := cr.cols[i]
		if j < 0 {
			continue
		}
		b := trimSpace(c.b)
		if len(b) == 0 || isNA(b) || cr.isCode(b) {
			ds.Columns[j] = append(ds.Columns[j], math.NaN())
			continue
		}
		x, ok := plainDecimal(b)
		switch {
		case !ok && !finite(b, &x):
			cell := string(b)
			ps.csv(c.line, i+1, cellNotNumber, quoted(cell), quoted(cr.s.Names[j]), codeHint(cell, missingMark(cell)))
		case cr.binary[j] && x != 0 && x != 1:
			cell := string(b)
			ps.csv(c.line, i+1, cellNotBinary, quoted(cell), quoted(cr.s.Names[j]), codeHint(cell, CodeLike(x)))
		}
		ds.Columns[j] = append(ds.Columns[j], x)
	}
}

// isNA reports whether b is NA in any case (as strings.EqualFold: no
// other character folds to n or a).
func isNA(b []byte) bool {
	return len(b) == 2 && b[0]|0x20 == 'n' && b[1]|0x20 == 'a'
}

// isCode reports whether b is one of the package's missing codes; the
// lengths of the codes spare most cells the lookup.
func (cr *cellReader) isCode(b []byte) bool {
	return cr.lengths&(1<<min(len(b), 63)) != 0 && cr.missing[string(b)]
}

// trimSpace is bytes.TrimSpace, with a shortcut for a cell that starts and
// ends with a printable ASCII character.
func trimSpace(b []byte) []byte {
	if n := len(b); n > 0 && b[0] > ' ' && b[0] < 0x7f && b[n-1] > ' ' && b[n-1] < 0x7f {
		return b
	}
	return bytes.TrimSpace(b)
}

// finite parses b with strconv.ParseFloat, without copying it, into x and
// reports whether it is a finite number.
func finite(b []byte, x *float64) bool {
	var err error
	*x, err = strconv.ParseFloat(unsafe.String(&b[0], len(b)), 64)
	return err == nil && !math.IsNaN(*x) && !math.IsInf(*x, 0)
}
