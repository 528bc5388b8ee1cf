package table

import (
	"strings"
)

// line is one non-blank line of the text.
type line struct {
	no   int    // 1-based
	text string // trimmed
	raw  string // as given, for separators that mark empty cells at its ends
}

// spaceLike are the characters a PDF or a word processor puts for a space.
var spaceLike = strings.NewReplacer("\u00a0", " ", "\u2009", " ", "\u202f", " ", "\u2007", " ", "\r", "")

// splitLines numbers the non-blank lines of text, its byte-order mark
// dropped and odd spaces made plain; it stops past limit lines.
func splitLines(text string, limit int) []line {
	text = strings.TrimPrefix(text, "\ufeff")
	text = strings.ReplaceAll(text, "\r\n", "\n")
	text = strings.ReplaceAll(text, "\r", "\n")
	var out []line
	for i := 1; text != "" && len(out) <= limit; i++ {
		l, rest, _ := strings.Cut(text, "\n")
		raw := spaceLike.Replace(l)
		if t := strings.TrimSpace(raw); t != "" {
			out = append(out, line{no: i, text: t, raw: raw})
		}
		text = rest
	}
	return out
}

// separator is how a line's cells are set apart.
type separator int

const (
	tabs separator = iota
	semicolons
	commas
	wideSpaces   // runs of two or more spaces, or tabs: text copied from a PDF
	singleSpaces // any spaces; a row's label is the words before its first value
)

var separators = []separator{tabs, semicolons, commas, wideSpaces, singleSpaces}

// guess words each separator for the user to confirm.
func (s separator) guess() string {
	return [...]string{
		"columns set apart by tabs",
		"columns set apart by semicolons",
		"columns set apart by commas",
		"columns set apart by runs of two or more spaces (as in text copied from a PDF)",
		"columns set apart by single spaces: each row's label is taken to be the words before its first number",
	}[s]
}

// delimited reports whether empty cells keep their place: the separator
// marks every cell.
func (s separator) delimited() bool { return s <= commas }

// split cuts a line into its cells' texts.
func (s separator) split(l line) []string {
	t := l.text
	switch s {
	case tabs:
		return strings.Split(strings.TrimRight(l.raw, " "), "\t")
	case semicolons:
		return quoted(l.raw, ';')
	case commas:
		return quoted(l.raw, ',')
	case wideSpaces:
		return splitWide(t)
	}
	return labelFirst(fields(t))
}

// splitWide cuts t at tabs and at runs of two or more spaces.
func splitWide(t string) []string {
	var cells []string
	start := 0
	for i := 0; i < len(t); i++ {
		if t[i] != '\t' && (t[i] != ' ' || i+1 == len(t) || t[i+1] != ' ' && t[i+1] != '\t') {
			continue
		}
		j := i
		for j < len(t) && (t[j] == ' ' || t[j] == '\t') {
			j++
		}
		cells = append(cells, t[start:i])
		start, i = j, j-1
	}
	return append(cells, t[start:])
}

// splitHeader cuts a header line into its cells' texts: with single
// spaces every word is a cell.
func (s separator) splitHeader(l line) []string {
	if s == singleSpaces {
		return fields(l.text)
	}
	return s.split(l)
}

// quoted splits t at sep outside double quotes (RFC 4180 within a line;
// "" is a quote inside a quoted cell).
func quoted(t string, sep byte) []string {
	if !strings.Contains(t, `"`) {
		return strings.Split(t, string(sep))
	}
	var cells []string
	var b strings.Builder
	in := false
	for i := 0; i < len(t); i++ {
		switch c := t[i]; {
		case c == '"' && in && i+1 < len(t) && t[i+1] == '"':
			b.WriteByte('"')
			i++
		case c == '"':
			in = !in
		case c == sep && !in:
			cells = append(cells, b.String())
			b.Reset()
		default:
			b.WriteByte(c)
		}
	}
	return append(cells, b.String())
}

// fields splits at spaces and joins what belongs to the cell before it: a
// parenthesised SD ("(6.1)"), a "±" and its SD, and marks set apart ("**").
func fields(t string) []string {
	var groups [][]string
	for _, f := range strings.Fields(t) {
		n := len(groups)
		if n > 0 && joinsPrevious(groups[n-1], f) {
			groups[n-1] = append(groups[n-1], f)
			continue
		}
		groups = append(groups, []string{f})
	}
	out := make([]string, len(groups))
	for i, g := range groups {
		out[i] = strings.Join(g, " ")
	}
	return out
}

// joinsPrevious reports whether word f belongs to the cell of the words
// before it.
func joinsPrevious(prev []string, f string) bool {
	last := prev[len(prev)-1]
	return strings.HasSuffix(last, "±") || f == "±" || strings.Trim(f, markSymbols) == "" ||
		strings.HasPrefix(f, "(") && strings.HasSuffix(f, ")")
}

// labelFirst joins the row's number and the words of its label into one
// cell: the words before the first value, and whole numbers followed by
// more words ("Time 1 anxiety").
func labelFirst(words []string) []string {
	i := 0
	if len(words) > 1 && rowNumberRE.MatchString(words[0]) && !isValue(words[1]) {
		i = 1
	}
	for i < len(words) {
		j := i
		for j < len(words) && allDigits(words[j]) {
			j++
		}
		if j == len(words) || isValue(words[j]) {
			break
		}
		i = j + 1
	}
	if i <= 1 {
		return words
	}
	return append([]string{strings.Join(words[:i], " ")}, words[i:]...)
}

func isValue(w string) bool { return parseCell(w, 0, 0).value() }
