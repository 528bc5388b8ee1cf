package load

import (
	"bytes"
	"encoding/json"
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
		ptr := valuePointer(top)
		switch t := tok.(type) {
		case json.Delim:
			stack = append(stack, &frame{ptr: ptr, array: t == '[', wantKey: true, keys: map[string]bool{}})
		case string:
			checkText(ptr, t, raw, ps)
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

// valuePointer is the pointer of the next value in f, and moves f on.
func valuePointer(f *frame) string {
	switch {
	case f == nil:
		return ""
	case f.array:
		f.index++
		return f.ptr + pointer(f.index-1)
	}
	f.wantKey = true
	return f.ptr + pointer(f.key)
}

// checkText refuses a NUL character and invalid UTF-8 in a string; raw
// is the string as written in the document.
func checkText(ptr, s string, raw []byte, ps *problems) {
	if !utf8.Valid(raw) {
		ps.at(ptr, "is not valid UTF-8 text")
	}
	if strings.ContainsRune(s, 0) {
		ps.at(ptr, "contains a NUL character (\\u0000), which no field of a package may hold")
	}
}
