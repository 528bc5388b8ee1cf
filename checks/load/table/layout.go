package table

// body is the table's cells in their places: each variable's row of the
// matrix (nil where nothing is printed) and its M, SD or "M (SD)" cell.
type body struct {
	grid          [][]*cell
	mean, sd, mSD []*cell
	roles         map[roleKind]bool // the descriptive columns the table has
	bad           []bool            // rows whose cells could not be placed
}

func newBody(k int) *body {
	b := &body{grid: make([][]*cell, k), mean: make([]*cell, k), sd: make([]*cell, k), mSD: make([]*cell, k),
		roles: map[roleKind]bool{}, bad: make([]bool, k)}
	for i := range b.grid {
		b.grid[i] = make([]*cell, k)
	}
	return b
}

// place puts cell c of row i where its column's role says.
func (b *body) place(i int, ro role, c *cell) {
	switch ro.kind {
	case roleMean:
		b.mean[i] = c
	case roleSD:
		b.sd[i] = c
	case rolePair:
		b.mSD[i] = c
	case roleCol:
		if ro.col < len(b.grid) {
			b.grid[i][ro.col] = c
		}
	}
	if ro.kind != roleCol && ro.kind != roleOther {
		b.roles[ro.kind] = true
	}
}

// Formats of the problems with the header and the rows' lengths.
const (
	pastHeader    = "lies past the header's last column"
	namedColumns  = "names %s, but %d rows follow; expected a name for each row's variable"
	columnPastEnd = "numbers column %d, but %d rows follow"
	rowLength     = "has %s; expected %d: %s"
)

// positional places the cells of a table whose separator marks every cell
// under the header's columns: a labelled row's values under the header's
// columns, an unlabelled row cell for cell.
func (r *reader) positional() *body {
	h, b := r.header, newBody(len(r.rows))
	r.checkHeader()
	for i := range r.rows {
		rw := &r.rows[i]
		vals := rw.cells[rw.lead:]
		if rw.lead == 0 {
			vals = rw.cells[min(h.lead, len(rw.cells)):]
		}
		for t := range vals {
			if t < len(h.roles) {
				b.place(i, h.roles[t], &vals[t])
			} else if vals[t].kind != empty {
				r.ps.add(rw.line.no, &vals[t], pastHeader)
				b.bad[i] = true
			}
		}
	}
	r.otherColumns()
	if h.descriptives() {
		r.headerColumnsGuess()
	}
	return b
}

// checkHeader reports a header whose columns do not fit the rows.
func (r *reader) checkHeader() {
	h, k := r.header, len(r.rows)
	if h.names != nil && len(h.names) != k && len(h.names) != k-1 {
		r.ps.add(h.line, nil, namedColumns, count(len(h.names), "column"), k)
	}
	for _, ro := range h.cols() {
		if h.names == nil && ro.col >= k {
			r.ps.add(h.line, &ro.cell, columnPastEnd, ro.col+1, k)
		}
	}
}

// otherColumns notes the header's columns the reader does not use.
func (r *reader) otherColumns() {
	for _, ro := range r.header.roles {
		if ro.kind == roleOther && ro.cell.kind != empty {
			r.guess("the column headed %q (cell %d of line %d) is not read", ro.cell.text, ro.cell.pos, r.header.line)
		}
	}
}
