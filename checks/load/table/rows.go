package table

import (
	"regexp"
	"strconv"
	"strings"
)

// row is one line cut into cells, its number and label taken apart.
type row struct {
	line   line
	cells  []cell
	lead   int    // how many cells the number and label take
	label  string // "" when the row has none
	number int    // the printed row number; 0 when none
}

var (
	rowNumberRE = regexp.MustCompile(`^\(?(\d{1,3})[.):]?\)?$`)
	numberedRE  = regexp.MustCompile(`^\(?(\d{1,3})(?:[.):]\)?\s*|\s+)(\D.*)$`)
	titleRE     = regexp.MustCompile(`(?i)^(table|tab\.|figure|fig\.)\s*[0-9ivx]`)
	noteRE      = regexp.MustCompile(`(?i)^(notes?\b|sources?\b|[*†‡§ᵃᵇ]|[ab]\s+\pL|p\s*[<=>≤]|\(?n\s*=)`)
)

// parseRow cuts a line into cells and takes its number and label apart.
func parseRow(l line, sep separator, dec byte, header bool) row {
	texts := sep.split(l)
	if header {
		texts = sep.splitHeader(l)
	}
	r := row{line: l, cells: make([]cell, len(texts))}
	for i, t := range texts {
		r.cells[i] = parseCell(t, i+1, dec)
		r.cells[i].line = l.no
	}
	r.takeLabel()
	return r
}

// takeLabel finds the row's number and label: "1. Noise" in one cell, or
// "1" and "Noise" in two; a row whose first cell is a value has neither.
func (r *row) takeLabel() {
	if len(r.cells) == 0 {
		return
	}
	c0 := r.cells[0]
	if c0.kind != text {
		if len(r.cells) > 1 && r.cells[1].kind == text && rowNumberRE.MatchString(c0.text) {
			r.number, _ = strconv.Atoi(rowNumberRE.FindStringSubmatch(c0.text)[1])
			r.label, r.lead = r.cells[1].text, 2
		}
		return
	}
	r.label, r.lead = c0.text, 1
	if m := numberedRE.FindStringSubmatch(c0.text); m != nil {
		r.number, _ = strconv.Atoi(m[1])
		r.label = strings.TrimSpace(m[2])
	}
}

// values are the cells after the number and label.
func (r *row) values() []cell { return r.cells[r.lead:] }

// filled are the values that are not empty.
func (r *row) filled() []cell {
	var out []cell
	for _, c := range r.values() {
		if c.kind != empty {
			out = append(out, c)
		}
	}
	return out
}

// dataLike reports whether a line reads as a row of the table: numbered
// with a label, or more values than words after its label.
func (r *row) dataLike() bool {
	if noteRE.MatchString(r.line.text) || titleRE.MatchString(r.line.text) {
		return false
	}
	if r.number > 0 && r.label != "" {
		return true
	}
	values, words := r.counts()
	return values > words
}

// Words that name a header's or a row's role, lower case, without dots
// and spaces.
var (
	meanWords  = words("m mean means average avg")
	sdWords    = words("sd s.d sds std.dev stddev std standarddeviation")
	pairWords  = words("m(sd) mean(sd) m±sd mean±sd means(sds)")
	labelWords = words("variable variables measure measures construct constructs item items #")
)

func words(s string) map[string]bool {
	m := map[string]bool{}
	for _, w := range strings.Fields(s) {
		m[w] = true
	}
	return m
}

// roleWord is a cell's text as the role words are spelt.
func roleWord(s string) string {
	s = strings.ToLower(strings.Join(strings.Fields(s), ""))
	return strings.TrimSuffix(s, ".")
}

// descriptive reports whether a row is a row of means or SDs ("M", "SD").
func (r *row) descriptive() bool {
	w := roleWord(r.label)
	return r.number == 0 && (meanWords[w] || sdWords[w])
}

// sampleSizeRE finds "N = 812", "n=1,204" or "(N = 812)" in a note.
var sampleSizeRE = regexp.MustCompile(`(?i)(?:^|[^\pL\pN])n\s*=\s*(\d{1,3}(?:[,.\s]\d{3})+|\d+)([.,]?\d?)`)

// sampleSizes are the sample sizes a line gives.
func sampleSizes(text string) []int {
	var out []int
	for _, m := range sampleSizeRE.FindAllStringSubmatch(text, -1) {
		if len(m[2]) == 2 { // "n = 81.2" is no count
			continue
		}
		digits := strings.Map(func(r rune) rune {
			if r >= '0' && r <= '9' {
				return r
			}
			return -1
		}, m[1])
		if n, err := strconv.Atoi(digits); err == nil && len(digits) <= 10 {
			out = append(out, n)
		}
	}
	return out
}

// counts are the values and the words after the label.
func (r *row) counts() (values, words int) {
	for _, c := range r.values() {
		switch {
		case c.value():
			values++
		case c.kind == text:
			words++
		}
	}
	return values, words
}

// labelCell is the cell of the row's label; nil when it has none.
func (r *row) labelCell() *cell {
	if r.lead == 0 {
		return nil
	}
	return &r.cells[r.lead-1]
}
