package load

import (
	"bytes"
	"encoding/json"
	"strconv"
	"strings"
	"unicode/utf8"
)

// frame is an object or array being scanned.
type frame struct {
	ptr     string
	array   bool
	index   int
	key     string
	wantKey bool
	keys    map[string]bool
}

// scanTokens walks the document token by token and reports every
// duplicate key in an object, every NUL character (\u0000) in a key or a
// string, and every string that is not valid UTF-8, each with its JSON
// pointer. A generic decode cannot see these: it keeps the last of two
// keys and turns bad bytes into U+FFFD. Syntax errors are the decoder's to
// report.
func scanTokens(doc []byte, ps *problems) {
	dec := json.NewDecoder(bytes.NewReader(doc))
	dec.UseNumber()
	var stack []*frame
	for {
		off := dec.InputOffset()
		tok, err := dec.Token()
		if err != nil {
			return
		}
		raw := doc[off:dec.InputOffset()]
		if d, ok := tok.(json.Delim); ok && (d == '}' || d == ']') {
			stack = stack[:len(stack)-1]
			continue
		}
		var top *frame
		if len(stack) > 0 {
			top = stack[len(stack)-1]
		}
		if top != nil && !top.array && top.wantKey {
			scanKey(top, tok.(string), raw, ps)
			continue
		}
		at := next(top)
		switch t := tok.(type) {
		case json.Delim:
			f := &frame{ptr: at.pointer(), array: t == '[', wantKey: true, keys: map[string]bool{}}
			stack = append(stack, f)
		case string:
			if problem := textProblem(t, raw); problem != "" {
				ps.at(at.pointer(), "%s", problem)
			}
		}
	}
}

// scanKey records an object's key and reports a repeated one.
func scanKey(f *frame, key string, raw []byte, ps *problems) {
	ptr := f.ptr + pointer(key)
	checkText(ptr, key, raw, ps)
	if f.keys[key] {
		ps.at(ptr, "the key %q appears more than once in this object; give each field once", key)
	}
	f.keys[key], f.key, f.wantKey = true, key, false
}

// place is where a value stands: in frame f, under key or at index.
// Its pointer is only built when it is needed.
type place struct {
	f     *frame
	key   string
	index int
}

func (p place) pointer() string {
	switch {
	case p.f == nil:
		return ""
	case p.f.array:
		return p.f.ptr + "/" + strconv.Itoa(p.index)
	}
	return p.f.ptr + pointer(p.key)
}

// next is the place of the next value in f, and moves f on.
func next(f *frame) place {
	switch {
	case f == nil:
		return place{}
	case f.array:
		f.index++
		return place{f: f, index: f.index - 1}
	}
	f.wantKey = true
	return place{f: f, key: f.key}
}

// checkText refuses a NUL character and invalid UTF-8 in a key.
func checkText(ptr, s string, raw []byte, ps *problems) {
	if problem := textProblem(s, raw); problem != "" {
		ps.at(ptr, "%s", problem)
	}
}

// textProblem says what is wrong with a string, "" when nothing is; raw
// is the string as written in the document.
func textProblem(s string, raw []byte) string {
	switch {
	case !utf8.Valid(raw):
		return "is not valid UTF-8 text"
	case strings.ContainsRune(s, 0):
		return "contains a NUL character (\\u0000), which no field of a package may hold"
	}
	return ""
}
