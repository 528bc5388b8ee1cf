package load

import (
	"fmt"
	"strings"

	"github.com/pathvet/pathvet/checks"
)

// problems collects Problems while a package is checked.
type problems struct{ list []checks.Problem }

func (ps *problems) at(pointer, format string, args ...any) {
	ps.list = append(ps.list, checks.Problem{Pointer: pointer, Detail: fmt.Sprintf(format, args...)})
}

func (ps *problems) csv(line, column int, format string, args ...any) {
	ps.list = append(ps.list, checks.Problem{Line: line, Column: column, Detail: fmt.Sprintf(format, args...)})
}

func (ps *problems) err() error {
	if len(ps.list) == 0 {
		return nil
	}
	return &checks.InvalidPackageError{Problems: ps.list}
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
