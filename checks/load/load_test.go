package load_test

import (
	"bytes"
	"encoding/json"
	"errors"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/santhosh-tekuri/jsonschema/v6"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/load"
	"github.com/pathvet/pathvet/checks/schema/schematest"
)

type badCase struct {
	File          string   `json:"file"`
	Place         string   `json:"place"`
	Also          []string `json:"also"`
	SchemaRejects *bool    `json:"schema_rejects"`
}

func badCases(tb testing.TB) []badCase {
	tb.Helper()
	b, err := os.ReadFile("../../testdata/bad/cases.json")
	if err != nil {
		tb.Fatal(err)
	}
	var cases []badCase
	if err := json.Unmarshal(b, &cases); err != nil {
		tb.Fatal(err)
	}
	return cases
}

// demoPackages returns the path of every demo package.
func demoPackages(tb testing.TB) []string {
	tb.Helper()
	paths, err := filepath.Glob("../../testdata/demo/*/package.json")
	if err != nil || len(paths) == 0 {
		tb.Fatalf("no demo packages: %v", err)
	}
	return paths
}

// MustLoad loads a package file, reading its data file beside it.
func MustLoad(tb testing.TB, path string) *checks.Study {
	tb.Helper()
	s, err := loadFile(path)
	if err != nil {
		tb.Fatalf("%s: %v", path, err)
	}
	return s
}

func loadFile(path string) (*checks.Study, error) {
	doc, err := os.ReadFile(path)
	if err != nil {
		return nil, err
	}
	return load.Load(doc, load.Options{ReadFile: func(name string) ([]byte, error) {
		return os.ReadFile(filepath.Join(filepath.Dir(path), name))
	}})
}

func TestLoad_BadInputs(t *testing.T) {
	for _, tc := range badCases(t) {
		t.Run(tc.File, func(t *testing.T) {
			_, err := loadFile("../../testdata/bad/" + tc.File)
			var invalid *checks.InvalidPackageError
			if !errors.As(err, &invalid) {
				t.Fatalf("want an invalid-package error, got %v", err)
			}
			for _, want := range append([]string{tc.Place}, tc.Also...) {
				if !slices.ContainsFunc(invalid.Problems, func(p checks.Problem) bool {
					return strings.Contains(p.String(), want)
				}) {
					t.Errorf("no problem names %q; got:\n%v", want, err)
				}
			}
		})
	}
}

func TestLoad_Demos(t *testing.T) {
	for _, path := range demoPackages(t) {
		s := MustLoad(t, path)
		if len(s.SHA256) != 64 {
			t.Errorf("%s: hash %q", path, s.SHA256)
		}
	}
}

