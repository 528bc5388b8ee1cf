package api

import (
	"fmt"
	"regexp"
	"strings"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/load"
)

// nameIndex finds a variable by its name or its label, in any case and
// with runs of spaces as one.
type nameIndex struct {
	byName, byLabel map[string]string
	// twice holds the labels that two variables share.
	twice map[string][]string
	// candidates are the names and labels as written, for suggestions.
	candidates []string
}

func newNameIndex(vars []checks.Variable) *nameIndex {
	x := &nameIndex{byName: map[string]string{}, byLabel: map[string]string{}, twice: map[string][]string{}}
	for _, v := range vars {
		x.byName[fold(v.Name)] = v.Name
		x.candidates = append(x.candidates, v.Name)
	}
	for _, v := range vars {
		k := fold(v.Label)
		if k == "" || k == fold(v.Name) {
			continue
		}
		x.candidates = append(x.candidates, v.Label)
		if other, ok := x.byLabel[k]; ok && other != v.Name {
			x.twice[k] = append(x.twice[k], other, v.Name)
		}
		x.byLabel[k] = v.Name
	}
	return x
}

// fold is how names and labels are compared: lower case, runs of spaces
// as one.
func fold(s string) string { return strings.ToLower(strings.Join(strings.Fields(s), " ")) }

// Messages of name look-ups.
const (
	msgUnknownName = "%q is neither a variable's name nor its label"
	msgSharedLabel = "%q is the label of %s and %s; use the name"
	msgDidYouMean  = "; did you mean %q?"
)

// resolve finds the variable text names: by name first, then by label.
func (x *nameIndex) resolve(text string) (string, string) {
	k := fold(text)
	if n, ok := x.byName[k]; ok {
		return n, ""
	}
	if two := x.twice[k]; len(two) > 0 {
		return "", fmt.Sprintf(msgSharedLabel, strings.TrimSpace(text), two[0], two[1])
	}
	if n, ok := x.byLabel[k]; ok {
		return n, ""
	}
	msg := fmt.Sprintf(msgUnknownName, strings.TrimSpace(text))
	if near := load.Nearest(strings.TrimSpace(text), x.candidates); near != "" {
		msg += fmt.Sprintf(msgDidYouMean, near)
	}
	return "", msg
}

// arrowRE splits a line at its arrows: "->" (any number of dashes) or →.
var arrowRE = regexp.MustCompile(`\s*(?:-+>|→|⟶)\s*`)

// Messages of the arrows box.
const (
	msgNoArrow  = "line %d: no arrow in %q; write one arrow a line, cause first: noise -> sleep"
	msgArrowEnd = "line %d: nothing on one side of an arrow; write the cause, the arrow, then the effect"
	msgArrowBad = "line %d: %s"
)

// readArrows reads one arrow a line ("a -> b -> c" is two) into the
// declared graph, each variable by name or label; a line that names no
// variable is reported with its number and left out.
func (b *built) readArrows(text string, x *nameIndex) {
	var edges []checks.Edge
	for i, line := range strings.Split(text, "\n") {
		line = strings.TrimSpace(line)
		if line == "" {
			continue
		}
		ends, ok := b.arrowEnds(i+1, line, x)
		for j := 0; ok && j+1 < len(ends); j++ {
			edges = append(edges, checks.Edge{From: ends[j], To: ends[j+1]})
			b.edgeLines = append(b.edgeLines, i+1)
		}
	}
	if len(edges) > 0 {
		b.pkg.Graph = &checks.Graph{Edges: edges}
	}
}

// arrowEnds resolves the variables of one line of the arrows box.
func (b *built) arrowEnds(no int, line string, x *nameIndex) ([]string, bool) {
	parts := arrowRE.Split(line, -1)
	if len(parts) < 2 {
		b.errs.add(fieldArrows, fmt.Sprintf(msgNoArrow, no, line))
		return nil, false
	}
	ends, ok := make([]string, len(parts)), true
	for j, p := range parts {
		if p == "" {
			b.errs.add(fieldArrows, fmt.Sprintf(msgArrowEnd, no))
			return nil, false
		}
		name, msg := x.resolve(p)
		if msg != "" {
			b.errs.add(fieldArrows, fmt.Sprintf(msgArrowBad, no, msg))
			ok = false
		}
		ends[j] = name
	}
	return ends, ok
}
