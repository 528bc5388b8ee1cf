package checks_test

import (
	"encoding/json"
	"errors"
	"os"
	"path/filepath"
	"testing"

	"github.com/pathvet/pathvet/checks"
)

// FuzzLoad feeds arbitrary documents to the package decoder: it must
// return a study or an invalid-package error, never panic or hang.
// Seeds: every demo and every bad package.
func FuzzLoad(f *testing.F) {
	paths, _ := filepath.Glob("../testdata/bad/*.json")
	paths = append(paths, demoPackages(f)...)
	for _, p := range paths {
		b, err := os.ReadFile(p)
		if err != nil {
			f.Fatal(err)
		}
		f.Add(b)
	}
	f.Fuzz(func(t *testing.T, doc []byte) {
		_, err := checks.Load(doc, checks.LoadOptions{})
		var invalid *checks.InvalidPackageError
		if err != nil && !errors.As(err, &invalid) {
			t.Fatalf("error of the wrong kind: %v", err)
		}
	})
}

// FuzzCSV feeds arbitrary CSV data beside a fixed package.
func FuzzCSV(f *testing.F) {
	doc := []byte(`{"format_version": 1, "title": "fuzz", "design": "observational",
		"variables": [{"name": "a", "scale": "binary"}, {"name": "b", "scale": "continuous"}],
		"claims": [{"id": "C1", "text": "t", "kind": "association", "from": "a", "to": "b"}],
		"data": {"kind": "rows", "missing_codes": ["-9"], "ignore_columns": ["id"]}}`)
	for _, seed := range []string{
		"a,b\n1,2.5\n0,\n", "id,a,b\nx,1,NA\ny,0,-9\n", "a,b\n2,1\n", "a,b,c\n1,2,3\n",
		"\xef\xbb\xbfa,b\n1,1e308\n", "a,b\n\"1\",\"2\n", "b,a\n1,1\n1\n",
	} {
		f.Add([]byte(seed))
	}
	f.Fuzz(func(t *testing.T, csv []byte) {
		s, err := checks.Load(doc, checks.LoadOptions{CSV: csv})
		var invalid *checks.InvalidPackageError
		if err != nil && !errors.As(err, &invalid) {
			t.Fatalf("error of the wrong kind: %v", err)
		}
		if err == nil {
			for _, col := range s.Data.Columns {
				if len(col) != s.Data.N {
					t.Fatalf("column of %d values for %d rows", len(col), s.Data.N)
				}
			}
			if _, err := json.Marshal(s.Package); err != nil {
				t.Fatal(err)
			}
		}
	})
}
