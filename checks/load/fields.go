package load

import (
	"fmt"
	"maps"
	"reflect"
	"slices"
	"strconv"
	"strings"
	"sync"

	"github.com/pathvet/pathvet/checks"
)

// field is a field of a package type as the walker reads it: its Go type,
// the longest string its validate tag allows, and which limit bounds it
// when it is a list.
type field struct {
	typ    reflect.Type
	maxStr int    // the tag's max=N on a string, 0 for none
	dive   *field // the rules of a list's entries
	bound  string // the key of listBounds, "" for maxEntries
}

// fields are the fields of one struct type, by JSON name.
type fields struct {
	list    []field
	index   map[string]int
	names   []string // sorted, for suggestions
	longest int      // the longest name
}

// listBounds are the lists with a limit of their own: the limit and the
// problem's format (the count, the limit).
var listBounds = map[string]func(Limits) (int, string){
	"variables":    func(l Limits) (int, string) { return l.Variables, countOver("variables") },
	"claims":       func(l Limits) (int, string) { return l.Claims, countOver("claims") },
	"alternatives": func(l Limits) (int, string) { return l.Alternatives, countOver("alternatives") },
	"edges":        func(l Limits) (int, string) { return l.Edges, countOver("edges") },
	"per-variable": func(l Limits) (int, string) { return l.Variables, overVarLimit },
}

// boundOf names the limit of each list field of the package types.
var boundOf = map[string]string{
	"Package.variables": "variables", "Package.claims": "claims", "Package.alternatives": "alternatives",
	"Graph.edges": "edges", "Graph.fixed_edges": "edges", "Alternative.edges": "edges",
	"Claim.adjust_for": "per-variable", "Claim.through": "per-variable", "Graph.tiers": "per-variable",
	"Data.variables": "per-variable", "Data.correlations": "per-variable",
	"Data.sds": "per-variable", "Data.means": "per-variable",
}

func countOver(what string) string { return "has %d " + what + "; the limit is %d" }

// limit is the most entries the list f may hold, and the format of the
// problem past it.
func (f *field) limit(lim Limits) (int, string) {
	if f != nil && f.bound != "" {
		return listBounds[f.bound](lim)
	}
	return maxEntries, overEntries
}

// entry is the field that describes each entry of the list f.
func (f *field) entry() *field {
	if f == nil {
		return nil
	}
	return f.dive
}

func (f *field) maxLen() int {
	if f == nil {
		return 0
	}
	return f.maxStr
}

func problemAt(ptr, format string, n, limit int) checks.Problem {
	return checks.Problem{Pointer: ptr, Detail: fmt.Sprintf(format, n, limit)}
}

var fieldCache sync.Map // reflect.Type → *fields

// fieldsOf lists the fields of the struct type t, once per type.
func fieldsOf(t reflect.Type) *fields {
	if fs, ok := fieldCache.Load(t); ok {
		return fs.(*fields)
	}
	fs := &fields{index: map[string]int{}}
	for i := range t.NumField() {
		sf := t.Field(i)
		name := jsonName(sf)
		f := newField(sf.Type, strings.Split(sf.Tag.Get("validate"), ","))
		if f.bound = boundOf[t.Name()+"."+name]; f.dive != nil && f.dive.typ.Kind() == reflect.Slice {
			f.dive.bound = f.bound // the rows of a matrix
		}
		fs.index[name], fs.longest = len(fs.list), max(fs.longest, len(name))
		fs.list = append(fs.list, f)
	}
	fs.names = slices.Sorted(maps.Keys(fs.index))
	fieldCache.Store(t, fs)
	return fs
}

// newField reads the rules of a validate tag that the walker enforces:
// max=N on a string, and, after dive, the rules of a list's entries. A
// list of lists (the correlation matrix) gives its rows the list's bound.
func newField(t reflect.Type, rules []string) field {
	f := field{typ: t}
	for i, r := range rules {
		if r == "dive" {
			d := newField(t.Elem(), rules[i+1:])
			f.dive = &d
			break
		}
		if n, ok := strings.CutPrefix(r, "max="); ok && t.Kind() == reflect.String {
			f.maxStr, _ = strconv.Atoi(n)
		}
	}
	if t.Kind() == reflect.Slice && f.dive == nil {
		f.dive = &field{typ: t.Elem()}
	}
	return f
}
