package main

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
	"github.com/pathvet/pathvet/checks/load"
)

// varName is the package format's rule for a variable name.
var varName = regexp.MustCompile(`^[A-Za-z][A-Za-z0-9_]{0,63}$`)

// column is one CSV column as pathvet init reads it.
type column struct {
	name   string
	cells  []string  // trimmed
	values []float64 // NaN where missing or not a number
	// skip says why the column cannot be a variable ("" when it can).
	skip    string
	scale   string
	why     string           // how the scale was guessed
	marks   map[string]int   // non-numeric missing marks, with their counts
	codes   []checks.Suspect // likely missing codes
	extreme []checks.Suspect // repeated far-out values that are not code-like
	missing int
}

// readColumns reads a CSV with a header into columns. Ragged rows are
// allowed when ragged is set (a printed lower triangle), their missing
// cells empty.
func readColumns(text []byte, ragged bool) ([]*column, int, error) {
	r := csv.NewReader(bytes.NewReader(bytes.TrimPrefix(text, []byte("\xef\xbb\xbf"))))
	if ragged {
		r.FieldsPerRecord = -1
	}
	recs, err := r.ReadAll()
	if err != nil {
		return nil, 0, err
	}
	if len(recs) < 2 {
		return nil, 0, fmt.Errorf("the data need a header and at least one row")
	}
	cols := make([]*column, len(recs[0]))
	for j, h := range recs[0] {
		cols[j] = &column{name: strings.TrimSpace(h), marks: map[string]int{}}
		for _, rec := range recs[1:] {
			cell := ""
			if j < len(rec) {
				cell = strings.TrimSpace(rec[j])
			}
			cols[j].cells = append(cols[j].cells, cell)
		}
	}
	return cols, len(recs) - 1, nil
}

// inspect parses the column's numbers, finds its missing marks and codes,
// and guesses its scale.
func (c *column) inspect() {
	if !varName.MatchString(c.name) {
		c.skip = "its name is not a variable name (letters, digits and _, starting with a letter); " +
			"rename it in the CSV to use it"
		return
	}
	for i, cell := range c.cells {
		x, err := strconv.ParseFloat(cell, 64)
		switch {
		case cell == "" || strings.EqualFold(cell, "NA"):
			c.missing++
		case err == nil && !math.IsNaN(x) && !math.IsInf(x, 0):
			c.values = append(c.values, x)
			continue
		case isMissingMark(cell):
			c.marks[cell]++
			c.missing++
		default:
			c.skip = fmt.Sprintf("it holds text (%q on line %d)", cell, i+2)
			return
		}
		c.values = append(c.values, math.NaN())
	}
	c.findCodes()
	c.guessScale()
}

// isMissingMark reports whether a cell that is no number looks like a
// missing mark (the loader gives the same hint in its errors).
func isMissingMark(cell string) bool {
	switch strings.ToLower(cell) {
	case ".", "-", "?", "nan", "n/a", "null", "none", "missing", "miss", "--", "..":
		return true
	}
	return false
}

// findCodes sorts the suspect values of the column into likely missing
// codes, which then count as missing, and other extremes.
func (c *column) findCodes() {
	if s, ok := c.binaryCodes(); ok {
		c.codes = s
	} else {
		for _, s := range load.Suspects(c.name, c.values) {
			if !s.Code {
				c.extreme = append(c.extreme, s)
				continue
			}
			c.codes = append(c.codes, s)
		}
	}
	for _, s := range c.codes {
		for i, x := range c.values {
			if x == s.Value {
				c.values[i] = math.NaN()
				c.missing++
			}
		}
	}
}

// binaryCodes finds code-like values (99, −9999) in a column whose other
// values are all 0 or 1: there the quartiles cannot tell, but a binary
// variable coded 0 and 1 has no other value.
func (c *column) binaryCodes() ([]checks.Suspect, bool) {
	counts := map[float64]int{}
	for _, x := range c.values {
		switch {
		case math.IsNaN(x) || x == 0 || x == 1:
		case load.CodeLike(x):
			counts[x]++
		default:
			return nil, false
		}
	}
	var out []checks.Suspect
	for _, v := range slices.Sorted(maps.Keys(counts)) {
		out = append(out, checks.Suspect{Variable: c.name, Value: v, Count: counts[v], Code: true,
			Q1: math.NaN(), Q3: math.NaN()})
	}
	return out, len(out) > 0
}

// codeText is a code as the data write it, for missing_codes, which are
// compared as text.
func (c *column) codeText(v float64) []string {
	seen := map[string]bool{}
	var out []string
	for _, cell := range c.cells {
		if x, err := strconv.ParseFloat(cell, 64); err == nil && x == v && !seen[cell] {
			seen[cell] = true
			out = append(out, cell)
		}
	}
	return out
}

// guessScale: only 0 and 1 is binary; whole numbers with 3 to 10
// distinct values, each seen three times on average, are ordinal (a rating
// scale); anything else is continuous.
func (c *column) guessScale() {
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
		c.skip = "every value is missing"
	case binary:
		c.scale, c.why = checks.ScaleBinary, "only 0 and 1"
	case whole && len(distinct) >= 3 && len(distinct) <= 10 && seen >= 3*len(distinct):
		c.scale, c.why = checks.ScaleOrdinal, fmt.Sprintf("%d distinct whole numbers", len(distinct))
	default:
		c.scale, c.why = checks.ScaleContinuous, fmt.Sprintf("%d distinct values", len(distinct))
	}
}

// codeTexts are the column's missing marks and codes as the data write
// them.
func (c *column) codeTexts() []string {
	out := slices.Sorted(maps.Keys(c.marks))
	for _, s := range c.codes {
		out = append(out, c.codeText(s.Value)...)
	}
	return out
}

// skippedNotes lists the columns that are not variables, and why.
func skippedNotes(cols []*column) string {
	var b strings.Builder
	for _, c := range cols {
		if c.skip != "" {
			fmt.Fprintf(&b, "  %-20s skipped (in ignore_columns): %s\n", c.name, c.skip)
		}
	}
	if b.Len() == 0 {
		return ""
	}
	return "Columns that are not variables:\n" + b.String()
}

// codeNotes says which missing marks and codes were found, and which
// values to look at.
func codeNotes(cols []*column) string {
	var b strings.Builder
	for _, c := range cols {
		if c.skip != "" {
			continue
		}
		for _, m := range slices.Sorted(maps.Keys(c.marks)) {
			fmt.Fprintf(&b, "  %q in %s, %d rows: a missing mark, listed in missing_codes\n", m, c.name, c.marks[m])
		}
		for _, s := range c.codes {
			fmt.Fprintf(&b, "  %s in %s, %d rows: looks like a missing code, listed in missing_codes; "+
				"remove it if these are real values\n",
				strings.Join(c.codeText(s.Value), " and "), c.name, s.Count)
		}
		for _, s := range c.extreme {
			fmt.Fprintf(&b, "  %s in %s, %d rows: far outside the other values (quartiles %.4g and %.4g); "+
				"check that these are real\n",
				strconv.FormatFloat(s.Value, 'g', -1, 64), c.name, s.Count, s.Q1, s.Q3)
		}
	}
	if b.Len() == 0 {
		return ""
	}
	return "Missing codes and values to look at:\n" + b.String()
}
