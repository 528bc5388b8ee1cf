package table

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"gonum.org/v1/gonum/mat"

	"github.com/pathvet/pathvet/checks/load"
)

// Formats of the problems with the matrix's cells.
const (
	noCorrelations = "no correlations found: expected the lower or upper triangle, or the full matrix"
	notCorrelation = "expected the correlation of %s and %s: a number such as .45 or −0.22"
	shortRow       = "the row ends before the correlation of %s and %s"
	notEmpty       = "expected nothing here: the %s half of the matrix is empty"
	notDiagonal    = "expected the diagonal of %s: —, 1, nothing, or a reliability in parentheses such as (.84)"
	notReliability = "the reliability of %s is %g; a reliability lies in (0, 1]"
	entryOf        = "the correlation of %s and %s "
	diagonalOf     = "the diagonal entry of %s "
	matrixIs       = "the correlation matrix %s"
	matrixHas      = "the correlation matrix: %s"
	weighing       = "; the variables weighing most on its eigenvector: %s"
)

// matrix is the correlations as read, with the cell each entry came from.
type matrix struct {
	shape shape
	rows  [][]float64 // lower triangle, or full when the table prints both halves
	cells [][]*cell   // cells[i][j]: the cell of entry (i, j) of rows
	lines []int       // each variable's row's line
}

// correlations reads the matrix, checks it by the package format's rules
// and keeps its lower triangle.
func (r *reader) correlations(b *body) {
	m := r.readMatrix(b)
	if m == nil || r.ps.any() {
		return
	}
	entry := func(i, j int) string { return where(m.place(i, j)) }
	checked, faults := load.CheckCorrelations(m.rows, entry)
	for _, f := range faults {
		r.fault(m, f)
	}
	if checked == nil {
		return
	}
	r.t.Correlations = make([][]float64, checked.SymmetricDim())
	for i := range r.t.Correlations {
		for j := 0; j <= i; j++ {
			r.t.Correlations[i] = append(r.t.Correlations[i], checked.At(i, j))
		}
	}
}

// readMatrix finds the printed half (or both), reads every entry and
// reports the cells that are not what their place needs; rows already
// reported as misplaced are passed over.
func (r *reader) readMatrix(b *body) *matrix {
	k := len(b.grid)
	m := &matrix{shape: shapeOf(b.grid), lines: make([]int, k)}
	if m.shape < 0 {
		r.ps.add(0, nil, noCorrelations)
		return nil
	}
	r.shapeGuess(m.shape, b.grid)
	for i := range k {
		m.lines[i] = r.rows[i].line.no
		width := i + 1
		if m.shape == full {
			width = k
		}
		m.rows = append(m.rows, make([]float64, width))
		m.cells = append(m.cells, make([]*cell, width))
		for j := range width {
			m.rows[i][j], m.cells[i][j] = r.entry(b, m.shape, i, j)
		}
	}
	r.otherHalf(b.grid, m.shape)
	return m
}

// shapeOf says which half of the grid holds numbers: lower, upper, both
// (full), or neither (-1).
func shapeOf(grid [][]*cell) shape {
	lowerAny, upperAny := false, false
	for i, cells := range grid {
		for j, c := range cells {
			if c != nil && c.kind == number && i != j {
				lowerAny, upperAny = lowerAny || j < i, upperAny || j > i
			}
		}
	}
	switch {
	case lowerAny && upperAny:
		return full
	case lowerAny:
		return lower
	case upperAny:
		return upper
	}
	return -1
}

// shapeGuess words the shape read, and a diagonal not printed.
func (r *reader) shapeGuess(s shape, grid [][]*cell) {
	r.guess("%s", [...]string{
		"the lower triangle is read (nothing is printed above the diagonal)",
		"the upper triangle is read, as the mirror image of the lower (nothing is printed below the diagonal)",
		"the full matrix is read; its two halves are checked against each other",
	}[s])
	for i := range grid {
		if c := grid[i][i]; c == nil || c.kind == empty {
			r.guess("the diagonal is not printed (first at line %d): it is taken as 1", r.rows[i].line.no)
			return
		}
	}
}

// entry reads entry (i, j) of the matrix's rows (the lower triangle, or
// the full matrix) from the grid; an upper triangle is read transposed.
func (r *reader) entry(b *body, s shape, i, j int) (float64, *cell) {
	gi, gj := i, j
	if s == upper {
		gi, gj = j, i
	}
	c, line := b.grid[gi][gj], r.rows[gi].line.no
	x, y := r.names[gi], r.names[gj]
	switch {
	case b.bad[gi]:
		return 0, c
	case i == j && (c == nil || c.kind == empty || c.kind == dash):
		return 1, c
	case i == j && c.kind == paren:
		r.reliability(gi, c)
		return 1, c
	case i == j && c.kind != number:
		r.ps.add(line, c, notDiagonal, x)
	case c == nil:
		r.ps.add(line, nil, shortRow, x, y)
	case c.kind != number:
		r.ps.add(line, c, notCorrelation, x, y)
	default:
		r.count(c)
		return c.x, c
	}
	return 0, c
}

