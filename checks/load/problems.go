package load

import (
	"fmt"
	"strings"

	"github.com/pathvet/pathvet/checks"
)

// maxProblems is how many problems are listed before the rest are summed
// up in one line.
const maxProblems = 500

// problems collects Problems while a package is checked. Places already
// reported by the decoder (shadowed) get no further problems from later
// stages, which saw the value there as missing.
type problems struct {
	list     []checks.Problem
	shadowed []string
	dropped  int
}

func (ps *problems) at(pointer, format string, args ...any) {
	if ps.covered(pointer) {
		return
	}
	ps.add(checks.Problem{Pointer: pointer, Detail: fmt.Sprintf(format, args...)})
}

func (ps *problems) csv(line, column int, format string, args ...any) {
	ps.add(checks.Problem{Line: line, Column: column, Detail: fmt.Sprintf(format, args...)})
}

func (ps *problems) add(p checks.Problem) {
	if len(ps.list) >= maxProblems {
		ps.dropped++
		return
	}
	ps.list = append(ps.list, p)
}

// shadow marks every place reported so far.
func (ps *problems) shadow() {
	for _, p := range ps.list {
		ps.shadowed = append(ps.shadowed, p.Pointer)
	}
}

// covered reports whether ptr is a shadowed place or lies inside one.
func (ps *problems) covered(ptr string) bool {
	for _, s := range ps.shadowed {
		if ptr == s || strings.HasPrefix(ptr, s+"/") {
			return true
		}
	}
	return false
}

// coveredBelow reports whether some shadowed place other than except
// lies at or inside ptr.
func (ps *problems) coveredBelow(ptr, except string) bool {
	for _, s := range ps.shadowed {
		if s != except && (s == ptr || strings.HasPrefix(s, ptr+"/")) {
			return true
		}
	}
	return false
}

func (ps *problems) err() error {
	if len(ps.list) == 0 {
		return nil
	}
	list := ps.list
	if ps.dropped > 0 {
		more := checks.Problem{Detail: fmt.Sprintf("%d further problems are not listed", ps.dropped)}
		list = append(list, more)
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
