package load

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"reflect"
	"strings"
	"unicode/utf8"

	"github.com/pathvet/pathvet/checks"
)

// decode reads a package document into pkg, reporting every problem it
// can find at once: each duplicate key, NUL character or invalid UTF-8
// sequence, unknown field, value of the wrong type and list past its
// limit, with its JSON pointer. It returns false when nothing more can be
// read from the document (not JSON, not an object, or a list past its
// limit); otherwise pkg holds every value of the right type, and the
// later stages check it, leaving out the places already reported.
func decode(doc []byte, pkg *checks.Package, lim Limits, ps *problems) bool {
	if problem := notJSON(doc); problem != "" {
		ps.at("", "%s", problem)
		return false
	}
	w := &walker{lexer: lexer{doc: doc}, ps: ps, lim: lim}
	if c := w.peek(); c != '{' {
		ps.at("", "must be an object, not %s", kindOf(c))
		return false
	}
	w.value(reflect.TypeFor[checks.Package](), "", nil)
	if w.over {
		return false
	}
	// Values of the wrong type are left at zero, and unknown fields are
	// skipped: both are reported above.
	_ = json.Unmarshal(doc, pkg)
	ps.shadow()
	return true
}

// maxDepth is how deep encoding/json lets arrays and objects nest.
const maxDepth = 10_000

// Placeholder begins a string that marks a value still to be filled in,
// as pathvet init writes them: in any field, of any type, it is refused
// with the text that follows it.
const Placeholder = "TODO:"

// notJSON says why doc is not one JSON value, "" when it is: it is
// empty, not text (what it looks like), UTF-16, or the JSON syntax is
// broken (where).
func notJSON(doc []byte) string {
	if len(bytes.TrimSpace(doc)) == 0 {
		return "the package is empty: it should be one JSON object, as in testdata/template/package.json"
	}
	if what := notText(doc); what != "" {
		return "the package is " + what + "; it should be a JSON text file in UTF-8"
	}
	if json.Valid(doc) {
		return ""
	}
	dec := json.NewDecoder(bytes.NewReader(doc))
	var v json.RawMessage
	if err := dec.Decode(&v); err != nil {
		return "not valid JSON: " + jsonErrorText(doc, err)
	}
	return "not valid JSON: more than one value in the document"
}

// jsonErrorText adds the line and column of the byte that broke the
// syntax (the last one read, which a SyntaxError's offset counts) to a
// syntax error; an error at the end says the document stops short.
func jsonErrorText(doc []byte, err error) string {
	var se *json.SyntaxError
	if errors.Is(err, io.ErrUnexpectedEOF) {
		line, col := position(doc, len(doc))
		return fmt.Sprintf("the document ends before its last value is complete (line %d, column %d)", line, col)
	}
	if !errors.As(err, &se) {
		return err.Error()
	}
	line, col := position(doc, max(int(se.Offset)-1, 0))
	if strings.HasSuffix(se.Error(), "exceeded max depth") {
		return fmt.Sprintf("arrays or objects nest more than %d deep (line %d, column %d)", maxDepth, line, col)
	}
	return fmt.Sprintf("%v (line %d, column %d)", se, line, col)
}

// position is the line and column (in characters, from 1) of the byte at
// offset off of doc.
func position(doc []byte, off int) (line, col int) {
	before := doc[:min(off, len(doc))]
	line = bytes.Count(before, []byte{'\n'}) + 1
	start := bytes.LastIndexByte(before, '\n') + 1
	return line, utf8.RuneCount(before[start:]) + 1
}

// jsonName is a field's name in JSON.
func jsonName(f reflect.StructField) string {
	name, _, _ := strings.Cut(f.Tag.Get("json"), ",")
	if name == "" {
		return f.Name
	}
	return name
}
