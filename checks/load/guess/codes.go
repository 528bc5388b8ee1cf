package guess

import (
	"fmt"
	"maps"
	"math"
	"slices"
	"strconv"
	"strings"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/load"
)

// findCodes sorts the suspect values of the column into likely missing
// codes, which then count as missing, and other extremes.
func (c *Column) findCodes() {
	if s, ok := c.binaryCodes(); ok {
		c.Codes = s
	} else {
		for _, s := range load.Suspects(c.Name, c.values) {
			if !s.Code {
				c.Extreme = append(c.Extreme, s)
				continue
			}
			c.Codes = append(c.Codes, s)
		}
	}
	for _, s := range c.Codes {
		for i, x := range c.values {
			if x == s.Value {
				c.values[i] = math.NaN()
				c.Missing++
			}
		}
	}
}

// binaryCodes finds code-like values (99, −9999) in a column whose other
// values are all 0 or 1: there the quartiles cannot tell, but a binary
// variable coded 0 and 1 has no other value.
func (c *Column) binaryCodes() ([]checks.Suspect, bool) {
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
		out = append(out, checks.Suspect{Variable: c.Name, Value: v, Count: counts[v], Code: true,
			Q1: math.NaN(), Q3: math.NaN()})
	}
	return out, len(out) > 0
}

// codeText is a code as the data write it, for missing_codes, which are
// compared as text.
func (c *Column) codeText(v float64) []string {
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

// Formats of the notes on a column's marks, codes and extreme values.
const (
	markNote = "%q in %s, %s: a missing mark, listed in missing_codes"
	codeNote = "%s in %s, %s: looks like a missing code, listed in missing_codes; " +
		"remove it if these are real values"
	extremeNote = "%s in %s, %s: far outside the other values (quartiles %.4g and %.4g); check that these are real"
)

// Notes are one sentence for each missing mark, likely missing code and
// far-out value of the column, in that order; none for a skipped column.
func (c *Column) Notes() []string {
	if c.Skip != "" {
		return nil
	}
	var out []string
	for _, m := range slices.Sorted(maps.Keys(c.Marks)) {
		out = append(out, fmt.Sprintf(markNote, m, c.Name, rowCount(c.Marks[m])))
	}
	for _, s := range c.Codes {
		out = append(out, fmt.Sprintf(codeNote, strings.Join(c.codeText(s.Value), " and "), c.Name, rowCount(s.Count)))
	}
	for _, s := range c.Extreme {
		out = append(out, fmt.Sprintf(extremeNote, strconv.FormatFloat(s.Value, 'g', -1, 64), c.Name,
			rowCount(s.Count), s.Q1, s.Q3))
	}
	return out
}

// rowCount words a number of rows: "1 row", "2 rows".
func rowCount(n int) string {
	if n == 1 {
		return "1 row"
	}
	return fmt.Sprintf("%d rows", n)
}