// reliability keeps the figure in parentheses on variable i's diagonal as
// its reliability (a paper's Cronbach's α or test-retest figure).
func (r *reader) reliability(i int, c *cell) {
	if !(c.x > 0 && c.x <= 1) {
		r.ps.add(c.line, c, notReliability, r.names[i], c.x)
		return
	}
	if r.t.Reliabilities == nil {
		r.t.Reliabilities = make([]float64, len(r.rows))
		r.guess("the figures in parentheses on the diagonal are read as the variables' reliabilities "+
			"(first at %s: %q); the diagonal is 1", where(c.line, c), c.text)
	}
	r.t.Reliabilities[i] = c.x
}

// otherHalf reports words or pairs in the half of a triangle that should
// be empty.
func (r *reader) otherHalf(grid [][]*cell, s shape) {
	if s == full {
		return
	}
	for i, cells := range grid {
		for j, c := range cells {
			inOther := s == lower && j > i || s == upper && j < i
			if inOther && c != nil && (c.kind == text || c.kind == pair) {
				r.ps.add(r.rows[i].line.no, c, notEmpty, [...]string{"upper", "lower"}[s])
			}
		}
	}
}

// fault turns a problem load.CheckCorrelations found into one at the
// table's line and cell, naming the variables.
func (r *reader) fault(m *matrix, f load.MatrixProblem) {
	if f.Row < 0 || f.Col < 0 {
		detail := fmt.Sprintf(matrixHas, f.Detail)
		if strings.HasPrefix(f.Detail, "is ") || strings.HasPrefix(f.Detail, "has ") {
			detail = fmt.Sprintf(matrixIs, f.Detail)
		}
		if strings.Contains(f.Detail, "positive definite") {
			detail += fmt.Sprintf(weighing, strings.Join(r.weighing(m), ", "))
		}
		r.ps.add(0, nil, "%s", detail)
		return
	}
	names := fmt.Sprintf(entryOf, r.names[f.Row], r.names[f.Col])
	if f.Row == f.Col {
		names = fmt.Sprintf(diagonalOf, r.names[f.Row])
	}
	line, c := m.place(f.Row, f.Col)
	r.ps.add(line, c, "%s%s", names, f.Detail)
}

// place is the line and cell of entry (i, j); the row's line alone when
// no cell printed it (a diagonal left out).
func (m *matrix) place(i, j int) (int, *cell) {
	if c := m.cells[i][j]; c != nil {
		return c.line, c
	}
	return m.lines[i], nil
}

// weighing names the variables whose entries in the eigenvector of the
// matrix's smallest eigenvalue are at least half the largest in size,
// largest first: the variables whose correlations make the matrix fail
// (gonum's EigenSym).
func (r *reader) weighing(m *matrix) []string {
	v := smallestEigenvector(m.rows)
	if v == nil {
		return []string{"(its eigenvectors could not be computed)"}
	}
	idx := heaviest(v)
	var names []string
	for i, j := range idx {
		if i == maxWeighing {
			return append(names, fmt.Sprintf("and %d more", len(idx)-maxWeighing))
		}
		names = append(names, r.names[j])
	}
	return names
}

// smallestEigenvector is the eigenvector of the smallest eigenvalue of the
// symmetric matrix whose lower triangle rows gives (gonum's EigenSym, whose
// values come in ascending order); nil when it cannot be computed.
func smallestEigenvector(rows [][]float64) []float64 {
	s := mat.NewSymDense(len(rows), nil)
	for i, row := range rows {
		for j := 0; j <= i; j++ {
			s.SetSym(i, j, row[j])
		}
	}
	var eig mat.EigenSym
	if !eig.Factorize(s, true) {
		return nil
	}
	var vecs mat.Dense
	eig.VectorsTo(&vecs)
	return mat.Col(nil, 0, &vecs)
}

// heaviest are the indices of v's entries at least half the largest in
// size, largest first.
func heaviest(v []float64) []int {
	top := 0.0
	for _, x := range v {
		top = math.Max(top, math.Abs(x))
	}
	var idx []int
	for i, x := range v {
		if math.Abs(x) >= top/2 {
			idx = append(idx, i)
		}
	}
	sort.SliceStable(idx, func(a, b int) bool { return math.Abs(v[idx[a]]) > math.Abs(v[idx[b]]) })
	return idx
}

// maxWeighing is how many variables a problem names before counting the
// rest.
const maxWeighing = 8

// Formats of the problems and guesses with the sample size.
const (
	nTooSmall = "n = %d; a summary screen needs at least 3"
	nTooLarge = "n = %d; the package format's limit is 100000000"
	nFrom     = "n = %d, from line %d"
	nOther    = "line %d also gives n = %d: check which is the sample's size"
)

// sampleSize takes n from the first skipped line that gives one.
func (r *reader) sampleSize() {
	sort.SliceStable(r.notes, func(a, b int) bool { return r.notes[a].no < r.notes[b].no })
	from := 0
	for _, l := range r.notes {
		for _, n := range sampleSizes(l.text) {
			switch {
			case from == 0:
				r.t.N, from = n, l.no
				r.guess(nFrom, n, l.no)
				r.checkN(n, l.no)
			case n != r.t.N:
				r.guess(nOther, l.no, n)
			}
		}
	}
}

func (r *reader) checkN(n, line int) {
	switch {
	case n < 3:
		r.ps.add(line, nil, nTooSmall, n)
	case n > 100_000_000:
		r.ps.add(line, nil, nTooLarge, n)
	}
}
