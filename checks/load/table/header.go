package table

import (
	"strconv"
)

// roleKind is what a column of the table holds.
type roleKind int

const (
	roleLabel roleKind = iota
	roleMean
	roleSD
	rolePair  // "M (SD)" in one cell
	roleCol   // a column of the matrix
	roleOther // a column the reader does not use ("α", "Range")
)

// role is one column of the header.
type role struct {
	kind roleKind
	col  int // the matrix column, for roleCol
	cell cell
}

// header is the table's header row.
type header struct {
	line     int
	lead     int    // label cells before the columns ("Variable", "")
	roles    []role // the columns after them
	numbered bool   // the matrix columns are numbered
	names    []string
}

// roleOf is the role a header cell's words name, if any.
func roleOf(c cell) (roleKind, bool) {
	w := roleWord(c.text)
	switch {
	case meanWords[w]:
		return roleMean, true
	case sdWords[w]:
		return roleSD, true
	case pairWords[w]:
		return rolePair, true
	}
	return roleOther, false
}

// columnNumber is the number of a numbered column ("1", "1.", "(1)").
func columnNumber(c cell) (int, bool) {
	m := rowNumberRE.FindStringSubmatch(c.text)
	if m == nil {
		return 0, false
	}
	n, _ := strconv.Atoi(m[1])
	return n, n > 0
}

// headerLike reports whether cells read as a header: a role word or
// numbered columns (1, 2, 3 or 2, 3, 4), and no number but the columns'.
func headerLike(cells []cell) bool {
	roles, run, next := false, 0, 0
	for _, c := range cells {
		if _, ok := roleOf(c); ok {
			roles = true
		}
		n, ok := columnNumber(c)
		switch {
		case ok && (next == 0 && n <= 2 || n == next):
			run, next = run+1, n+1
		case ok || c.kind == number || c.kind == pair:
			return false
		}
	}
	return roles || run >= 2
}

// readHeader reads the header's roles. Text cells name the matrix's
// columns when the header has neither role words nor numbers; else
// leading text is the label's column and other text a column not used.
func readHeader(r row) *header {
	h := &header{line: r.line.no}
	named := !headerLike(r.cells)
	for h.lead < len(r.cells) && leadCell(r.cells[h.lead], named) {
		h.lead++
	}
	for _, c := range r.cells[h.lead:] {
		h.roles = append(h.roles, h.role(c, named))
	}
	return h
}

// leadCell reports whether c heads the labels' column.
func leadCell(c cell, named bool) bool {
	if c.kind == empty || labelWords[roleWord(c.text)] {
		return true
	}
	_, isRole := roleOf(c)
	_, isNumber := columnNumber(c)
	return !named && c.kind == text && !isRole && !isNumber
}

func (h *header) role(c cell, named bool) role {
	if k, ok := roleOf(c); ok {
		return role{kind: k, cell: c}
	}
	if n, ok := columnNumber(c); ok && !named {
		h.numbered = true
		return role{kind: roleCol, col: n - 1, cell: c}
	}
	if named && c.kind != empty {
		h.names = append(h.names, c.text)
		return role{kind: roleCol, col: len(h.names) - 1, cell: c}
	}
	return role{kind: roleOther, cell: c}
}

// cols are the header's matrix columns.
func (h *header) cols() []role {
	var out []role
	for _, r := range h.roles {
		if r.kind == roleCol {
			out = append(out, r)
		}
	}
	return out
}

// descriptives reports whether the header names an M, SD or M (SD) column.
func (h *header) descriptives() bool {
	for _, r := range h.roles {
		if r.kind == roleMean || r.kind == roleSD || r.kind == rolePair {
			return true
		}
	}
	return false
}
