package guess

import (
	"bytes"
	"encoding/csv"
	"fmt"
	"maps"
	"math"
	"regexp"
	"slices"
	"strconv"
	"strings"

	"github.com/pathvet/pathvet/checks"
)

// varName is the package format's rule for a variable name.
var varName = regexp.MustCompile(`^[A-Za-z][A-Za-z0-9_]{0,63}$`)

// Column is one CSV column and what was guessed from it.
type Column struct {
	Name string
	// Skip says why the column cannot be a variable ("" when it can).
	Skip  string
	Scale string
	Why   string // how the scale was guessed, in words
	// Marks counts the cells that are no number but a missing mark (".",
	// "n/a"), by mark.
	Marks map[string]int
	// Codes are the likely missing codes; Extreme the repeated far-out
	// values that are not code-like.
	Codes, Extreme []checks.Suspect
	// Missing counts the column's missing cells: empty, NA, marks and codes.
	Missing int
	cells   []string  // trimmed
	values  []float64 // NaN where missing or not a number
}

// Rows is what a CSV's columns suggest for a package.
type Rows struct {
	N       int // data rows
	Columns []*Column
	// Variables are the columns that can be variables, with their scales.
	Variables []checks.Variable
	// MissingCodes are the marks and codes as the data write them, sorted;
	// Ignore the columns that cannot be variables.
	MissingCodes, Ignore []string
	// Missing counts the missing cells of the variables.
	Missing int
}

// Read reads a CSV with a header and guesses from each column.
func Read(text []byte) (*Rows, error) {
	cols, n, err := readColumns(text)
	if err != nil {
		return nil, err
	}
	r := &Rows{N: n, Columns: cols}
	var codes []string
	for _, c := range cols {
		c.inspect()
		if c.Skip != "" {
			r.Ignore = append(r.Ignore, c.Name)
			continue
		}
		r.Variables = append(r.Variables, checks.Variable{Name: c.Name, Scale: c.Scale})
		codes = append(codes, c.CodeTexts()...)
		r.Missing += c.Missing
	}
	slices.Sort(codes)
	r.MissingCodes = slices.Compact(codes)
	return r, nil
}

// readColumns reads a CSV with a header into columns.
func readColumns(text []byte) ([]*Column, int, error) {
	r := csv.NewReader(bytes.NewReader(bytes.TrimPrefix(text, []byte("\xef\xbb\xbf"))))
	recs, err := r.ReadAll()
	if err != nil {
		return nil, 0, err
	}
	if len(recs) < 2 {
		return nil, 0, fmt.Errorf("the data need a header and at least one row")
	}
	cols := make([]*Column, len(recs[0]))
	for j, h := range recs[0] {
		cols[j] = &Column{Name: strings.TrimSpace(h), Marks: map[string]int{}}
		for _, rec := range recs[1:] {
			cols[j].cells = append(cols[j].cells, strings.TrimSpace(rec[j]))
		}
	}
	return cols, len(recs) - 1, nil
}

// inspect parses the column's numbers, finds its missing marks and codes,
// and guesses its scale.
func (c *Column) inspect() {
	if !varName.MatchString(c.Name) {
		c.Skip = "its name is not a variable name (letters, digits and _, starting with a letter); " +
			"rename it in the CSV to use it"
		return
	}
	for i, cell := range c.cells {
		x, err := strconv.ParseFloat(cell, 64)
		switch {
		case cell == "" || strings.EqualFold(cell, "NA"):
			c.Missing++
		case err == nil && !math.IsNaN(x) && !math.IsInf(x, 0):
			c.values = append(c.values, x)
			continue
		case IsMissingMark(cell):
			c.Marks[cell]++
			c.Missing++
		default:
			c.Skip = fmt.Sprintf("it holds text (%q on line %d)", cell, i+2)
			return
		}
		c.values = append(c.values, math.NaN())
	}
	c.findCodes()
	c.guessScale()
}

// IsMissingMark reports whether a cell that is no number looks like a
// missing mark (the loader gives the same hint in its errors).
func IsMissingMark(cell string) bool {
	switch strings.ToLower(cell) {
	case ".", "-", "?", "nan", "n/a", "null", "none", "missing", "miss", "--", "..":
		return true
	}
	return false
}

// guessScale: only 0 and 1 is binary; whole numbers with 3 to 10
// distinct values, each seen three times on average, are ordinal (a rating
// scale); anything else is continuous.
func (c *Column) guessScale() {
	distinct := map[float64]bool{}
	whole, seen := true, 0
	for _, x := range c.values {
		if !math.IsNaN(x) {
			distinct[x], seen = true, seen+1
			whole = whole && x == math.Trunc(x)
		}
	}
	binary := len(distinct) > 0
	for x := range distinct {
		binary = binary && (x == 0 || x == 1)
	}
	switch {
	case len(distinct) == 0:
		c.Skip = "every value is missing"
	case binary:
		c.Scale, c.Why = checks.ScaleBinary, "only 0 and 1"
	case whole && len(distinct) >= 3 && len(distinct) <= 10 && seen >= 3*len(distinct):
		c.Scale, c.Why = checks.ScaleOrdinal, fmt.Sprintf("%d distinct whole numbers", len(distinct))
	default:
		c.Scale, c.Why = checks.ScaleContinuous, fmt.Sprintf("%d distinct values", len(distinct))
	}
}

// CodeTexts are the column's missing marks and codes as the data write
// them.
func (c *Column) CodeTexts() []string {
	out := slices.Sorted(maps.Keys(c.Marks))
	for _, s := range c.Codes {
		out = append(out, c.codeText(s.Value)...)
	}
	return out
}
