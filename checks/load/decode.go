package load

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"reflect"
	"sort"
	"strings"

	"github.com/pathvet/pathvet/checks"
)

// decodeStrict decodes a package document. Before decoding into the Go
// types it walks the generic JSON value against them, so that every
// unknown field and every value of the wrong type is reported at once, each
// with its JSON pointer, rather than only the first one.
func decodeStrict(doc []byte, pkg *checks.Package) error {
	dec := json.NewDecoder(bytes.NewReader(doc))
	dec.UseNumber()
	var v any
	if err := dec.Decode(&v); err != nil {
		return &checks.InvalidPackageError{Problems: []checks.Problem{{Detail: "not valid JSON: " + jsonErrorText(doc, err)}}}
	}
	if dec.More() {
		return &checks.InvalidPackageError{Problems: []checks.Problem{{Detail: "not valid JSON: more than one value in the document"}}}
	}
	var ps problems
	walkJSON(v, reflect.TypeFor[checks.Package](), "", &ps)
	if err := ps.err(); err != nil {
		return err
	}
	strict := json.NewDecoder(bytes.NewReader(doc))
	strict.DisallowUnknownFields()
	if err := strict.Decode(pkg); err != nil {
		return &checks.InvalidPackageError{Problems: []checks.Problem{{Detail: err.Error()}}}
	}
	return nil
}

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
			walkJSON(e, t.Elem(), ptr+"/"+fmt.Sprint(i), ps)
		}
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
			ps.at(ptr+pointer(k), "unknown field %q", k)
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
		ps.at(ptr, "must be an integer, not %s", n)
	}
}

func walkNumber(v any, ptr string, ps *problems) {
	n, ok := v.(json.Number)
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
