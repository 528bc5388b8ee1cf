package table

import (
	"regexp"
	"strconv"
	"strings"
	"unicode/utf8"
)

// kind is what a cell holds.
type kind int

const (
	empty  kind = iota
	dash        // "—", "–", "-" and the like: a diagonal or nothing
	number      // one number, its marks stripped
	pair        // "M (SD)" or "M ± SD" in one cell
	paren       // a number in parentheses: on a diagonal, a reliability
	text        // anything else
)

// cell is one cell of a line as read.
type cell struct {
	text  string // as given, trimmed
	line  int    // 1-based line of the text
	pos   int    // 1-based place in the line
	kind  kind
	x, sd float64  // the number, or a pair's M and SD
	marks []string // significance marks stripped from the number, in order
	minus bool     // an en dash before the number was read as a minus sign
}

// dashes are the cells that stand for nothing printed.
var dashes = map[string]bool{"-": true, "--": true, "—": true, "–": true, "‒": true, "―": true, "−": true}

// markRunes are the significance marks stripped from the end of a number;
// markSymbols those that are no letters.
const (
	markRunes   = markSymbols + "abᵃᵇ"
	markSymbols = "*†‡§"
)

var (
	pairParen = regexp.MustCompile(`^(\S+?)\s*\(\s*(\S+?)\s*\)$`)
	pairPlus  = regexp.MustCompile(`^(\S+?)\s*±\s*(\S+)$`)
)

// maxValue is the longest cell read as a number or a pair; longer cells
// are words.
const maxValue = 64

// parseCell reads one cell; dec is the decimal mark, or 0 to take either.
func parseCell(s string, pos int, dec byte) cell {
	s = strings.TrimSpace(s)
	c := cell{text: s, pos: pos, kind: text}
	switch {
	case s == "":
		c.kind = empty
	case dashes[s]:
		c.kind = dash
	case len(s) > maxValue:
	default:
		c.readValue(s, dec)
	}
	return c
}

// readValue reads a number with its marks, or a pair.
func (c *cell) readValue(s string, dec byte) {
	if x, ok := plainNumber(s, dec); ok {
		c.kind, c.x = number, x
		return
	}
	if x, marks, minus, ok := markedNumber(s, dec); ok {
		c.kind, c.x, c.marks, c.minus = number, x, marks, minus
		return
	}
	if !strings.ContainsAny(s, "(±") {
		return
	}
	if inner, ok := strings.CutPrefix(s, "("); ok && strings.HasSuffix(inner, ")") {
		if x, _, _, ok := markedNumber(strings.TrimSpace(inner[:len(inner)-1]), dec); ok {
			c.kind, c.x = paren, x
		}
		return
	}
	m := pairParen.FindStringSubmatch(s)
	if m == nil {
		m = pairPlus.FindStringSubmatch(s)
	}
	if m == nil {
		return
	}
	x, _, minusX, okX := markedNumber(m[1], dec)
	sd, _, _, okSD := markedNumber(m[2], dec)
	if okX && okSD {
		c.kind, c.x, c.sd, c.minus = pair, x, sd, minusX
	}
}

// plainNumber reads the most common cell quickly: ASCII digits, at most
// one point and a leading hyphen or plus, which strconv.ParseFloat reads
// as parseNumber does. It reports false for anything else, which
// parseNumber then reads.
func plainNumber(s string, dec byte) (float64, bool) {
	if dec == ',' || len(s) > 40 {
		return 0, false
	}
	for i := 0; i < len(s); i++ {
		c := s[i]
		if !(c >= '0' && c <= '9' || c == '.' || i == 0 && (c == '-' || c == '+')) {
			return 0, false
		}
	}
	x, err := strconv.ParseFloat(s, 64)
	return x, err == nil
}

// markedNumber strips significance marks from the end of s and reads the
// rest as a number. Marks are runs of one mark character ("**", "†").
func markedNumber(s string, dec byte) (float64, []string, bool, bool) {
	body := strings.TrimRight(s, markRunes+" ")
	x, minus, ok := parseNumber(body, dec)
	if !ok {
		return 0, nil, false, false
	}
	return x, markRuns(strings.ReplaceAll(s[len(body):], " ", "")), minus, true
}

// markRuns splits "**†" into "**" and "†".
func markRuns(s string) []string {
	var runs []string
	for s != "" {
		r, _ := utf8.DecodeRuneInString(s)
		n := len(s) - len(strings.TrimLeft(s, string(r)))
		runs = append(runs, s[:n])
		s = s[n:]
	}
	return runs
}

// minusSigns are the signs read as minus; an en dash is one only before a
// number (alone it is a dash).
var minusSigns = []string{"-", "−", "–", "‒"}

// parseNumber reads a decimal number as papers print it: a sign (hyphen,
// U+2212 minus, or an en dash, reported), digits with an optional
// decimal mark dec ('.' or ','; 0 takes either), a leading decimal mark
// allowed (".45"), and groups of three digits set apart by the other mark
// in a whole part ("1,204.5"). The digits are converted by
// strconv.ParseFloat, correctly rounded.
func parseNumber(s string, dec byte) (float64, bool, bool) {
	if dec == 0 {
		if x, minus, ok := parseNumber(s, '.'); ok {
			return x, minus, ok
		}
		return parseNumber(s, ',')
	}
	s, neg, enDash := cutSign(s)
	digits, ok := plainDigits(s, dec)
	if !ok {
		return 0, false, false
	}
	x, err := strconv.ParseFloat(digits, 64)
	if err != nil {
		return 0, false, false
	}
	if neg {
		x = -x
	}
	return x, enDash, true
}

// cutSign cuts a leading sign off s: a minus sign (and whether it was an
// en dash) or a plus.
func cutSign(s string) (string, bool, bool) {
	for _, m := range minusSigns {
		if rest, ok := strings.CutPrefix(s, m); ok {
			return rest, true, m == "–"
		}
	}
	return strings.TrimPrefix(s, "+"), false, false
}

// plainDigits rewrites a number's digits as "123.45", or reports that s is
// not one.
func plainDigits(s string, dec byte) (string, bool) {
	group := byte(',')
	if dec == ',' {
		group = '.'
	}
	whole, frac, hasFrac := strings.Cut(s, string(dec))
	if hasFrac && (frac == "" && whole == "" || !allDigits(frac)) {
		return "", false
	}
	whole, ok := ungroup(whole, group)
	if !ok || whole == "" && frac == "" || len(whole)+len(frac) > 40 {
		return "", false
	}
	return "0" + whole + "." + frac + "0", true
}

// ungroup removes group marks between groups of three digits ("1,204").
func ungroup(s string, group byte) (string, bool) {
	parts := strings.Split(s, string(group))
	for i, p := range parts {
		if !allDigits(p) || len(parts) > 1 && (p == "" || len(p) > 3 || i > 0 && len(p) != 3) {
			return "", false
		}
	}
	return strings.Join(parts, ""), true
}

func allDigits(s string) bool {
	for i := 0; i < len(s); i++ {
		if s[i] < '0' || s[i] > '9' {
			return false
		}
	}
	return true
}

// value reports whether the cell holds something a table's body holds: a
// number, a pair or a dash.
func (c cell) value() bool {
	return c.kind == number || c.kind == pair || c.kind == dash || c.kind == paren
}

// number is the cell's number (a pair's M) and whether it has one.
func (c cell) number() (float64, bool) { return c.x, c.kind == number || c.kind == pair }
