package load

import (
	"fmt"
	"strings"
	"unicode/utf8"

	"github.com/pathvet/pathvet/checks"
)

// maxProblems is how many problems are listed; past it the list ends
// with listCut, and the loader stops at the end of the stage it is in.
const maxProblems = 500

// listCut ends a list of problems that was cut at maxProblems.
const listCut = "the list stops at %d problems and there are more: fix these and check the package again"

// maxSuggestions is how many "did you mean" hints one package gets; past
// it unknown names are reported without one (a hint is for a slip of the
// keyboard, not for a package full of names that do not exist).
const maxSuggestions = 100

// problems collects Problems while a package is checked. Places already
// reported by the decoder (shadowed) get no further problems from later
// stages, which saw the value there as missing.
type problems struct {
	limits      []checks.Problem // lists past their limits, always listed, first
	list        []checks.Problem
	shadowed    map[string]bool
	dropped     int
	suggestions int
	names       []string // the declared names, sorted, once a suggestion needs them
}

func (ps *problems) at(pointer, format string, args ...any) {
	if ps.open(pointer) {
		ps.list = append(ps.list, checks.Problem{Pointer: pointer, Detail: fmt.Sprintf(format, args...)})
	}
}

// open reports whether a problem at pointer would be listed: the place is
// not shadowed and the list is not full (a problem it cannot list is
// counted). Callers test it before they compute a costly detail.
func (ps *problems) open(pointer string) bool {
	switch {
	case ps.covered(pointer):
		return false
	case ps.full():
		ps.dropped++
		return false
	}
	return true
}

func (ps *problems) csv(line, column int, format string, args ...any) {
	ps.add(checks.Problem{Line: line, Column: column, Detail: fmt.Sprintf(format, args...)})
}

func (ps *problems) add(p checks.Problem) {
	if ps.full() {
		ps.dropped++
		return
	}
	ps.list = append(ps.list, p)
}

// count is how many problems were found, listed or not.
func (ps *problems) count() int { return len(ps.list) + ps.dropped }

// full reports whether the list holds maxProblems problems.
func (ps *problems) full() bool { return len(ps.list) >= maxProblems }

// suggest is didYouMean while the package's hints last, "" after.
func (ps *problems) suggest(name string, candidates []string) string {
	if ps.suggestions >= maxSuggestions {
		return ""
	}
	ps.suggestions++
	return didYouMean(name, candidates)
}

// shadow marks every place reported so far.
func (ps *problems) shadow() {
	if ps.shadowed == nil {
		ps.shadowed = map[string]bool{}
	}
	for _, p := range ps.list {
		ps.shadowed[p.Pointer] = true
	}
}

// covered reports whether ptr is a shadowed place or lies inside one: it
// looks up ptr and each pointer it lies in.
func (ps *problems) covered(ptr string) bool {
	if len(ps.shadowed) == 0 {
		return false
	}
	for {
		if ps.shadowed[ptr] {
			return true
		}
		i := strings.LastIndexByte(ptr, '/')
		if i < 0 {
			return false
		}
		ptr = ptr[:i]
	}
}

// coveredBelow reports whether some shadowed place other than except
// lies at or inside ptr.
func (ps *problems) coveredBelow(ptr, except string) bool {
	for s := range ps.shadowed {
		if s != except && (s == ptr || strings.HasPrefix(s, ptr+"/")) {
			return true
		}
	}
	return false
}

// limit reports a list past its limit; such problems are few (one a
// list) and never cut.
func (ps *problems) limit(p checks.Problem) { ps.limits = append(ps.limits, p) }

func (ps *problems) err() error {
	if len(ps.list)+len(ps.limits) == 0 {
		return nil
	}
	list := append(ps.limits, ps.list...)
	if ps.dropped > 0 {
		list = append(list, checks.Problem{Detail: fmt.Sprintf(listCut, maxProblems)})
	}
	return &checks.InvalidPackageError{Problems: list}
}

// pointer builds a JSON pointer (RFC 6901) from its tokens.
func pointer(tokens ...any) string {
	var b strings.Builder
	for _, t := range tokens {
		s := fmt.Sprint(t)
		s = strings.ReplaceAll(s, "~", "~0")
		s = strings.ReplaceAll(s, "/", "~1")
		b.WriteString("/" + s)
	}
	return b.String()
}

// maxQuoted is how many characters of a value a problem quotes.
const maxQuoted = 80

// quoted is s in Go's quoted form, as %q writes it, cut to its first
// maxQuoted characters (marked by "…") so that a problem stays one line
// however long the value is.
func quoted(s string) string {
	if utf8.RuneCountInString(s) <= maxQuoted {
		return fmt.Sprintf("%q", s)
	}
	n := 0
	for i := range s {
		if n == maxQuoted {
			return fmt.Sprintf("%q…", s[:i])
		}
		n++
	}
	return fmt.Sprintf("%q", s)
}
