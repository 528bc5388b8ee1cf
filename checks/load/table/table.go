package table

import (
	"fmt"
	"sort"
	"strings"
	"unicode/utf8"

	"github.com/pathvet/pathvet/checks"
)

// Limits on what Read takes.
const (
	// MaxBytes bounds the text: a full matrix of MaxVariables variables,
	// each cell printed as "   −.01**" (11 bytes), fits in it.
	MaxBytes = 4 << 20
	// MaxVariables is the package format's limit on variables.
	MaxVariables = 500
	// maxProblems is how many problems are listed before the rest are
	// counted.
	maxProblems = 100
	// maxLabel is the package format's limit on a label, in characters.
	maxLabel = 1000
	// maxLines bounds the non-blank lines: the rows, a header, a title and
	// notes.
	maxLines = 4 * MaxVariables
	// maxCells bounds a line's cells: a row of the full matrix, its label,
	// number, M and SD, with room for words in the label.
	maxCells = 2*MaxVariables + 10
)

// Variable is one row of the table.
type Variable struct {
	Name  string // a variable name of the package format, unique in the table
	Label string // the row's label as printed, without its number; "" when the row has none
}

// Table is what a printed table gives.
type Table struct {
	Variables []Variable
	// Correlations is the lower triangle, as the package format takes it:
	// row i has i+1 entries, the last 1.
	Correlations [][]float64
	Means, SDs   []float64 // nil when the table prints none
	// Reliabilities are the figures printed in parentheses on the
	// diagonal ("(.84)", usually Cronbach's α), 0 for a variable whose
	// diagonal has none; nil when no diagonal has one.
	Reliabilities []float64
	N             int // 0 when no line gives it
	// Guesses lists, in words, what the reader took for granted and the
	// user should confirm: the separator, which column is M and which SD,
	// the triangle, the lines it skipped.
	Guesses []string
	// Marks counts the significance marks stripped from the numbers, by
	// mark ("*", "**", "†").
	Marks map[string]int
}

// Names are the variables' names in the table's order.
func (t *Table) Names() []string {
	names := make([]string, len(t.Variables))
	for i, v := range t.Variables {
		names[i] = v.Name
	}
	return names
}

// Data is the table as a package's data section of kind summary.
func (t *Table) Data() checks.Data {
	return checks.Data{Kind: checks.DataSummary, N: t.N, Variables: t.Names(),
		Correlations: t.Correlations, SDs: t.SDs, Means: t.Means}
}

// Problem is one thing Read could not read, at a line and cell of the
// text (1-based; Line 0 is the table as a whole, Cell 0 the whole line).
type Problem struct {
	Line, Cell int
	Text       string // the cell as given; "" for a whole line or the table
	Detail     string // what is wrong and what was expected
}

// String gives the problem on one line: `line 4, cell 3 ("x"): ...`.
func (p Problem) String() string {
	var b strings.Builder
	switch {
	case p.Line > 0 && p.Cell > 0:
		fmt.Fprintf(&b, "line %d, cell %d", p.Line, p.Cell)
	case p.Line > 0:
		fmt.Fprintf(&b, "line %d", p.Line)
	default:
		b.WriteString("table")
	}
	if p.Text != "" {
		fmt.Fprintf(&b, " (%q)", p.Text)
	}
	return b.String() + ": " + p.Detail
}

// Error lists every problem found in a table; More counts those past the
// list's limit. TooLarge is set when the text was refused for its size.
type Error struct {
	Problems []Problem
	More     int
	TooLarge bool
}

func (e *Error) Error() string {
	lines := make([]string, 0, len(e.Problems)+2)
	lines = append(lines, "the table cannot be read:")
	for _, p := range e.Problems {
		lines = append(lines, "  "+p.String())
	}
	if e.More > 0 {
		lines = append(lines, fmt.Sprintf("  and %d further problems", e.More))
	}
	return strings.Join(lines, "\n")
}

// problems collects Problems up to maxProblems.
type problems struct{ e Error }

