package load

import (
	"bytes"
	"strings"
)

// Problems with the data as a whole, each at line 1.
const (
	dataEmpty     = "the data are empty: the first line should name the variables, separated by commas"
	dataNotText   = "the data are %s; they should be CSV text in UTF-8"
	headerTooWide = "the header has %d fields; a package declares at most %d variables and %d ignored columns"
	otherSep      = "the data are separated by %s, not commas: save them as CSV with commas between " +
		"fields (and points, not commas, as decimal marks)"
)

// readable reports, at line 1, data that are empty or not text.
func (s *study) readable(text []byte, ps *problems) bool {
	if len(bytes.TrimSpace(text)) == 0 {
		ps.csv(1, 0, dataEmpty)
		return false
	}
	if what := notText(text); what != "" {
		ps.csv(1, 0, dataNotText, what)
		return false
	}
	return true
}

// maxColumns is the widest header a package can use: each variable and
// each ignored column once (the field rules bound the list of ignored
// columns), and as many more as the list of problems can name.
func (s *study) maxColumns() int {
	return len(s.Names) + len(s.Package.Data.IgnoreColumns) + maxProblems
}

// headerFits reports a header wider than maxColumns, which is counted,
// not read.
func (s *study) headerFits(sc *scanner, ps *problems) bool {
	if sc.extra == 0 {
		return true
	}
	ps.csv(1, 0, headerTooWide, sc.width(), len(s.Names), len(s.Package.Data.IgnoreColumns))
	return false
}

// separators are the field separators other than the comma that data
// are often saved with.
var separators = []struct {
	sep  string
	name string
}{{";", "semicolons (;)"}, {"\t", "tabs"}, {"|", "vertical bars (|)"}}

// otherSeparator reports a header that names the variables with another
// separator than the comma, as a spreadsheet set to a decimal comma saves
// it: one problem, instead of one for every column.
func (s *study) otherSeparator(head []cell, ps *problems) bool {
	if s.headerNamesVariables(head) {
		return false
	}
	for _, sp := range separators {
		known := 0
		for _, c := range head {
			for _, name := range strings.Split(string(c.b), sp.sep) {
				if _, ok := s.Index[strings.TrimSpace(name)]; ok && strings.Contains(string(c.b), sp.sep) {
					known++
				}
			}
		}
		if known >= 2 || (known == 1 && len(s.Names) == 1) {
			ps.csv(1, 0, otherSep, sp.name)
			return true
		}
	}
	return false
}

// headerNamesVariables reports whether every variable has a column of its
// own in the header, as it should.
func (s *study) headerNamesVariables(head []cell) bool {
	found := 0
	for _, c := range head {
		if _, ok := s.Index[strings.TrimSpace(string(c.b))]; ok {
			found++
		}
	}
	return found == len(s.Names)
}
