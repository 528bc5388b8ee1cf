package load

import (
	"bytes"
	"encoding/json"
)

// lexer reads the values of a document that json.Valid has accepted, so
// it trusts the syntax: a string ends at its first unescaped quote, a
// literal at the first delimiter. It keeps no stack: a value it skips,
// however deep, costs a counter.
type lexer struct {
	doc []byte
	pos int
}

// peek skips white space and returns the next byte.
func (l *lexer) peek() byte {
	for l.pos < len(l.doc) {
		switch l.doc[l.pos] {
		case ' ', '\t', '\n', '\r':
			l.pos++
		default:
			return l.doc[l.pos]
		}
	}
	return 0
}

// expect steps over the byte c, which peek would return.
func (l *lexer) expect(c byte) {
	if l.peek() == c {
		l.pos++
	}
}

// more steps over a comma and reports whether the object or array goes
// on; at its end it steps over the closing bracket.
func (l *lexer) more() bool {
	switch l.peek() {
	case ',':
		l.pos++
		return true
	case '}', ']':
		l.pos++
	}
	return false
}

// first steps over an opening bracket and reports whether the object or
// array holds anything; an empty one is stepped over whole.
func (l *lexer) first() bool {
	l.pos++
	switch l.peek() {
	case '}', ']':
		l.pos++
		return false
	}
	return true
}

// str returns the next string as written, quotes included.
func (l *lexer) str() []byte {
	l.peek()
	start, i := l.pos, l.pos+1
	for i < len(l.doc) {
		switch l.doc[i] {
		case '\\':
			i += 2
			continue
		case '"':
			l.pos = i + 1
			return l.doc[start:l.pos]
		}
		i++
	}
	l.pos = len(l.doc)
	return l.doc[start:]
}

// literal returns the next number, true, false or null as written.
func (l *lexer) literal() []byte {
	l.peek()
	start := l.pos
	for l.pos < len(l.doc) {
		switch l.doc[l.pos] {
		case ',', '}', ']', ' ', '\t', '\n', '\r':
			return l.doc[start:l.pos]
		}
		l.pos++
	}
	return l.doc[start:]
}

// skip steps over the next value.
func (l *lexer) skip() {
	switch l.peek() {
	case '"':
		l.str()
		return
	case '{', '[':
	default:
		l.literal()
		return
	}
	depth := 0
	for l.pos < len(l.doc) {
		switch l.doc[l.pos] {
		case '"':
			l.str()
			continue
		case '{', '[':
			depth++
		case '}', ']':
			if depth--; depth == 0 {
				l.pos++
				return
			}
		}
		l.pos++
	}
}

// unquote is the text of a string as written; only a string with an
// escape is decoded by encoding/json.
func unquote(raw []byte) string {
	if len(raw) < 2 {
		return ""
	}
	if bytes.IndexByte(raw, '\\') < 0 {
		return string(raw[1 : len(raw)-1])
	}
	var s string
	_ = json.Unmarshal(raw, &s)
	return s
}

// kindOf names the kind of the value that starts with c, as jsonKind does.
func kindOf(c byte) string {
	switch c {
	case '"':
		return "a string"
	case '{':
		return "an object"
	case '[':
		return "an array"
	case 't', 'f':
		return "a boolean"
	case 'n':
		return "null"
	}
	return "a number"
}
