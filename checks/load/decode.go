package load

import (
	"bytes"
	"encoding/json"
	"fmt"
	"maps"
	"math"
	"reflect"
	"slices"
	"sort"
	"strconv"
	"strings"

	"github.com/pathvet/pathvet/checks"
)

// decode reads a package document into pkg, reporting every problem it
// can find at once: each duplicate key, NUL character or invalid UTF-8
// sequence, unknown field and value of the wrong type, with its JSON
// pointer. It returns false when nothing more can be read from the
// document (not JSON, or not an object); otherwise pkg holds every value
// of the right type, and the later stages check it, leaving out the places
// already reported.
func decode(doc []byte, pkg *checks.Package, ps *problems) bool {
	dec := json.NewDecoder(bytes.NewReader(doc))
	dec.UseNumber()
	var v any
	if err := dec.Decode(&v); err != nil {
		ps.at("", "not valid JSON: %s", jsonErrorText(doc, err))
		return false
	}
	if dec.More() {
		ps.at("", "not valid JSON: more than one value in the document")
		return false
	}
	scanTokens(doc, ps)
	walkJSON(v, reflect.TypeFor[checks.Package](), "", ps)
	if _, ok := v.(map[string]any); !ok {
		return false
	}
	// Values of the wrong type are left at zero, and unknown fields are
	// skipped: both are reported above.
	_ = json.Unmarshal(doc, pkg)
	ps.shadow()
	return true
}

// Placeholder begins a string that marks a value still to be filled in,
// as pathvet init writes them: in any field, of any type, it is refused
// with the text that follows it.
const Placeholder = "TODO:"

// jsonErrorText adds the line and column to a syntax error.
func jsonErrorText(doc []byte, err error) string {
	var se *json.SyntaxError
	if e, ok := err.(*json.SyntaxError); ok {
		se = e
	}
	if se == nil {
		return err.Error()
	}
	line, col := 1, 1
	for _, b := range doc[:min(int(se.Offset), len(doc))] {
		if b == '\n' {
			line, col = line+1, 1
		} else {
			col++
		}
	}
	return fmt.Sprintf("%v (line %d, column %d)", se, line, col)
}

// walkJSON checks the generic value v against the Go type t.
func walkJSON(v any, t reflect.Type, ptr string, ps *problems) {
	if t.Kind() == reflect.Pointer {
		if v == nil {
			return
		}
		t = t.Elem()
	}
	if v == nil {
		ps.at(ptr, "must not be null")
		return
	}
	if str, ok := v.(string); ok && strings.HasPrefix(str, Placeholder) {
		ps.at(ptr, "is still to be filled in (%s)", strings.TrimSpace(strings.TrimPrefix(str, Placeholder)))
		return
	}
	switch t.Kind() {
	case reflect.Struct:
		walkObject(v, t, ptr, ps)
	case reflect.Slice:
		arr, ok := v.([]any)
		if !ok {
			ps.at(ptr, "must be an array, not %s", jsonKind(v))
			return
		}
		for i, e := range arr {
			walkJSON(e, t.Elem(), ptr+"/"+strconv.Itoa(i), ps)
		}
	default:
		walkScalar(v, t, ptr, ps)
	}
}

// walkScalar checks a string, a boolean or a number.
func walkScalar(v any, t reflect.Type, ptr string, ps *problems) {
	switch t.Kind() {
	case reflect.String:
		if _, ok := v.(string); !ok {
			ps.at(ptr, "must be a string, not %s", jsonKind(v))
		}
	case reflect.Bool:
		if _, ok := v.(bool); !ok {
			ps.at(ptr, "must be true or false, not %s", jsonKind(v))
		}
	case reflect.Int:
		walkInt(v, ptr, ps)
	case reflect.Float64:
		walkNumber(v, ptr, ps)
	default:
		panic("load: no JSON rule for " + t.String())
	}
}

func walkObject(v any, t reflect.Type, ptr string, ps *problems) {
	obj, ok := v.(map[string]any)
	if !ok {
		ps.at(ptr, "must be an object, not %s", jsonKind(v))
		return
	}
	fields := map[string]reflect.StructField{}
	for i := range t.NumField() {
		f := t.Field(i)
		fields[jsonName(f)] = f
	}
	keys := make([]string, 0, len(obj))
	for k := range obj {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	for _, k := range keys {
		f, ok := fields[k]
		if !ok {
			ps.at(ptr+pointer(k), "unknown field %q%s", k, didYouMean(k, slices.Sorted(maps.Keys(fields))))
			continue
		}
		walkJSON(obj[k], f.Type, ptr+pointer(k), ps)
	}
}

func walkInt(v any, ptr string, ps *problems) {
	n, ok := v.(json.Number)
	if !ok {
		ps.at(ptr, "must be an integer, not %s", jsonKind(v))
		return
	}
	if _, err := n.Int64(); err != nil {
		if f, ferr := n.Float64(); ferr == nil && f == math.Trunc(f) {
			ps.at(ptr, "number %s is out of range", n)
			return
		}
		ps.at(ptr, "must be an integer, not %s", n)
	}
}

func walkNumber(v any, ptr string, ps *problems) {
	n, ok := v.(json.Number)
	if str, isStr := v.(string); isStr {
		ps.at(ptr, "must be a number, not a string%s", numberHint(ptr, str))
		return
	}
	if !ok {
		ps.at(ptr, "must be a number, not %s", jsonKind(v))
		return
	}
	if f, err := n.Float64(); err != nil || math.IsInf(f, 0) {
		ps.at(ptr, "number %s is out of range", n)
	}
}

func jsonName(f reflect.StructField) string {
	name, _, _ := strings.Cut(f.Tag.Get("json"), ",")
	if name == "" {
		return f.Name
	}
	return name
}

func jsonKind(v any) string {
	switch v.(type) {
	case nil:
		return "null"
	case string:
		return "a string"
	case bool:
		return "a boolean"
	case json.Number:
		return "a number"
	case []any:
		return "an array"
	case map[string]any:
		return "an object"
	}
	return fmt.Sprintf("%T", v)
}
