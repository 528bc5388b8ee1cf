package table

import (
	"fmt"
	"regexp"
	"strings"
	"unicode/utf8"
)

// maxName is the package format's limit on a variable name's length.
const maxName = 64

// folds spell common accented Latin letters in ASCII.
var folds = strings.NewReplacer(
	"à", "a", "á", "a", "â", "a", "ã", "a", "ä", "a", "å", "a", "ā", "a", "ą", "a", "æ", "ae",
	"ç", "c", "č", "c", "ć", "c", "ď", "d", "è", "e", "é", "e", "ê", "e", "ë", "e", "ě", "e", "ę", "e", "ē", "e",
	"ğ", "g", "ì", "i", "í", "i", "î", "i", "ï", "i", "ı", "i", "ł", "l", "ñ", "n", "ń", "n", "ň", "n",
	"ò", "o", "ó", "o", "ô", "o", "õ", "o", "ö", "o", "ø", "o", "ő", "o", "œ", "oe", "ř", "r",
	"ś", "s", "š", "s", "ş", "s", "ß", "ss", "ť", "t", "ù", "u", "ú", "u", "û", "u", "ü", "u", "ů", "u", "ű", "u",
	"ý", "y", "ÿ", "y", "ź", "z", "ż", "z", "ž", "z",
)

var notNameRE = regexp.MustCompile(`[^a-z0-9]+`)

// nameOf makes a variable name from a label: lower case, accents
// dropped, every run of other characters one underscore, "v_" before a
// leading digit, at most 64 characters; "" when nothing is left.
func nameOf(label string) string {
	s := notNameRE.ReplaceAllString(folds.Replace(strings.ToLower(label)), "_")
	s = strings.Trim(s, "_")
	if s != "" && s[0] >= '0' && s[0] <= '9' {
		s = "v_" + s
	}
	if len(s) > maxName {
		s = strings.TrimRight(s[:maxName], "_")
	}
	return s
}

// Formats of the problems and guesses with labels.
const (
	labelTooLong = "a label has at most %d characters (the package format's limit); this one has %d"
	noLabels     = "rows without a label to name their variable: %d; each is named var_ and its row's number: " +
		"rename them in the package"
	renamedTwice = "the label of line %d gives the name %s, as the label of line %d does: it is named %s"
)

// variableNames names the rows' variables after their labels, else the
// header's column names, else var_1, var_2, ...; names are made unique.
func (r *reader) variableNames() []string {
	names := make([]string, len(r.rows))
	seen := map[string]int{} // name → line
	unnamed := 0
	for i, rw := range r.rows {
		label := r.label(i)
		if n := utf8.RuneCountInString(label); n > maxLabel {
			r.ps.add(rw.line.no, rw.labelCell(), labelTooLong, maxLabel, n)
		}
		name := nameOf(label)
		if name == "" {
			unnamed++
			name = fmt.Sprintf("var_%d", i+1)
		}
		names[i] = r.unique(name, rw.line.no, seen)
		r.t.Variables = append(r.t.Variables, Variable{Name: names[i], Label: label})
	}
	if unnamed > 0 {
		r.guess(noLabels, unnamed)
	}
	return names
}

// label is row i's label, or the header's name for its column.
func (r *reader) label(i int) string {
	if l := r.rows[i].label; l != "" {
		return l
	}
	if h := r.header; h != nil && i < len(h.names) {
		return h.names[i]
	}
	return ""
}

// unique returns name, or name_2, name_3, ... when it is taken.
func (r *reader) unique(name string, line int, seen map[string]int) string {
	first, taken := seen[name]
	out := name
	for n := 2; taken; n++ {
		suffix := fmt.Sprintf("_%d", n)
		out = name[:min(len(name), maxName-len(suffix))] + suffix
		_, taken = seen[out]
	}
	if out != name {
		r.guess(renamedTwice, line, name, first, out)
	}
	seen[out] = line
	return out
}
