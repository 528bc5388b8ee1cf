package load

import (
	"encoding/json"
	"math"
	"reflect"
	"strconv"
	"strings"
	"unicode/utf8"
)

// walker reads a package document value by value against the Go types of
// the package, before anything is decoded: it reports each value of the
// wrong type, unknown field, repeated key, placeholder, NUL character,
// invalid UTF-8 sequence and string longer than its field allows, and it
// counts every list against its limit as it goes. A list past its limit is
// counted to its end but not read further, and nothing after the walk is
// decoded or checked (over), so that a document of a million empty objects
// costs a count, not a million decoded claims. Unknown fields are stepped
// over unread. The walk holds no value: only the field being read.
type walker struct {
	lexer
	ps   *problems
	lim  Limits
	over bool // a list passed its limit, or a field was repeated: decode nothing
}

// Formats of the walker's problems.
const (
	repeatedKey  = "the key %s appears more than once in this object; give each field once"
	unknownField = "unknown field %s%s"
	overVarLimit = "has %d entries; the limit is %d, the limit on variables"
	overEntries  = "has %d entries; the limit is %d"
	longKey      = "has a key %d bytes long; no field's name is longer than %d characters"
)

// maxKey is the longest key, quotes included, that the walker reads as a
// key; a longer one is reported at its object, so that no pointer is
// megabytes long.
const maxKey = 256

// maxEntries bounds every list that no other limit bounds (a claim's ci,
// missing_codes, ignore_columns).
const maxEntries = 10_000

// value reads the next value as a value of type t at ptr; f is the field
// that holds it (nil for a list's entry and the document).
func (w *walker) value(t reflect.Type, ptr string, f *field) {
	c := w.peek()
	if t.Kind() == reflect.Pointer {
		if c == 'n' {
			w.skip()
			return
		}
		t = t.Elem()
	}
	switch {
	case c == 'n':
		w.ps.at(ptr, "must not be null")
		w.skip()
	case c == '"':
		w.text(t, ptr, f, w.str())
	case t.Kind() == reflect.Struct:
		w.object(t, ptr)
	case t.Kind() == reflect.Slice:
		w.list(t, ptr, f)
	default:
		w.scalar(t, ptr, c)
	}
}

// text reads a string: its bytes, a placeholder, then its type and length.
func (w *walker) text(t reflect.Type, ptr string, f *field, raw []byte) {
	s := unquote(raw)
	if problem := textProblem(s, raw); problem != "" {
		w.ps.at(ptr, "%s", problem)
		return
	}
	if strings.HasPrefix(s, Placeholder) {
		w.ps.at(ptr, "is still to be filled in (%s)", strings.TrimSpace(strings.TrimPrefix(s, Placeholder)))
		return
	}
	switch t.Kind() {
	case reflect.String:
		if max := f.maxLen(); max > 0 && utf8.RuneCountInString(s) > max {
			w.ps.at(ptr, "must be at most %d characters long", max)
		}
	case reflect.Float64:
		if w.ps.open(ptr) {
			w.ps.at(ptr, "must be a number, not a string%s", numberHint(ptr, s))
		}
	default:
		w.ps.at(ptr, "must be %s, not a string", kindWanted(t))
	}
}

// object reads an object of struct type t.
func (w *walker) object(t reflect.Type, ptr string) {
	if c := w.peek(); c != '{' {
		w.ps.at(ptr, "must be an object, not %s", kindOf(c))
		w.skip()
		return
	}
	fs := fieldsOf(t)
	seen := make([]bool, len(fs.list))
	var unknown map[string]bool
	for more := w.first(); more; more = w.more() {
		raw := w.str()
		w.expect(':')
		if len(raw) > maxKey {
			w.ps.at(ptr, longKey, len(raw)-2, fs.longest)
			w.skip()
			continue
		}
		key := unquote(raw)
		at := ptr + pointer(key)
		if problem := textProblem(key, raw); problem != "" {
			w.ps.at(at, "%s", problem)
		}
		i, known := fs.index[key]
		switch {
		case !known:
			if unknown[key] {
				w.ps.at(at, repeatedKey, quoted(key))
			} else if w.ps.open(at) {
				w.ps.at(at, unknownField, quoted(key), w.ps.suggest(key, fs.names))
			}
			if unknown == nil {
				unknown = map[string]bool{}
			}
			if len(unknown) < maxProblems {
				unknown[key] = true
			}
			w.skip()
		case seen[i]:
			w.ps.at(at, repeatedKey, quoted(key))
			w.over = true // encoding/json would keep this value, which the walk does not count
			w.skip()
		default:
			seen[i] = true
			w.value(fs.list[i].typ, at, &fs.list[i])
		}
	}
}

// list reads an array of slice type t, counting its entries against the
// field's limit: past it, entries are counted and stepped over.
func (w *walker) list(t reflect.Type, ptr string, f *field) {
	if c := w.peek(); c != '[' {
		w.ps.at(ptr, "must be an array, not %s", kindOf(c))
		w.skip()
		return
	}
	limit, format := f.limit(w.lim)
	n := 0
	for more := w.first(); more; more = w.more() {
		if n < limit {
			w.value(t.Elem(), ptr+"/"+strconv.Itoa(n), f.entry())
		} else {
			w.skip()
		}
		n++
	}
	if n > limit {
		w.ps.limit(problemAt(ptr, format, n, limit))
		w.over = true
	}
}

// scalar reads a boolean or a number (c is its first byte).
func (w *walker) scalar(t reflect.Type, ptr string, c byte) {
	want := map[reflect.Kind]string{reflect.Bool: "a boolean", reflect.Int: "a number", reflect.Float64: "a number"}[t.Kind()]
	if kind := kindOf(c); kind != want {
		w.ps.at(ptr, "must be %s, not %s", kindWanted(t), kind)
		w.skip()
		return
	}
	lit := string(w.literal())
	switch t.Kind() {
	case reflect.Int:
		walkInt(json.Number(lit), ptr, w.ps)
	case reflect.Float64:
		if f, err := strconv.ParseFloat(lit, 64); err != nil || math.IsInf(f, 0) {
			w.ps.at(ptr, "number %s is out of range", clipped(lit))
		}
	}
}

// kindWanted words the JSON kind a Go type is written as.
func kindWanted(t reflect.Type) string {
	switch t.Kind() {
	case reflect.String:
		return "a string"
	case reflect.Bool:
		return "true or false"
	case reflect.Int:
		return "an integer"
	case reflect.Float64:
		return "a number"
	case reflect.Slice:
		return "an array"
	case reflect.Struct:
		return "an object"
	}
	panic("load: no JSON rule for " + t.String())
}

func walkInt(n json.Number, ptr string, ps *problems) {
	if _, err := n.Int64(); err != nil {
		if f, ferr := n.Float64(); ferr == nil && f == math.Trunc(f) {
			ps.at(ptr, "number %s is out of range", clipped(string(n)))
			return
		}
		ps.at(ptr, "must be an integer, not %s", clipped(string(n)))
	}
}

// clipped is s cut to maxQuoted characters, marked by "…".
func clipped(s string) string {
	if len(s) <= maxQuoted {
		return s
	}
	return s[:maxQuoted] + "…"
}