// The package hash covers the data: the same rows inline and from a file
// hash alike, and a changed cell changes the hash.
func TestLoad_HashCoversData(t *testing.T) {
	path := "../../testdata/demo/coding-club/package.json"
	fromFile := MustLoad(t, path)
	doc, _ := os.ReadFile(path)
	rows, _ := os.ReadFile("../../testdata/demo/coding-club/rows.csv")
	var m map[string]any
	if err := json.Unmarshal(doc, &m); err != nil {
		t.Fatal(err)
	}
	data := m["data"].(map[string]any)
	delete(data, "file")
	data["csv"] = string(rows)
	inline, _ := json.Marshal(m)
	s, err := load.Load(inline, load.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if s.SHA256 != fromFile.SHA256 {
		t.Errorf("inline rows hash %s, file rows %s", s.SHA256, fromFile.SHA256)
	}
	data["csv"] = strings.Replace(string(rows), "3.77", "3.78", 1)
	changed, _ := json.Marshal(m)
	if s2, _ := load.Load(changed, load.Options{}); s2.SHA256 == s.SHA256 {
		t.Error("a changed data cell kept the hash")
	}
}

func TestLoad_SummaryLowerTriangleEqualsFull(t *testing.T) {
	s := MustLoad(t, "../../testdata/demo/tutoring-anxiety/package.json")
	doc, _ := os.ReadFile("../../testdata/demo/tutoring-anxiety/package.json")
	var m map[string]any
	_ = json.Unmarshal(doc, &m)
	p := s.Data.Cor.SymmetricDim()
	full := make([][]float64, p)
	for i := range p {
		for j := range p {
			full[i] = append(full[i], s.Data.Cor.At(i, j))
		}
	}
	m["data"].(map[string]any)["correlations"] = full
	b, _ := json.Marshal(m)
	s2, err := load.Load(b, load.Options{})
	if err != nil {
		t.Fatal(err)
	}
	for i := range p {
		for j := range p {
			if s.Data.Cor.At(i, j) != s2.Data.Cor.At(i, j) {
				t.Fatalf("entry %d,%d differs", i, j)
			}
		}
	}
}

func TestLoad_Limits(t *testing.T) {
	doc, _ := os.ReadFile("../../testdata/demo/tutoring-anxiety/package.json")
	lim := load.DefaultLimits
	lim.PackageBytes = 100
	_, err := load.Load(doc, load.Options{Limits: lim})
	if checks.ErrorCode(err) != checks.ETooLarge || !strings.Contains(err.Error(), "the limit is 100") {
		t.Fatalf("package over the byte limit: %v", err)
	}
	lim = load.DefaultLimits
	lim.Rows = 10
	_, err = loadFile("../../testdata/demo/coding-club/package.json")
	if err != nil {
		t.Fatal(err)
	}
	cdoc, _ := os.ReadFile("../../testdata/demo/coding-club/package.json")
	_, err = load.Load(cdoc, load.Options{Limits: lim, ReadFile: func(string) ([]byte, error) {
		return os.ReadFile("../../testdata/demo/coding-club/rows.csv")
	}})
	if err == nil || !strings.Contains(err.Error(), "the limit is 10") {
		t.Fatalf("rows over the limit: %v", err)
	}
}

// Every problem is reported at once, not only the first: structural
// faults, field rules and cross-references alike, in one list.
func TestLoad_AllProblemsAtOnce(t *testing.T) {
	doc := []byte(`{"format_version": 1, "title": "t", "design": "cohort", "titel": 1,
		"variables": [{"name": "a", "scale": "continuous"}, {"name": "b", "scale": "nominal"}],
		"graph": {"edges": [{"from": "a", "to": "bb"}]},
		"claims": [{"id": "C1", "text": "t", "kind": "association", "from": "a", "to": "b", "p_value": 2,
		            "ci_level": 95, "adjust_for": ["c"]}],
		"data": {"kind": "summary", "n": 10, "variables": ["a", "b"], "correlations": [[1], [0.2]]}}`)
	_, err := load.Load(doc, load.Options{})
	for _, want := range []string{"/titel", "/design", "/variables/1/scale", "/claims/0/p_value",
		"/claims/0/ci_level: is 95, but the level is a proportion", "/graph/edges/0/to",
		"/claims/0/adjust_for/0", "/data/correlations/1: has 1 entries; want 2"} {
		if err == nil || !strings.Contains(err.Error(), want) {
			t.Errorf("missing %s in %v", want, err)
		}
	}
}

// A value of the wrong type is reported once, by the decoder, not again
// as missing by the field rules or the cross-references.
func TestLoad_WrongTypeReportedOnce(t *testing.T) {
	doc := []byte(`{"format_version": 1, "title": 7, "design": "observational",
		"variables": [{"name": "a", "scale": "continuous"}, {"name": "b", "scale": "continuous"}],
		"claims": [{"id": "C1", "text": "t", "kind": "association", "from": 3, "to": "b"}],
		"data": {"kind": "summary", "n": "ten", "variables": ["a", "b"], "correlations": [[1], [0.2, 1]]}}`)
	_, err := load.Load(doc, load.Options{})
	var invalid *checks.InvalidPackageError
	if !errors.As(err, &invalid) {
		t.Fatal(err)
	}
	want := []string{ // in the order of the document
		"/title: must be a string, not a number",
		"/claims/0/from: must be a string, not a number",
		"/data/n: must be an integer, not a string",
	}
	var got []string
	for _, p := range invalid.Problems {
		got = append(got, p.String())
	}
	if !slices.Equal(got, want) {
		t.Errorf("got\n%s\nwant\n%s", strings.Join(got, "\n"), strings.Join(want, "\n"))
	}
}

func compileSchema(tb testing.TB) *jsonschema.Schema {
	return schematest.Package(tb)
}

func schemaAccepts(tb testing.TB, sch *jsonschema.Schema, path string) bool {
	tb.Helper()
	f, err := os.Open(path)
	if err != nil {
		tb.Fatal(err)
	}
	defer f.Close()
	v, err := jsonschema.UnmarshalJSON(f)
	if err != nil {
		tb.Fatalf("%s: %v", path, err)
	}
	return sch.Validate(v) == nil
}

// The shipped JSON Schema accepts every demo and rejects every bad
// package whose fault is structural (cases.json says which).
func TestPackageSchema(t *testing.T) {
	sch := compileSchema(t)
	for _, path := range demoPackages(t) {
		if !schemaAccepts(t, sch, path) {
			t.Errorf("schema rejects demo %s", path)
		}
	}
	for _, tc := range badCases(t) {
		if tc.SchemaRejects == nil {
			continue // not JSON at all
		}
		if got := !schemaAccepts(t, sch, "../../testdata/bad/"+tc.File); got != *tc.SchemaRejects {
			t.Errorf("%s: schema rejects = %v, want %v", tc.File, got, *tc.SchemaRejects)
		}
	}
}

// Text the service could not store, and keys that a generic decoder would
// resolve silently, are refused with the pointer of the place.
func TestLoad_TextAndDuplicateKeys(t *testing.T) {
	base, err := os.ReadFile("../../testdata/demo/tutoring-anxiety/package.json")
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct{ old, new, want string }{
		{`"id": "C1"`, `"id": "C1", "id": "C9"`, `/claims/0/id: the key "id" appears more than once`},
		{`"kind": "summary"`, `"kind": "summary", "a/b": 1, "a/b": 2`,
			`/data/a~1b: the key "a/b" appears more than once`},
		{`"design": "observational"`, `"design": "observa\u0000tional"`, "/design: contains a NUL character"},
		{`"kind": "summary"`, `"kind": "summary", "k\u0000": 1`, "/data/k\x00: contains a NUL character"},
		{`"design": "observational"`, "\"design\": \"observ\xc3\x28tional\"",
			"/design: is not valid UTF-8 text"},
	} {
		doc := bytes.Replace(base, []byte(tc.old), []byte(tc.new), 1)
		if bytes.Equal(doc, base) {
			t.Fatalf("%q not in the demo", tc.old)
		}
		_, err := load.Load(doc, load.Options{})
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: want %q, got %v", tc.new, tc.want, err)
		}
	}
}
