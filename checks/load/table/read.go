package table

import (
	"fmt"
	"slices"
)

// reader reads one table.
type reader struct {
	sep    separator
	dec    byte // the decimal mark
	header *header
	rows   []row  // the matrix's rows, one per variable
	desc   []row  // rows of means or SDs
	notes  []line // the lines skipped, searched for the sample size
	names  []string
	enDash bool // an en dash was read as a minus sign
	ps     problems
	t      *Table
}

// read reads the lines into r.t, collecting problems in r.ps.
func (r *reader) read(lines []line) {
	r.sep = chooseSeparator(lines)
	r.dec = chooseDecimal(lines, r.sep)
	r.guess("%s", r.sep.guess())
	if r.dec == ',' {
		r.guess("decimal commas: 0,45 is read as 0.45")
	}
	if !r.classify(lines) {
		return
	}
	r.numbering()
	var b *body
	if r.header != nil && r.sep.delimited() {
		b = r.positional()
	} else {
		b = r.packed()
	}
	r.names = r.variableNames()
	r.descriptives(b)
	r.descriptiveRows(b)
	r.sampleSize()
	r.correlations(b)
}

// Kinds of line.
const (
	lineData  = iota
	lineLoose // some values among words: a row when next to rows
	lineHeader
	lineNote
	lineTitle
	lineOther
)

// lineKind says what a line is on its own.
func lineKind(l line, sep separator, dec byte) (int, row) {
	rw := parseRow(l, sep, dec, false)
	hdr := rw
	if sep == singleSpaces {
		hdr = parseRow(l, sep, dec, true)
	}
	switch {
	case noteRE.MatchString(l.text):
		return lineNote, rw
	case titleRE.MatchString(l.text):
		return lineTitle, rw
	case headerLike(hdr.cells):
		return lineHeader, rw
	case rw.dataLike():
		return lineData, rw
	}
	if values, words := rw.counts(); values > 0 && words <= values+2 {
		return lineLoose, rw
	}
	return lineOther, rw
}

// classify finds the rows of the table, its header, and the lines to
// skip: a title above, notes below, headings between rows.
func (r *reader) classify(lines []line) bool {
	kinds := make([]int, len(lines))
	rows := make([]row, len(lines))
	for i, l := range lines {
		kinds[i], rows[i] = lineKind(l, r.sep, r.dec)
	}
	first, last := span(kinds)
	if first < 0 {
		r.ps.add(0, nil, noRows)
		return false
	}
	for i := first; i <= last; i++ {
		r.takeRow(kinds[i], rows[i])
	}
	r.findHeader(lines[:first], kinds[:first])
	for _, l := range lines[last+1:] {
		r.skip(l, "read as a note below the table")
	}
	return r.checkCount()
}

// span is the first and last line of the table's rows: from the first to
// the last line that reads as a row, widened by the lines next to them
// that hold some values among words; -1 when no line reads as a row.
func span(kinds []int) (int, int) {
	first, last := slices.Index(kinds, lineData), 0
	if first < 0 {
		return -1, -1
	}
	for i, k := range kinds {
		if k == lineData {
			last = i
		}
	}
	for first > 0 && kinds[first-1] == lineLoose {
		first--
	}
	for last < len(kinds)-1 && kinds[last+1] == lineLoose {
		last++
	}
	return first, last
}

// takeRow keeps a line between the first and last rows: a row when it
// holds a value, else a heading.
func (r *reader) takeRow(kind int, rw row) {
	switch {
	case kind != lineData && kind != lineLoose:
		r.skip(rw.line, "skipped as a heading or note between the rows")
	case rw.descriptive():
		r.desc = append(r.desc, rw)
	default:
		r.rows = append(r.rows, rw)
	}
}

// findHeader takes the last line above the rows as the header when it
// reads as one, and the lines above it as the title.
func (r *reader) findHeader(above []line, kinds []int) {
	h := -1
	for i := len(above) - 1; i >= 0 && h < 0; i-- {
		if kinds[i] == lineHeader || i == len(above)-1 && kinds[i] == lineOther && r.namesColumns(above[i]) {
			h = i
		}
	}
	for i, l := range above {
		switch {
		case i == h:
			r.header = readHeader(parseRow(l, r.sep, r.dec, true))
			r.notes = append(r.notes, l)
		case i < h || h < 0:
			r.skip(l, "skipped as the table's title")
		default:
			r.skip(l, "skipped as a heading above the rows")
		}
	}
}

// namesColumns reports whether a line without role words or numbers can
// be a header naming the columns: as many names as variables, or one
// fewer.
func (r *reader) namesColumns(l line) bool {
	n := 0
	for _, c := range parseRow(l, r.sep, r.dec, true).cells {
		if c.kind != empty {
			n++
		}
	}
	k := len(r.rows)
	return n >= 2 && (r.sep != singleSpaces || n == k || n == k-1)
}

// skip notes a skipped line for the user.
func (r *reader) skip(l line, why string) {
	r.notes = append(r.notes, l)
	r.guess("line %d %s: %q", l.no, why, abbreviate(l.text, 60))
}

func abbreviate(s string, n int) string {
	if r := []rune(s); len(r) > n {
		return string(r[:n-1]) + "…"
	}
	return s
}

// checkCount reports too few or too many rows.
func (r *reader) checkCount() bool {
	switch k := len(r.rows); {
	case k < 2:
		r.ps.add(0, nil, tooFewRows, count(k, "row"))
	case k > MaxVariables:
		r.ps.add(0, nil, tooMany, k, MaxVariables)
	default:
		return true
	}
	return false
}

// Formats of the problems with rows' numbers.
const misnumbered = "the row is numbered %d; expected %d (the rows are numbered in order)"

// numbering checks the rows' numbers when every row has one; when only
// some do, the numbers belong to their labels.
func (r *reader) numbering() {
	numbered := 0
	for _, rw := range r.rows {
		if rw.number > 0 {
			numbered++
		}
	}
	for i := range r.rows {
		rw := &r.rows[i]
		switch {
		case numbered == len(r.rows) && rw.number != i+1:
			r.ps.add(rw.line.no, &rw.cells[0], misnumbered, rw.number, i+1)
		case numbered < len(r.rows) && rw.number > 0 && rw.lead == 1:
			rw.label, rw.number = rw.cells[0].text, 0
		}
	}
}

// where names a row's line, or a cell of it, in a problem's words.
func where(line int, c *cell) string {
	if c == nil || c.pos == 0 {
		return fmt.Sprintf("line %d", line)
	}
	return fmt.Sprintf("line %d, cell %d", line, c.pos)
}
