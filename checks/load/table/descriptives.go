package table

// Formats of the problems with means and SDs.
const (
	notMean    = "expected a mean: a number such as 59.3"
	notSD      = "expected an SD: a number above 0 such as 6.1"
	notPair    = "expected M (SD): a mean and its SD in parentheses, such as 59.3 (6.1)"
	sdNotAbove = "an SD is greater than 0"
)

// inferredColumns words which columns were taken as M and SD, and, when no
// header names them, decides their order: an SD is above 0, so a column
// with a value of 0 or below is M.
func (r *reader) inferredColumns(b *body, l layout) {
	if r.header != nil && r.header.descriptives() {
		r.headerColumnsGuess()
		return
	}
	place := "before"
	if len(l.post) > 0 {
		place = "after"
	}
	switch {
	case len(l.pre) == 2 || len(l.post) == 2:
		if r.sdFirst(b) {
			b.mean, b.sd = b.sd, b.mean
			r.guess("the two columns %s the matrix read as SD, then M: no header names them, and only the "+
				"second has a value of 0 or below, which no SD can be", place)
		} else {
			r.guess("the two columns %s the matrix read as M, then SD: no header names them", place)
		}
	case len(l.pre) == 1 || len(l.post) == 1:
		r.guess("the cells \"M (SD)\" %s the matrix read as the mean with its SD in parentheses", place)
	}
}

// sdFirst reports whether the first of two unnamed columns is the SD: all
// its values above 0, and the second's not.
func (r *reader) sdFirst(b *body) bool {
	return nonPositive(b.sd) && !nonPositive(b.mean)
}

func nonPositive(cells []*cell) bool {
	for _, c := range cells {
		if c != nil && c.kind == number && c.x <= 0 {
			return true
		}
	}
	return false
}

// headerColumnsGuess words the columns the header names M and SD.
func (r *reader) headerColumnsGuess() {
	for _, ro := range r.header.roles {
		if n, ok := roleNames[ro.kind]; ok && ro.kind != roleOther {
			r.guess("%s read from the column headed %q (cell %d of line %d)", n, ro.cell.text, ro.cell.pos,
				r.header.line)
		}
	}
}

// descriptives reads the means and SDs. A row that prints none (a dash or
// nothing) leaves the whole column out, which the guesses say.
func (r *reader) descriptives(b *body) {
	means, sds := b.roles[roleMean] || b.roles[rolePair], b.roles[roleSD] || b.roles[rolePair]
	k := len(r.rows)
	m, s := make([]float64, k), make([]float64, k)
	for i := range r.rows {
		if b.bad[i] {
			continue
		}
		means = r.descriptive(i, b.mean[i], b.mSD[i], notMean, false, &m[i]) && means
		sds = r.descriptive(i, b.sd[i], b.mSD[i], notSD, true, &s[i]) && sds
	}
	if means {
		r.t.Means = m
	}
	if sds {
		r.t.SDs = s
	}
}

// descriptive reads row i's mean or SD from its own cell c or its M (SD)
// cell p into x; false when the row prints none.
func (r *reader) descriptive(i int, c, p *cell, expected string, isSD bool, x *float64) bool {
	line := r.rows[i].line.no
	switch {
	case c == nil && p == nil:
		return false
	case c == nil && p.kind == pair:
		*x = p.x
		if isSD {
			*x = p.sd
		}
		r.count(p)
	case c == nil:
		return r.absent(i, p, notPair, isSD)
	case c.kind == number:
		*x = c.x
		r.count(c)
	default:
		return r.absent(i, c, expected, isSD)
	}
	if isSD && *x <= 0 {
		r.ps.add(line, firstOf(c, p), sdNotAbove)
	}
	return true
}

func firstOf(c, p *cell) *cell {
	if c != nil {
		return c
	}
	return p
}

// absent reports a cell that is no mean or SD: a dash or nothing leaves
// the column out, anything else is a problem.
func (r *reader) absent(i int, c *cell, expected string, isSD bool) bool {
	what := "M"
	if isSD {
		what = "SD"
	}
	if c.kind == empty || c.kind == dash {
		r.guess("no %s printed for %s (%s): the %s are left out", what, r.names[i], where(r.rows[i].line.no, c),
			plural[what])
		return false
	}
	r.ps.add(r.rows[i].line.no, c, "%s", expected)
	return false
}

// count counts a number's significance marks and notes an en dash read as
// a minus sign.
func (r *reader) count(c *cell) {
	for _, m := range c.marks {
		r.t.Marks[m]++
	}
	if c.minus && !r.enDash {
		r.enDash = true
		r.guess("an en dash before a number is read as a minus sign (first at %s: %q)", where(c.line, c), c.text)
	}
}

// plural names the means and the SDs.
var plural = map[string]string{"M": "means", "SD": "SDs"}

// Formats of the problems with rows of means or SDs.
const (
	descLength = "a row of %s has %s; expected one for each of the %d variables"
	descTwice  = "a row of %s, but the table's columns give them already"
)

// descriptiveRows reads rows of means or SDs printed below the matrix.
func (r *reader) descriptiveRows(b *body) {
	k := len(r.rows)
	for _, rw := range r.desc {
		isSD, what, expected, target := sdWords[roleWord(rw.label)], "M", notMean, &r.t.Means
		if isSD {
			what, expected, target = "SD", notSD, &r.t.SDs
		}
		vals := rw.filled()
		switch {
		case *target != nil || b.roles[roleMean] && !isSD || b.roles[roleSD] && isSD || b.roles[rolePair]:
			r.ps.add(rw.line.no, nil, descTwice, plural[what])
		case len(vals) != k:
			r.ps.add(rw.line.no, nil, descLength, plural[what], count(len(vals), "value"), k)
		default:
			*target = r.descriptiveRow(vals, expected, isSD)
			r.guess("line %d read as the %s, one for each variable in order (its label is %q)",
				rw.line.no, plural[what], rw.label)
		}
	}
}

// descriptiveRow reads one row of means or SDs.
func (r *reader) descriptiveRow(vals []cell, expected string, isSD bool) []float64 {
	out := make([]float64, len(vals))
	for j := range vals {
		c := &vals[j]
		switch {
		case c.kind != number:
			r.ps.add(c.line, c, "%s", expected)
		case isSD && c.x <= 0:
			r.ps.add(c.line, c, sdNotAbove)
		}
		out[j] = c.x
		r.count(c)
	}
	return out
}