func (ps *problems) add(line int, c *cell, format string, args ...any) {
	p := Problem{Line: line, Detail: fmt.Sprintf(format, args...)}
	if c != nil {
		p.Cell, p.Text = c.pos, c.text
	}
	if len(ps.e.Problems) >= maxProblems {
		ps.e.More++
		return
	}
	ps.e.Problems = append(ps.e.Problems, p)
}

func (ps *problems) any() bool { return len(ps.e.Problems) > 0 }

// Formats of the problems with the text as a whole.
const (
	tooLarge = "the text is %d bytes; the limit is %d"
	notUTF8  = "is not valid UTF-8 text"
	noRows   = "no rows of numbers found: expected one row per variable, its label first, then its M, SD " +
		"and correlations"
	tooFewRows = "found %s of numbers; a correlation table has at least two variables"
	tooMany    = "has %d variables; the limit is %d"
	longText   = "has more than %d non-blank lines, more than a table of at most %d variables has"
	longLine   = "has %d cells; a row of a table of at most %d variables has at most %d"
)

// Read reads a printed table of means, SDs and correlations (Table 1 of a
// paper, as copied from a PDF, a word processor or a spreadsheet) and
// checks its matrix by the package format's rules (load.CheckCorrelations).
// What it cannot read is an *Error that lists every problem with its line
// and cell.
func Read(text string) (*Table, error) {
	if len(text) > MaxBytes {
		return nil, &Error{TooLarge: true, Problems: []Problem{{Detail: fmt.Sprintf(tooLarge, len(text), MaxBytes)}}}
	}
	r := &reader{t: &Table{Marks: map[string]int{}}}
	if !utf8.ValidString(text) {
		r.ps.add(firstInvalidLine(text), nil, notUTF8)
		return nil, &r.ps.e
	}
	if lines := splitLines(text, maxLines); r.bounded(lines) {
		r.read(lines)
	}
	if r.ps.any() {
		ps := r.ps.e.Problems
		sort.SliceStable(ps, func(a, b int) bool {
			return ps[a].Line < ps[b].Line || ps[a].Line == ps[b].Line && ps[a].Cell < ps[b].Cell
		})
		return nil, &r.ps.e
	}
	return r.t, nil
}

// bounded reports the lines and the lines' cells past their limits, and
// whether there were none. Cells are counted for every separator at once:
// tabs, semicolons, commas and runs of spaces.
func (r *reader) bounded(lines []line) bool {
	if len(lines) > maxLines {
		r.ps.add(0, nil, longText, maxLines, MaxVariables)
		return false
	}
	for _, l := range lines {
		n := 1 + max(strings.Count(l.raw, "\t"), strings.Count(l.raw, ";"), strings.Count(l.raw, ","),
			countWords(l.text)-1)
		if n > maxCells {
			r.ps.add(l.no, nil, longLine, n, MaxVariables, maxCells)
		}
	}
	return !r.ps.any()
}

// countWords counts the runs of characters other than spaces and tabs.
func countWords(s string) int {
	n, in := 0, false
	for i := 0; i < len(s); i++ {
		space := s[i] == ' ' || s[i] == '\t'
		if !space && !in {
			n++
		}
		in = !space
	}
	return n
}

// firstInvalidLine is the line of text's first byte that is not UTF-8.
func firstInvalidLine(text string) int {
	for i, l := range strings.Split(text, "\n") {
		if !utf8.ValidString(l) {
			return i + 1
		}
	}
	return 0
}

// count words a count of things: "no row", "1 row", "2 rows".
func count(n int, thing string) string {
	switch n {
	case 0:
		return "no " + thing
	case 1:
		return "1 " + thing
	}
	return fmt.Sprintf("%d %ss", n, thing)
}

// guess notes what was taken for granted.
func (r *reader) guess(format string, args ...any) {
	r.t.Guesses = append(r.t.Guesses, fmt.Sprintf(format, args...))
}
