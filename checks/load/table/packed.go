package table

import (
	"fmt"
	"math"
	"strings"
)

// shape is the part of the matrix a table prints.
type shape int

const (
	lower shape = iota
	upper
	full
)

var shapes = []shape{lower, upper, full}

// layout is how the values of a table whose empty cells leave no trace
// are laid out: descriptive columns before and after the matrix, and the
// matrix's shape.
type layout struct {
	pre, post []roleKind
	shape     shape
	diag      bool
}

// columns are the matrix columns that row i of k prints, in order.
func (l layout) columns(i, k int) []int {
	from, to := 0, k
	switch l.shape {
	case lower:
		to = i + 1
	case upper:
		from = i
	}
	var cols []int
	for j := from; j < to; j++ {
		if j != i || l.diag {
			cols = append(cols, j)
		}
	}
	return cols
}

// roleNames word the descriptive columns.
var roleNames = map[roleKind]string{roleMean: "M", roleSD: "SD", rolePair: "M (SD)", roleOther: "a column not read"}

// describe words what row i of k holds under the layout.
func (l layout) describe(i, k int) string {
	var parts []string
	for _, ro := range l.pre {
		parts = append(parts, roleNames[ro])
	}
	m := fmt.Sprintf("row %d of %s %s (%d cells)", i+1,
		[...]string{"a lower triangle", "an upper triangle", "a full matrix"}[l.shape],
		map[bool]string{true: "with its diagonal", false: "without its diagonal"}[l.diag], len(l.columns(i, k)))
	if len(parts) > 0 {
		m = "then " + m
	}
	parts = append(parts, m)
	for _, ro := range l.post {
		parts = append(parts, "then "+roleNames[ro])
	}
	return strings.Join(parts, ", ")
}

// fits reports whether a row's filled cells fit the layout, and whether
// its diagonal cell is a dash or 1.
func (l layout) fits(vals []cell, i, k int) (bool, bool) {
	cols := l.columns(i, k)
	if len(vals) != len(l.pre)+len(cols)+len(l.post) {
		return false, false
	}
	for t, ro := range append(append([]roleKind{}, l.pre...), l.post...) {
		c := vals[t]
		if t >= len(l.pre) {
			c = vals[len(vals)-len(l.post)+t-len(l.pre)]
		}
		if ro == rolePair && c.kind != pair || (ro == roleMean || ro == roleSD) && c.kind != number {
			return false, false
		}
	}
	if !l.diag {
		return true, false
	}
	d := vals[len(l.pre)+indexOf(cols, i)]
	return true, d.kind == dash || d.kind == paren || d.kind == number && math.Abs(d.x-1) <= 1e-6
}

func indexOf(s []int, x int) int {
	for i, y := range s {
		if y == x {
			return i
		}
	}
	return -1
}

// candidates are the descriptive columns to try: the header's, or, when it
// names none, none, "M (SD)" or two columns, before or after the matrix.
func (r *reader) candidates() [][2][]roleKind {
	if h := r.header; h != nil && h.descriptives() {
		return [][2][]roleKind{headerColumns(h)}
	}
	two := []roleKind{roleMean, roleSD}
	one := []roleKind{rolePair}
	return [][2][]roleKind{{nil, nil}, {one, nil}, {nil, one}, {two, nil}, {nil, two}}
}

// headerColumns are the roles a header names before and after its
// matrix columns (all of them before, when it numbers none).
func headerColumns(h *header) [2][]roleKind {
	var pre, post []roleKind
	seen := false
	for _, ro := range h.roles {
		switch {
		case ro.kind == roleCol:
			seen = true
		case seen:
			post = append(post, ro.kind)
		default:
			pre = append(pre, ro.kind)
		}
	}
	return [2][]roleKind{pre, post}
}

// chooseLayout takes the layout that the most rows fit, then the one whose
// rows show the most diagonal cells; ties go to the earlier candidate.
func (r *reader) chooseLayout(vals [][]cell) layout {
	var best layout
	bestFit, bestDiag := -1, -1
	k := len(vals)
	for _, cand := range r.candidates() {
		for _, s := range shapes {
			for _, diag := range []bool{true, false} {
				l := layout{pre: cand[0], post: cand[1], shape: s, diag: diag}
				fit, onDiag := 0, 0
				for i, v := range vals {
					f, d := l.fits(v, i, k)
					fit, onDiag = fit+b2i(f), onDiag+b2i(d)
				}
				if fit > bestFit || fit == bestFit && onDiag > bestDiag {
					best, bestFit, bestDiag = l, fit, onDiag
				}
			}
		}
	}
	return best
}

func b2i(b bool) int {
	if b {
		return 1
	}
	return 0
}

// packed places the values of a table whose empty cells leave no trace
// (spaces, or no header to align with) by counting them.
func (r *reader) packed() *body {
	k := len(r.rows)
	b := newBody(k)
	if r.header != nil {
		r.checkHeader()
		r.otherColumns()
	}
	vals := make([][]cell, k)
	for i := range r.rows {
		vals[i] = r.rows[i].filled()
	}
	l := r.chooseLayout(vals)
	for i, v := range vals {
		cols := l.columns(i, k)
		want := len(l.pre) + len(cols) + len(l.post)
		if v = r.labelNumbers(i, v, want); len(v) != want {
			r.ps.add(r.rows[i].line.no, nil, rowLength, count(len(v), "value"), want, l.describe(i, k))
			b.bad[i] = true
			continue
		}
		b.placeRow(i, l, cols, v)
	}
	r.inferredColumns(b, l)
	return b
}

// placeRow places row i's values under layout l.
func (b *body) placeRow(i int, l layout, cols []int, v []cell) {
	for t, ro := range l.pre {
		b.place(i, role{kind: ro}, &v[t])
	}
	for t, j := range cols {
		b.place(i, role{kind: roleCol, col: j}, &v[len(l.pre)+t])
	}
	for t, ro := range l.post {
		b.place(i, role{kind: ro}, &v[len(l.pre)+len(cols)+t])
	}
}

// labelNumbers moves the whole numbers that open a row's values into its
// label when, with single spaces, the row has that many values too many:
// "Memory 1 14,5 3,2 ..." is the label "Memory 1".
func (r *reader) labelNumbers(i int, v []cell, want int) []cell {
	extra, rw := len(v)-want, &r.rows[i]
	if r.sep != singleSpaces || extra <= 0 || extra > 2 || rw.lead == 0 {
		return v
	}
	words := []string{rw.label}
	for _, c := range v[:extra] {
		if !allDigits(c.text) {
			return v
		}
		words = append(words, c.text)
	}
	rw.label = strings.Join(words, " ")
	r.guess("line %d: %s taken as part of the label %q", rw.line.no, quoteAll(words[1:]), rw.label)
	return v[extra:]
}

func quoteAll(s []string) string {
	q := make([]string, len(s))
	for i, x := range s {
		q[i] = fmt.Sprintf("%q", x)
	}
	return strings.Join(q, " and ")
}
