package load

import (
	"bytes"
	"encoding/csv"
	"io"
)

// cell is one field of a record: its text after unquoting, and the line
// it starts on.
type cell struct {
	b    []byte
	line int
}

// scanner reads CSV records straight from the bytes, in one pass, as
// encoding/csv's Reader reads them with its defaults (RFC 4180 quoting, no
// lazy quotes, no comments, every record as many fields as the first),
// with the same errors at the same lines and columns. An unquoted field is
// a view of the input, not a copy; a quoted one is unquoted into a buffer
// that the next record reuses. The input is never written to.
type scanner struct {
	text   []byte // not yet read
	line   int    // lines read so far
	fields int    // fields per record; set by the first record
	cells  []cell
	buf    []byte
	// max, when set, is the most cells a record keeps; further fields
	// are counted in extra, so that a line of a million commas costs a
	// count, not a million cells.
	max, extra int
}

// width is the number of fields of the record read last, kept or not.
func (s *scanner) width() int { return len(s.cells) + s.extra }

// keep adds a cell to the record, or counts it past max.
func (s *scanner) keep(c cell) {
	if s.max > 0 && len(s.cells) >= s.max {
		s.extra++
		return
	}
	s.cells = append(s.cells, c)
}

// readLine returns the next line without its end ("\n", "\r\n", or a
// final "\r" before the end of the text) and whether it had a newline.
// Like encoding/csv it counts a line even where none is left.
func (s *scanner) readLine() (line []byte, nl bool) {
	s.line++
	i := bytes.IndexByte(s.text, '\n')
	if i < 0 {
		line, s.text = s.text, nil
		return bytes.TrimSuffix(line, []byte{'\r'}), false
	}
	line, s.text = s.text[:i], s.text[i+1:]
	return bytes.TrimSuffix(line, []byte{'\r'}), true
}

// next reads the next record, skipping empty lines; it returns io.EOF at
// the end of the text and a *csv.ParseError for a malformed record, which
// for a wrong number of fields (csv.ErrFieldCount) comes with the record.
func (s *scanner) next() ([]cell, error) {
	var line []byte
	var nl bool
	for len(line) == 0 {
		if len(s.text) == 0 {
			return nil, io.EOF
		}
		line, nl = s.readLine()
	}
	s.cells, s.buf, s.extra = s.cells[:0], s.buf[:0], 0
	rec := record{s: s, start: s.line, line: s.line, col: 1}
	err := rec.fields(line, nl)
	switch {
	case s.fields == 0:
		s.fields = s.width()
	case err == nil && s.width() != s.fields:
		err = &csv.ParseError{StartLine: rec.start, Line: rec.start, Column: 1, Err: csv.ErrFieldCount}
	}
	return s.cells, err
}

// record is the position while one record is read.
type record struct {
	s           *scanner
	start       int // the record's first line
	line, col   int // where the next field starts
	line0, col0 int // where the field being read starts
}

// fields reads the fields of a record that starts with line.
func (r *record) fields(line []byte, nl bool) error {
	for {
		var more bool
		var err error
		if len(line) == 0 || line[0] != '"' {
			line, more, err = r.unquoted(line)
		} else {
			line, nl, more, err = r.quoted(line[1:], nl)
		}
		if err != nil || !more {
			return err
		}
	}
}

// unquoted reads a field that does not start with a quote, which may hold
// none; it returns the rest of the line and whether a comma followed.
func (r *record) unquoted(line []byte) ([]byte, bool, error) {
	i := 0
	for i < len(line) && line[i] != ',' && line[i] != '"' {
		i++
	}
	if i < len(line) && line[i] == '"' {
		return nil, false, r.err(r.s.line, r.col+i, csv.ErrBareQuote)
	}
	r.s.keep(cell{line[:i], r.line})
	if i == len(line) {
		return nil, false, nil
	}
	r.col += i + 1
	return line[i+1:], true, nil
}

// quoted reads a quoted field after its opening quote, across lines if it
// holds newlines, which it keeps as "\n"; it returns the rest of the line,
// whether that had a newline, and whether a comma followed the field.
func (r *record) quoted(line []byte, nl bool) ([]byte, bool, bool, error) {
	r.line0, r.col0 = r.line, r.col
	r.col++
	from := len(r.s.buf)
	for {
		i := bytes.IndexByte(line, '"')
		switch {
		case i >= 0:
			r.s.buf = append(r.s.buf, line[:i]...)
			line, r.col = line[i+1:], r.col+i+1
			switch {
			case len(line) > 0 && line[0] == '"':
				r.s.buf, line, r.col = append(r.s.buf, '"'), line[1:], r.col+1
			case len(line) > 0 && line[0] == ',':
				r.push(from)
				r.col++
				return line[1:], nl, true, nil
			case len(line) == 0:
				r.push(from)
				return nil, nl, false, nil
			default:
				return nil, nl, false, r.err(r.s.line, r.col-1, csv.ErrQuote)
			}
		case len(line) > 0 || nl:
			line, nl = r.nextLine(line, nl)
		default:
			return nil, nl, false, r.err(r.line, r.col, csv.ErrQuote)
		}
	}
}

// nextLine keeps the rest of a line inside a quoted field and reads the
// next one.
func (r *record) nextLine(line []byte, nl bool) ([]byte, bool) {
	r.s.buf = append(r.s.buf, line...)
	r.col += len(line)
	if nl {
		r.s.buf = append(r.s.buf, '\n')
		r.col++
	}
	line, nl = r.s.readLine()
	if len(line) > 0 || nl {
		r.line++
		r.col = 1
	}
	return line, nl
}

// push adds the quoted field unquoted into the buffer from from on.
func (r *record) push(from int) {
	r.s.keep(cell{r.s.buf[from:len(r.s.buf):len(r.s.buf)], r.line0})
}

func (r *record) err(line, col int, err error) error {
	return &csv.ParseError{StartLine: r.start, Line: line, Column: col, Err: err}
}
