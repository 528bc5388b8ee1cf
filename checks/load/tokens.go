package load

import (
	"strings"
	"unicode/utf8"
)

// textProblem says what is wrong with a string, "" when nothing is; raw
// is the string as written in the document. A generic decode cannot see
// these: it turns bad bytes into U+FFFD.
func textProblem(s string, raw []byte) string {
	switch {
	case !utf8.Valid(raw):
		return "is not valid UTF-8 text"
	case strings.ContainsRune(s, 0):
		return "contains a NUL character (\\u0000), which no field of a package may hold"
	}
	return ""
}
